import 'server-only';
import { logActivity } from '@/db/repositories/activity';
import { findRevision } from '@/db/repositories/designs';
import {
  activeLoadOfUser,
  endRun,
  findSimulation,
  insertSimulation,
  listStudySimulations as listRows,
  setJobIds,
  type Simulation,
} from '@/db/repositories/simulations';
import { lockUser } from '@/db/repositories/users';
import type { Actor } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { designSchema } from '@/lib/design/schema';
import { AppError, notFound } from '@/lib/errors';
import { jobsConfig } from '@/lib/jobs/config';
import type { SimulationSpecDerived } from '@/lib/api/dto';
import { simulationDto, type SimulationDto } from '@/lib/api/simulations';
import { chooseChunkSize, planChunks, replicatesTotal } from '@/lib/jobs/plan';
import { enqueueChunks, placeRun, withdrawChunks } from '@/lib/jobs/queue';
import { enforce, type Limit } from '@/lib/rate-limit';
import { specFromDesign } from '@/lib/sim/from-design';
import type { SimulationRunInput } from '@/lib/validation/simulation-run';
import { simulationSpecSchema, type SimulationSpec } from '@/lib/sim/spec';
import { requireActor, requireStudy } from './access';
import { afterCommit, transaction } from './transaction';
import { formatCount } from '@/lib/format';

/**
 * Stress-test runs. A run on a study needs the right to run simulations on it ('simulation.run':
 * owner, editor, consultant) and is readable by everyone who can read the study; a run from a
 * compact specification without a study belongs to its creator alone. Someone who may not see a
 * run gets 404, as for studies.
 *
 * Limits, so that one person cannot flood the queue: at most SIM_MAX_ACTIVE_RUNS runs queued or
 * running at once, at most SIM_MAX_REPLICATES replicates per run (summed over its scenarios),
 * and at most `RUNS_PER_HOUR` runs started per hour. The number of active runs is checked once
 * before the work of planning a run and again, with the person's row locked, where the run is
 * stored, so that runs started at the same moment cannot pass the limit together. Within the queue,
 * runs take turns between people (lib/jobs/queue.ts): one person's large runs never hold up
 * another person's run.
 */

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export const RUNS_PER_HOUR: Limit = { limit: 60, windowSeconds: 60 * 60 };

type Derived = { spec: SimulationSpec; missing: []; unsupported: [] } | { spec: null; missing: string[]; unsupported: string[] };

/**
 * The specification derived from a revision's design, or why there is none: `missing` lists what
 * the Design tab can still supply, `unsupported` the features of the design the stress test does
 * not simulate yet (one sentence each).
 */
async function derivedSpec(studyId: string, revision: number): Promise<Derived> {
  const rev = await findRevision(db(), studyId, revision);
  if (!rev) throw new AppError('not_found', `Revision ${revision} of this study was not found.`);
  const parsed = designSchema.safeParse(rev.design ?? {});
  if (!parsed.success) throw new AppError('conflict', `The design of revision ${revision} no longer matches the current design model; save the design again, then start the stress test.`);
  const derived = specFromDesign(parsed.data);
  if (!derived.ok) return { spec: null, missing: derived.missing, unsupported: derived.unsupported };
  const spec = simulationSpecSchema.safeParse(derived.spec);
  if (!spec.success) {
    return { spec: null, missing: spec.error.issues.map((i) => i.message), unsupported: [] };
  }
  return { spec: spec.data, missing: [], unsupported: [] };
}

async function specForStudy(studyId: string, revision: number, input: SimulationRunInput): Promise<SimulationSpec> {
  if (input.spec) return input.spec;
  const derived = await derivedSpec(studyId, revision);
  if (!derived.spec) {
    if (derived.unsupported.length > 0) throw new AppError('bad_request', derived.unsupported.join(' '));
    throw new AppError('bad_request', `The design is not complete enough for a stress test: ${derived.missing.join('; ')}. Complete it in the Design tab, or send a specification.`);
  }
  const spec = simulationSpecSchema.safeParse({
    ...derived.spec,
    ...(input.replicates !== undefined ? { replicates: input.replicates } : {}),
    ...(input.seed !== undefined ? { seed: input.seed } : {}),
  });
  if (!spec.success) {
    const first = spec.error.issues[0];
    throw new AppError('bad_request', `The design cannot be simulated as it stands: ${first ? `${first.path.join('.')}: ${first.message}` : 'invalid'}.`);
  }
  return spec.data;
}

/**
 * The specification a run on the study would use by default (from the design of `revision`, the
 * newest by default), for the Stress test tab to show and edit; or, when the design cannot be
 * simulated yet, what it lacks.
 */
export async function defaultSimulationSpec(
  actor: Actor | null,
  studyId: string,
  revision?: number,
): Promise<SimulationSpecDerived> {
  const { study } = await requireStudy(actor, studyId, 'study.read');
  const number = revision ?? study.currentRevision;
  if (number < 1) return { revision: 0, spec: null, missing: ['a saved design'], unsupported: [] };
  if (number > study.currentRevision) throw new AppError('not_found', `Revision ${number} of this study was not found.`);
  return { revision: number, ...(await derivedSpec(studyId, number)) };
}

