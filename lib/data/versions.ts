import 'server-only';
import type { Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import { logActivity } from '@/db/repositories/activity';
import { appendRevision, findRevision } from '@/db/repositories/designs';
import { findSignoff, insertSignoff, listSignoffs as listSignoffRows, withdrawSignoffRow, type SignoffRow } from '@/db/repositories/signoffs';
import { listStudyMembers } from '@/db/repositories/studies';
import {
  closeVersion,
  findFinishedRun,
  findOpenVersion,
  findVersion,
  isOpenAt,
  listVersionRevisions,
  listVersions as listVersionRows,
  setVersionName,
  VERSION_IDLE_MINUTES,
  type VersionRow,
} from '@/db/repositories/versions';
import type { Study } from '@/db/repositories/studies';
import {
  comparisonDto,
  signoffDto,
  versionDto,
  type ComparisonDto,
  type ReviewStateDto,
  type SignoffDto,
  type SignoffListDto,
  type VersionDetailDto,
  type VersionDto,
  type VersionListDto,
} from '@/lib/api/versions';
import type { Actor } from '@/lib/auth/session';
import { designSchema, emptyDesign, type Design } from '@/lib/design/schema';
import { db } from '@/lib/db';
import { AppError, notFound } from '@/lib/errors';
import { notify } from '@/lib/notifications/notify';
import { compareVersions, type StressRun, type VersionSnapshot } from '@/lib/review/compare';
import { runChecks } from '@/lib/rules/registry';
import type { CheckResult } from '@/lib/rules/types';
import { simulationSpecSchema } from '@/lib/sim/spec';
import type { SimulationResults } from '@/lib/sim/run';
import type { SignoffCreateInput, SignoffWithdrawInput, VersionNameInput } from '@/lib/validation/versions';
import { requireStudy } from './access';
import { transaction } from './transaction';

/**
 * Versions of a study's design (db/repositories/versions.ts for the grouping rule), their names,
 * restores and comparison, and the consultant's sign-off. Every write runs in one transaction
 * with the study's row locked and appends to the activity log; `now` is injected by tests.
 */

type Trx = Transaction<Database>;
type When = { now?: Date };

const standing = (signoffs: SignoffRow[]) => signoffs.filter((s) => s.withdrawnAt === null);

function versionDtos(rows: VersionRow[], signoffs: SignoffRow[], now: Date): VersionDto[] {
  const signed = new Set(standing(signoffs).map((s) => s.versionNumber));
  return rows.map((v) => versionDto(v, isOpenAt(v, now), signed.has(v.number)));
}

/** The study's review state from its sign-offs (the status itself is derived in SQL, db/repositories/studies.ts). */
function reviewState(study: Study, signoffs: SignoffRow[], latestVersion: number | null): ReviewStateDto {
  const latest = standing(signoffs)[0];
  return {
    status: study.status,
    signoff: latest ? signoffDto(latest) : null,
    changedSinceSignoff: latest !== undefined && study.currentRevision > latest.revisionNumber,
    latestVersion,
  };
}

export async function listVersions(actor: Actor | null, studyId: string, { now = new Date() }: When = {}): Promise<VersionListDto> {
  const { study } = await requireStudy(actor, studyId, 'study.read');
  const [rows, signoffs] = await Promise.all([listVersionRows(db(), studyId), listSignoffRows(db(), studyId)]);
  return { items: versionDtos(rows, signoffs, now), review: reviewState(study, signoffs, rows[0]?.number ?? null), idleMinutes: VERSION_IDLE_MINUTES };
}

export async function getReviewState(actor: Actor | null, studyId: string): Promise<ReviewStateDto> {
  const { study } = await requireStudy(actor, studyId, 'study.read');
  const [rows, signoffs] = await Promise.all([listVersionRows(db(), studyId), listSignoffRows(db(), studyId)]);
  return reviewState(study, signoffs, rows[0]?.number ?? null);
}

async function requireVersion(trx: Trx | ReturnType<typeof db>, studyId: string, number: number): Promise<VersionRow> {
  const v = await findVersion(trx, studyId, number);
  if (!v) throw notFound('That version');
  return v;
}

function parseDesign(raw: unknown): Design {
  const parsed = designSchema.safeParse(raw ?? {});
  return parsed.success ? parsed.data : emptyDesign();
}

export async function getVersion(actor: Actor | null, studyId: string, number: number, { now = new Date() }: When = {}): Promise<VersionDetailDto> {
  await requireStudy(actor, studyId, 'study.read');
  const v = await requireVersion(db(), studyId, number);
  const [rev, revisions, signoffs] = await Promise.all([findRevision(db(), studyId, v.lastRevision), listVersionRevisions(db(), studyId, v), listSignoffRows(db(), studyId)]);
  return {
    ...versionDtos([v], signoffs, now)[0]!,
    design: parseDesign(rev?.design),
    revisions: revisions.map((r) => ({ number: r.number, authorName: r.authorName, savedAt: r.createdAt.toISOString() })),
  };
}

/** Closes the open version if it is still open at `now` (recording why), so that it is never given more saves. */
async function closeOpen(trx: Trx, studyId: string, now: Date, reason: 'named' | 'signoff' | 'left', onlyNumber?: number): Promise<void> {
  const open = await findOpenVersion(trx, studyId);
  if (open && (onlyNumber === undefined || open.number === onlyNumber)) await closeVersion(trx, studyId, open, now, reason);
}

/** Names a version (or clears its name); naming the open version closes it. A signed-off version keeps its name. */
export async function nameVersion(actor: Actor | null, studyId: string, number: number, input: VersionNameInput, { now = new Date() }: When = {}): Promise<VersionDto> {
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'version.name', { trx, lock: 'update' });
    const v = await requireVersion(trx, studyId, number);
    const signoffs = await listSignoffRows(trx, studyId);
    if (standing(signoffs).some((s) => s.versionNumber === number) && input.name !== v.name) {
      throw new AppError('conflict', 'This version is signed off under its name. Withdraw the sign-off before renaming it.');
    }
    await closeOpen(trx, studyId, now, 'named', number);
    await setVersionName(trx, studyId, number, input.name, a.id, now);
    await logActivity(trx, { workspaceId: study.workspaceId, studyId, actorId: a.id, action: 'version.named', details: { version: number, name: input.name, previous: v.name } });
    const after = await requireVersion(trx, studyId, number);
    return versionDtos([after], signoffs, now)[0]!;
  });
}

