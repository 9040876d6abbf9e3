import 'server-only';
import { logActivity } from '@/db/repositories/activity';
import { insertPlanResult, listPlanResults as listRows, type PlanResult } from '@/db/repositories/plans';
import type { Actor } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { AppError } from '@/lib/errors';
import { calculate } from '@/lib/stats/calculations';
import { CalculationInputError } from '@/lib/stats/calculations/errors';
import type { CalculationOutput } from '@/lib/stats/calculations/types';
import type { CalculationRequest } from '@/lib/stats/calculations/request';
import type { PlanResultSaveInput } from '@/lib/validation/plans';
import { requireStudy } from './access';
import { transaction } from './transaction';

/**
 * Results of the Plan tab saved to a study. The server recomputes every result from its request
 * (a browser's numbers are never stored) and keeps it with the design revision it belongs to.
 */

export interface SavedPlanResult extends Omit<PlanResult, 'request' | 'output'> {
  request: CalculationRequest;
  output: CalculationOutput;
}

/** Runs the calculation; inputs that pass the schema but not together become a 400 with fields under `request.`. */
function compute(request: PlanResultSaveInput['request']): CalculationOutput {
  try {
    return calculate(request);
  } catch (e) {
    if (e instanceof CalculationInputError) {
      const fields = Object.fromEntries(Object.entries(e.fields).map(([k, v]) => [`request.${k}`, v]));
      throw new AppError('bad_request', e.message, { fields });
    }
    throw e;
  }
}

function staleRevision(sent: number, newest: number): AppError {
  return new AppError(
    'conflict',
    `The design was saved again (revision ${newest}) after this result was computed from revision ${sent}. Reload the Plan tab and save the result again.`,
    { fields: { revision: [`The newest revision is ${newest}.`] } },
  );
}

/**
 * Checks the rights and the revision once before computing (so that a refused request costs no
 * computation) and again, with the study's row shared, when storing: a design saved meanwhile
 * either waits for this result or makes it stale.
 */
export async function savePlanResult(actor: Actor | null, studyId: string, input: PlanResultSaveInput): Promise<SavedPlanResult> {
  const first = await requireStudy(actor, studyId, 'calculation.save');
  if (input.revision !== undefined && input.revision !== first.study.currentRevision) throw staleRevision(input.revision, first.study.currentRevision);
  const output = compute(input.request);
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'calculation.save', { trx, lock: 'share' });
    if (input.revision !== undefined && input.revision !== study.currentRevision) throw staleRevision(input.revision, study.currentRevision);
    const row = {
      studyId,
      revision: study.currentRevision,
      kind: input.request.kind,
      request: input.request,
      output,
      note: input.note ? input.note : null,
      createdBy: a.id,
    };
    const id = await insertPlanResult(trx, row);
    await logActivity(trx, {
      workspaceId: study.workspaceId,
      studyId,
      actorId: a.id,
      action: 'plan.saved',
      details: { resultId: id, revision: row.revision, kind: row.kind, solvedFor: output.solvedFor },
    });
    return { id, ...row, createdByName: a.name ?? a.email, createdAt: new Date() };
  });
}

export async function listPlanResults(actor: Actor | null, studyId: string): Promise<SavedPlanResult[]> {
  await requireStudy(actor, studyId, 'study.read');
  return (await listRows(db(), studyId)) as SavedPlanResult[];
}
