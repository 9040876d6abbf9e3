import 'server-only';
import { appendRevision, findRevision, insertFindingNote, listFindingNotes as listNotesRows, type FindingNote } from '@/db/repositories/designs';
import { logActivity } from '@/db/repositories/activity';
import { DESIGN_STEPS, designSchema, emptyDesign, type Design, type DesignPart } from '@/lib/design/schema';
import { runChecks } from '@/lib/rules/registry';
import type { CheckResultDto, DesignSaved, DesignState } from '@/lib/api/dto';
import type { Actor } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { AppError } from '@/lib/errors';
import type { DesignSaveInput, FindingNoteInput } from '@/lib/validation/design';
import { requireStudy } from './access';
import { recordDecision } from './suggestion-decisions';
import { transaction } from './transaction';

/**
 * The study's design, saved as revisions: every save appends one JSON snapshot with its author,
 * time and the checks computed from it, so nothing is ever overwritten. Two people saving at
 * once: when they changed different parts of the design the second save is merged onto the first;
 * when they changed the same part the second gets a conflict that names who saved what. A save
 * holds the study's row from reading the newest revision to appending the next one, so two saves
 * at the same moment take turns and the second is merged or refused like a later one.
 */

function parseStored(raw: unknown): { design: Design; readable: boolean } {
  const parsed = designSchema.safeParse(raw ?? {});
  return parsed.success ? { design: parsed.data, readable: true } : { design: emptyDesign(), readable: false };
}

export async function getDesign(actor: Actor | null, studyId: string): Promise<DesignState> {
  const { study } = await requireStudy(actor, studyId, 'study.read');
  const rev = study.currentRevision > 0 ? await findRevision(db(), studyId, study.currentRevision) : undefined;
  const { design, readable } = parseStored(rev?.design);
  return {
    revision: study.currentRevision,
    design,
    savedAt: rev ? rev.createdAt.toISOString() : null,
    savedBy: rev?.authorName ?? null,
    readable,
  };
}

function changedParts(a: Design, b: Design): DesignPart[] {
  return DESIGN_STEPS.map((s) => s.part).filter((p) => JSON.stringify(a[p]) !== JSON.stringify(b[p]));
}

const PART_LABEL = Object.fromEntries(DESIGN_STEPS.map((s) => [s.part, s.label])) as Record<DesignPart, string>;

export interface SaveOptions {
  /** An accepted suggestion: who proposed it. The save is a version of its own, by both. */
  coAuthorId?: string;
  suggestionId?: string;
  /** The time of the save (tests inject it; versions group saves by it). */
  now?: Date;
}

/**
 * Saves the design as a new revision, which joins the author's open version or starts a new one
 * (db/repositories/versions.ts). `options.suggestionId`: the save carries out that suggestion
 * (lib/data/suggestions.ts), which is marked accepted in the same transaction; `coAuthorId` is its
 * author, and the save is a version of its own, by both.
 */
export async function saveDesign(actor: Actor | null, studyId: string, input: DesignSaveInput, options: SaveOptions = {}): Promise<DesignSaved> {
  const now = options.now ?? new Date();
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'design.edit', { trx, lock: 'update' });
    if (input.baseRevision > study.currentRevision) {
      throw new AppError('bad_request', `Revision ${input.baseRevision} does not exist yet; the newest is ${study.currentRevision}.`, {
        fields: { baseRevision: ['Newer than the newest revision.'] },
      });
    }
    let design = input.design;
    let merged = false;

    if (input.baseRevision < study.currentRevision) {
      const base = await findRevision(trx, studyId, input.baseRevision);
      const current = await findRevision(trx, studyId, study.currentRevision);
      const baseDesign = parseStored(base?.design).design;
      const currentDesign = parseStored(current?.design).design;
      const mine = changedParts(baseDesign, design);
      const theirs = changedParts(baseDesign, currentDesign);
      const overlap = mine.filter((p) => theirs.includes(p));
      if (overlap.length > 0) {
        const when = current ? current.createdAt.toISOString().slice(11, 16) : '';
        throw new AppError(
          'conflict',
          `${current?.authorName ?? 'Someone'} saved revision ${study.currentRevision} at ${when} UTC, which also changed ${overlap.map((p) => PART_LABEL[p]).join(' and ')}. Your edit was not saved and is kept in this browser: reload to see their version, then apply your change again.`,
        );
      }
      // Different parts: take theirs, then mine on top.
      const mergedDesign = { ...currentDesign } as Design;
      for (const p of mine) (mergedDesign as Record<DesignPart, unknown>)[p] = design[p];
      const reparsed = designSchema.safeParse(mergedDesign);
      if (!reparsed.success) {
        throw new AppError('conflict', 'Someone else changed the design meanwhile in a way that does not fit your edit. Reload to see their version.');
      }
      design = reparsed.data;
      merged = true;
    }

    const checks = runChecks(design);
    // The study's row is locked, so the compare-and-set cannot miss; it stays as a guard.
    const saved = await appendRevision(trx, {
      studyId,
      expected: study.currentRevision,
      design,
      checks,
      authorId: a.id,
      note: input.note ?? null,
      at: now,
      coAuthorId: options.coAuthorId,
      suggestionId: options.suggestionId,
    });
    if (saved === undefined) {
      throw new AppError('conflict', 'Someone saved the design at the same moment. Your edit is kept in this browser: reload, then apply it again.');
    }
    await logActivity(trx, {
      workspaceId: study.workspaceId,
      studyId,
      actorId: a.id,
      action: 'design.saved',
      details: { revision: saved.number, version: saved.version, merged, ...(options.suggestionId ? { suggestionId: options.suggestionId, coAuthorId: options.coAuthorId ?? null } : {}) },
    });
    if (options.suggestionId) await recordDecision(trx, a, study, options.suggestionId, { status: 'accepted', revision: saved.number });
    return { revision: saved.number, version: saved.version, design, savedAt: now.toISOString(), savedBy: a.name ?? a.email, readable: true, merged };
  });
}

export async function checkDesign(actor: Actor | null, studyId: string, design?: Design): Promise<CheckResultDto> {
  const state = await getDesign(actor, studyId);
  return { revision: state.revision, ...runChecks(design ?? state.design) };
}

/** The note is kept with the revision that is the newest while the study's row is held. */
export async function addFindingNote(actor: Actor | null, studyId: string, input: FindingNoteInput): Promise<FindingNote[]> {
  return transaction(async (trx) => {
    const { actor: a, study } = await requireStudy(actor, studyId, 'finding.address', { trx, lock: 'share' });
    await insertFindingNote(trx, { studyId, ...input, revision: study.currentRevision, actorId: a.id });
    await logActivity(trx, {
      workspaceId: study.workspaceId,
      studyId,
      actorId: a.id,
      action: input.status === 'addressed' ? 'finding.addressed' : 'finding.reopened',
      details: { ruleId: input.ruleId, key: input.key },
    });
    return listNotesRows(trx, studyId);
  });
}

export async function listFindingNotes(actor: Actor | null, studyId: string): Promise<FindingNote[]> {
  await requireStudy(actor, studyId, 'study.read');
  return listNotesRows(db(), studyId);
}

export type { FindingNote };