/** Restoring makes a new version whose design is the old one's; nothing is rewritten. */
export async function restoreVersion(actor: Actor | null, studyId: string, number: number, { now = new Date() }: When = {}): Promise<VersionDto> {
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'design.edit', { trx, lock: 'update' });
    const v = await requireVersion(trx, studyId, number);
    const rev = await findRevision(trx, studyId, v.lastRevision);
    const design = parseDesign(rev?.design);
    const saved = await appendRevision(trx, {
      studyId,
      expected: study.currentRevision,
      design,
      checks: runChecks(design),
      authorId: a.id,
      note: `Restored version ${number}`,
      at: now,
      restoredFrom: number,
    });
    if (!saved) throw new AppError('conflict', 'Someone saved the design at the same moment. Reload and restore again.');
    await logActivity(trx, { workspaceId: study.workspaceId, studyId, actorId: a.id, action: 'version.restored', details: { version: number, newVersion: saved.version, revision: saved.number } });
    const created = await requireVersion(trx, studyId, saved.version);
    return versionDtos([created], await listSignoffRows(trx, studyId), now)[0]!;
  });
}

/** The wizard calls this when its author leaves: their open version ends there. Another person's open version is left alone. */
export async function closeMyVersion(actor: Actor | null, studyId: string, { now = new Date() }: When = {}): Promise<{ closed: boolean }> {
  return transaction(async (trx) => {
    const { actor: a } = await requireStudy(actor, studyId, 'design.edit', { trx, lock: 'update' });
    const open = await findOpenVersion(trx, studyId);
    if (!open || open.authorId !== a.id) return { closed: false };
    await closeVersion(trx, studyId, open, now, 'left');
    return { closed: true };
  });
}

// ---------------------------------------------------------------- comparison

function findingsOf(checks: unknown, design: Design): CheckResult {
  const stored = checks as Partial<CheckResult> | null;
  return stored && Array.isArray(stored.findings) && stored.recommendation ? (stored as CheckResult) : runChecks(design);
}

async function snapshot(studyId: string, v: VersionRow): Promise<VersionSnapshot> {
  const [rev, run] = await Promise.all([findRevision(db(), studyId, v.lastRevision), findFinishedRun(db(), studyId, v)]);
  const design = parseDesign(rev?.design);
  const checks = findingsOf(rev?.checks, design);
  const spec = run ? simulationSpecSchema.safeParse(run.spec) : undefined;
  const stress: StressRun | null = run && spec?.success && run.results ? { id: run.id, spec: spec.data, results: run.results as SimulationResults } : null;
  return {
    number: v.number,
    name: v.name,
    design,
    findings: checks.findings.map((f) => ({ ruleId: f.ruleId, key: f.key, severity: f.severity, title: f.title })),
    recommendation: checks.recommendation,
    run: stress,
  };
}

export async function compareStudyVersions(actor: Actor | null, studyId: string, from: number, to: number): Promise<ComparisonDto> {
  await requireStudy(actor, studyId, 'study.read');
  const [a, b] = await Promise.all([requireVersion(db(), studyId, from), requireVersion(db(), studyId, to)]);
  const [sa, sb] = await Promise.all([snapshot(studyId, a), snapshot(studyId, b)]);
  return comparisonDto(compareVersions(sa, sb));
}

