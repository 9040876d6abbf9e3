import 'server-only';
import { logActivity } from '@/db/repositories/activity';
import { insertPlanResult, listPlanResults as listRows, type PlanResult } from '@/db/repositories/plans';
import type { Actor } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { AppError } from '@/lib/errors';
import { calculate } from '@/lib/stats/calculations';
import { CalculationInputError } from '@/lib/stats/calculations/errors';
import type { CalculationOutput } from '@/lib/stats/calculations/types';
import type { PlanResultSaveInput } from '@/lib/validation/plans';
import { requireStudy } from './access';

/**
 * Results of the Plan tab saved to a study. The server recomputes every result from its request
 * (a browser's numbers are never stored) and keeps it with the design revision it belongs to.
 */

export interface SavedPlanResult extends Omit<PlanResult, 'output'> {
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

export async function savePlanResult(actor: Actor | null, studyId: string, input: PlanResultSaveInput): Promise<SavedPlanResult> {
  const { actor: a, study } = await requireStudy(actor, studyId, 'calculation.save');
  if (input.revision !== undefined && input.revision !== study.currentRevision) {
    throw new AppError(
      'conflict',
      `The design was saved again (revision ${study.currentRevision}) after this result was computed from revision ${input.revision}. Reload the Plan tab and save the result again.`,
      { fields: { revision: [`The newest revision is ${study.currentRevision}.`] } },
    );
  }
  const output = compute(input.request);
  const row = {
    studyId,
    revision: study.currentRevision,
    kind: input.request.kind,
    request: input.request,
    output,
    note: input.note ? input.note : null,
    createdBy: a.id,
  };
  const id = await db()
    .transaction()
    .execute(async (trx) => {
      const newId = await insertPlanResult(trx, row);
      await logActivity(trx, {
        workspaceId: study.workspaceId,
        studyId,
        actorId: a.id,
        action: 'plan.saved',
        details: { resultId: newId, revision: row.revision, kind: row.kind, solvedFor: output.solvedFor },
      });
      return newId;
    });
  return { id, ...row, createdByName: a.name ?? a.email, createdAt: new Date() };
}

export async function listPlanResults(actor: Actor | null, studyId: string): Promise<SavedPlanResult[]> {
  await requireStudy(actor, studyId, 'study.read');
  return (await listRows(db(), studyId)) as SavedPlanResult[];
}