async function enforceLimits(actor: Actor, spec: SimulationSpec): Promise<void> {
  const config = jobsConfig();
  const total = replicatesTotal(spec);
  if (total > config.maxReplicates) {
    throw new AppError(
      'bad_request',
      `This run has ${formatCount(total)} replicates (${formatCount(spec.replicates)} × ${spec.scenarios.length} scenarios); one run can have at most ${formatCount(config.maxReplicates)}. Use fewer replicates or scenarios.`,
      { fields: { replicates: [`At most ${formatCount(Math.floor(config.maxReplicates / spec.scenarios.length))} with ${spec.scenarios.length} scenarios.`] } },
    );
  }
  await refuseBeyondActiveRuns(db(), actor);
  await enforce(db(), `simulations:${actor.id}`, RUNS_PER_HOUR, 'stress tests started in the last hour');
}

async function refuseBeyondActiveRuns(q: Parameters<typeof activeLoadOfUser>[0], actor: Actor): Promise<void> {
  const max = jobsConfig().maxActiveRuns;
  const load = await activeLoadOfUser(q, actor.id);
  if (load.runs >= max) {
    throw new AppError(
      'rate_limited',
      `You already have ${load.runs} stress test${load.runs === 1 ? '' : 's'} queued or running (at most ${max}). Wait for one to finish, or cancel one, then start this one.`,
      { retryAfterSeconds: 30 },
    );
  }
}

export async function createSimulation(actor: Actor | null, input: SimulationRunInput, options: { chunkSize?: number } = {}): Promise<SimulationDto> {
  let a: Actor;
  let spec: SimulationSpec;
  let study: { id: string; workspaceId: string } | null = null;
  let revision: number | null = null;
  if (input.studyId !== undefined) {
    const access = await requireStudy(actor, input.studyId, 'simulation.run');
    a = access.actor;
    study = { id: access.study.id, workspaceId: access.study.workspaceId };
    revision = input.revision ?? access.study.currentRevision;
    if (revision < 1) throw new AppError('conflict', 'This study has no saved design yet. Save the design first, or send a specification.');
    if (revision > access.study.currentRevision) throw new AppError('not_found', `Revision ${revision} of this study was not found.`);
    spec = await specForStudy(access.study.id, revision, input);
  } else {
    a = requireActor(actor);
    if (!input.spec) throw new AppError('bad_request', 'Send a specification (spec), or the studyId of a study whose design to use.');
    spec = input.spec;
  }
  await enforceLimits(a, spec);

  const chunkSize = Math.min(spec.replicates, options.chunkSize ?? chooseChunkSize(spec, jobsConfig().chunkSeconds));
  const chunks = planChunks(spec, chunkSize);
  const run = await transaction(async (trx) => {
    if (study) await requireStudy(a, study.id, 'simulation.run', { trx, lock: 'share' });
    await lockUser(trx, a.id);
    await refuseBeyondActiveRuns(trx, a);
    const firstTurn = await placeRun(trx, a.id);
    const created = await insertSimulation(trx, {
      studyId: study?.id ?? null,
      revisionNumber: revision,
      createdBy: a.id,
      spec,
      replicatesTotal: replicatesTotal(spec),
      chunkSize,
      chunkCount: chunks.length,
      firstTurn,
    });
    const jobIds = await enqueueChunks(trx, created.id, chunks, firstTurn);
    await setJobIds(trx, created.id, jobIds);
    if (study) {
      await logActivity(trx, {
        workspaceId: study.workspaceId,
        studyId: study.id,
        actorId: a.id,
        action: 'simulation.started',
        details: { simulationId: created.id, revision, replicates: spec.replicates, scenarios: spec.scenarios.length },
      });
    }
    return { ...created, jobIds };
  });
  return simulationDto(run, { withSpec: true });
}

/** The run, if the actor may see it (404 otherwise), and whether they may change it. */
async function visibleRun(actor: Actor | null, id: string, intent: 'read' | 'cancel'): Promise<{ actor: Actor; run: Simulation }> {
  const a = requireActor(actor);
  if (!UUID.test(id)) throw notFound('The stress test');
  const run = await findSimulation(db(), id);
  if (!run) throw notFound('The stress test');
  if (run.studyId) {
    await requireStudy(a, run.studyId, intent === 'read' ? 'study.read' : 'simulation.run');
  } else if (run.createdBy !== a.id) {
    throw notFound('The stress test');
  }
  return { actor: a, run };
}

export async function getSimulation(actor: Actor | null, id: string): Promise<SimulationDto> {
  const { run } = await visibleRun(actor, id, 'read');
  return simulationDto(run, { withSpec: true });
}

/** Cancels a queued or running run; a run that has already ended is returned as it is. */
export async function cancelSimulation(actor: Actor | null, id: string): Promise<SimulationDto> {
  const { actor: a, run } = await visibleRun(actor, id, 'cancel');
  const ended = await transaction(async (trx) => {
    const study = run.studyId ? (await requireStudy(a, run.studyId, 'simulation.run', { trx, lock: 'share' })).study : null;
    const row = await endRun(trx, run.id, 'cancelled');
    if (row && study) {
      await logActivity(trx, { workspaceId: study.workspaceId, studyId: study.id, actorId: a.id, action: 'simulation.cancelled', details: { simulationId: row.id } });
    }
    return row;
  });
  if (!ended) return simulationDto(run, { withSpec: true });
  await afterCommit(() => withdrawChunks(ended.jobIds));
  return simulationDto(ended, { withSpec: true });
}

export async function listStudySimulations(actor: Actor | null, studyId: string): Promise<SimulationDto[]> {
  await requireStudy(actor, studyId, 'study.read');
  const runs = await listRows(db(), studyId);
  return runs.map((r) => simulationDto(r, { withResults: false }));
}