// ---------------------------------------------------------------- sign-off

export async function listSignoffs(actor: Actor | null, studyId: string): Promise<SignoffListDto> {
  const { study } = await requireStudy(actor, studyId, 'study.read');
  const [rows, signoffs] = await Promise.all([listVersionRows(db(), studyId), listSignoffRows(db(), studyId)]);
  return { items: signoffs.map(signoffDto), review: reviewState(study, signoffs, rows[0]?.number ?? null) };
}

/**
 * Tells the study's owners, editors and writers (not the actor) of a sign-off or its withdrawal,
 * in the transaction that records it; one notification per sign-off and kind.
 */
async function tellOfSignoff(trx: Trx, study: Study, actorId: string, kind: 'signoff' | 'withdrawal', signoffId: string, words: { subject: string; text: string }): Promise<void> {
  const members = await listStudyMembers(trx, study.id);
  await notify(trx, {
    kind,
    recipientIds: members.filter((m) => (m.role === 'owner' || m.role === 'editor' || m.role === 'writer') && m.userId !== actorId).map((m) => m.userId),
    studyId: study.id,
    actorId,
    ...words,
    path: `/studies/${study.id}/review/versions`,
    dedupeKey: `${kind}:${signoffId}`,
  });
}

const excerpt = (s: string, n = 200) => (s.length > n ? `${s.slice(0, n - 1)}…` : s);

/**
 * A consultant signs off a named version with a statement of what was reviewed and any conditions.
 * The open version is closed first, so what is signed off is never given more saves; a version
 * without a name needs one here.
 */
export async function signOff(actor: Actor | null, studyId: string, input: SignoffCreateInput, { now = new Date() }: When = {}): Promise<SignoffDto> {
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'study.signoff', { trx, lock: 'update' });
    const v = await requireVersion(trx, studyId, input.version);
    const name = input.name ?? v.name;
    if (!name) {
      throw new AppError('bad_request', 'Name the version you sign off, e.g. “Sent to the funder”.', { fields: { name: ['Give the version a name.'] } });
    }
    const signoffs = await listSignoffRows(trx, studyId);
    if (standing(signoffs).some((s) => s.versionNumber === v.number && s.signerId === a.id)) {
      throw new AppError('conflict', `You have already signed off version ${v.number}.`);
    }
    await closeOpen(trx, studyId, now, 'signoff');
    if (name !== v.name) {
      await setVersionName(trx, studyId, v.number, name, a.id, now);
      await logActivity(trx, { workspaceId: study.workspaceId, studyId, actorId: a.id, action: 'version.named', details: { version: v.number, name, previous: v.name } });
    }
    const id = await insertSignoff(trx, { studyId, versionNumber: v.number, revisionNumber: v.lastRevision, signerId: a.id, statement: input.statement, conditions: input.conditions || null, at: now });
    await logActivity(trx, { workspaceId: study.workspaceId, studyId, actorId: a.id, action: 'signoff.created', details: { signoffId: id, version: v.number, name, excerpt: excerpt(input.statement) } });
    const who = a.name ?? a.email;
    await tellOfSignoff(trx, study, a.id, 'signoff', id, {
      subject: `${who} signed off “${name}” of ${study.title}`,
      text: `${who} signed off version ${v.number}, “${name}”, of ${study.title}.\n\nWhat was reviewed: ${input.statement}${input.conditions ? `\n\nConditions: ${input.conditions}` : ''}`,
    });
    return signoffDto((await findSignoff(trx, studyId, id))!);
  });
}

export async function withdrawSignoff(actor: Actor | null, studyId: string, signoffId: string, input: SignoffWithdrawInput, { now = new Date() }: When = {}): Promise<SignoffDto> {
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'study.signoff', { trx, lock: 'update' });
    const s = await findSignoff(trx, studyId, signoffId);
    if (!s) throw notFound('That sign-off');
    if (!(await withdrawSignoffRow(trx, studyId, signoffId, a.id, input.reason, now))) throw new AppError('conflict', 'This sign-off was already withdrawn.');
    await logActivity(trx, { workspaceId: study.workspaceId, studyId, actorId: a.id, action: 'signoff.withdrawn', details: { signoffId, version: s.versionNumber, excerpt: excerpt(input.reason) } });
    const who = a.name ?? a.email;
    await tellOfSignoff(trx, study, a.id, 'withdrawal', signoffId, {
      subject: `${who} withdrew the sign-off of “${s.versionName ?? `version ${s.versionNumber}`}” of ${study.title}`,
      text: `${who} withdrew the sign-off of version ${s.versionNumber} of ${study.title}.\n\nReason: ${input.reason}`,
    });
    return signoffDto((await findSignoff(trx, studyId, signoffId))!);
  });
}
