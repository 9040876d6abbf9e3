/**
 * What /api/v1/studies/{id}/versions… and /signoffs… answer: versions (one person's continuous
 * editing), their comparison, sign-offs and the study's review state. Declared once here, typed
 * into their builders, named in the OpenAPI document (lib/api/openapi.ts).
 */
import { z } from 'zod';
import type { SignoffRow } from '@/db/repositories/signoffs';
import type { VersionRow } from '@/db/repositories/versions';
import { STUDY_STATUSES, VERSION_CLOSE_REASONS } from '@/db/schema';
import { designSchema, DESIGN_STEPS } from '@/lib/design/schema';
import type { Comparison } from '@/lib/review/compare';
import { scenarioKey } from '@/lib/sim/spec';
import { CELL_VERDICTS } from '@/lib/sim/verdict';

const iso = z.string().meta({ format: 'date-time' });
const isoOf = (d: Date | null) => (d ? d.toISOString() : null);

export const versionDtoSchema = z
  .object({
    number: z.number().int(),
    name: z.string().nullable(),
    authorName: z.string().nullable(),
    coAuthorName: z.string().nullable().meta({ description: 'An accepted suggestion: who proposed it (the author accepted it).' }),
    firstRevision: z.number().int(),
    lastRevision: z.number().int(),
    saves: z.number().int().meta({ description: 'Autosaves in this version; each is kept as a revision.' }),
    openedAt: iso,
    lastSavedAt: iso,
    closedAt: iso.nullable(),
    open: z.boolean().meta({ description: 'Still taking its author’s saves: not closed, and saved within the idle time.' }),
    closeReason: z.enum(VERSION_CLOSE_REASONS).nullable(),
    restoredFrom: z.number().int().nullable(),
    suggestionId: z.string().nullable(),
    findings: z.number().int().nullable().meta({ description: 'Findings of the checks stored with the version’s last revision.' }),
    signedOff: z.boolean().meta({ description: 'A sign-off of this version stands (not withdrawn).' }),
  })
  .meta({ id: 'Version' });
export type VersionDto = z.output<typeof versionDtoSchema>;

export function versionDto(v: VersionRow, open: boolean, signedOff: boolean): VersionDto {
  return {
    number: v.number,
    name: v.name,
    authorName: v.authorName,
    coAuthorName: v.coAuthorName,
    firstRevision: v.firstRevision,
    lastRevision: v.lastRevision,
    saves: v.saves,
    openedAt: v.openedAt.toISOString(),
    lastSavedAt: v.lastSavedAt.toISOString(),
    closedAt: isoOf(v.closedAt),
    open,
    closeReason: v.closeReason,
    restoredFrom: v.restoredFrom,
    suggestionId: v.suggestionId,
    findings: v.findings,
    signedOff,
  };
}

export const signoffDtoSchema = z
  .object({
    id: z.uuid(),
    version: z.number().int(),
    versionName: z.string().nullable(),
    revision: z.number().int().meta({ description: 'The version’s last revision when it was signed off; a later revision is a change since.' }),
    signerName: z.string().nullable(),
    statement: z.string(),
    conditions: z.string().nullable(),
    createdAt: iso,
    withdrawnAt: iso.nullable(),
    withdrawnByName: z.string().nullable(),
    withdrawalReason: z.string().nullable(),
  })
  .meta({ id: 'Signoff' });
export type SignoffDto = z.output<typeof signoffDtoSchema>;

export function signoffDto(s: SignoffRow): SignoffDto {
  return {
    id: s.id,
    version: s.versionNumber,
    versionName: s.versionName,
    revision: s.revisionNumber,
    signerName: s.signerName,
    statement: s.statement,
    conditions: s.conditions,
    createdAt: s.createdAt.toISOString(),
    withdrawnAt: isoOf(s.withdrawnAt),
    withdrawnByName: s.withdrawnByName,
    withdrawalReason: s.withdrawalReason,
  };
}

export const reviewStateSchema = z
  .object({
    status: z.enum(STUDY_STATUSES).meta({ description: 'Derived: signed off while a standing sign-off covers the newest revision; in review once anyone commented, suggested or signed off; else draft.' }),
    signoff: signoffDtoSchema.nullable().meta({ description: 'The newest sign-off that stands.' }),
    changedSinceSignoff: z.boolean(),
    latestVersion: z.number().int().nullable(),
  })
  .meta({ id: 'ReviewState' });
export type ReviewStateDto = z.output<typeof reviewStateSchema>;

export const versionListSchema = z
  .object({
    items: z.array(versionDtoSchema),
    review: reviewStateSchema,
    idleMinutes: z.number().int().meta({ description: 'A version closes after this many minutes without a save by its author.' }),
  })
  .meta({ id: 'VersionList' });
export type VersionListDto = z.output<typeof versionListSchema>;

export const versionDetailSchema = versionDtoSchema
  .extend({
    design: designSchema,
    revisions: z.array(z.object({ number: z.number().int(), authorName: z.string().nullable(), savedAt: iso })).meta({ description: 'The saves of this version, oldest first.' }),
  })
  .meta({ id: 'VersionDetail' });
export type VersionDetailDto = z.output<typeof versionDetailSchema>;

export const signoffListSchema = z.object({ items: z.array(signoffDtoSchema), review: reviewStateSchema }).meta({ id: 'SignoffList' });
export type SignoffListDto = z.output<typeof signoffListSchema>;

export const versionClosedSchema = z.object({ closed: z.boolean().meta({ description: 'True when your open version was closed.' }) }).meta({ id: 'VersionClosed' });

const findingSummarySchema = z.object({ ruleId: z.string(), key: z.string(), severity: z.enum(['blocker', 'warning', 'advice']), title: z.string() });
const planFiguresSchema = z.object({
  kind: z.string().nullable(),
  sizeLabel: z.string().nullable(),
  requiredSize: z.number().nullable(),
  plannedSize: z.number().nullable(),
  powerAtPlanned: z.number().nullable(),
  targetPower: z.number(),
  missing: z.array(z.string()),
});
const cellVerdict = z.enum(CELL_VERDICTS);
const PARTS = DESIGN_STEPS.map((s) => s.part) as [(typeof DESIGN_STEPS)[number]['part'], ...(typeof DESIGN_STEPS)[number]['part'][]];

export const comparisonSchema = z
  .object({
    from: z.object({ number: z.number().int(), name: z.string().nullable() }),
    to: z.object({ number: z.number().int(), name: z.string().nullable() }),
    changes: z.array(z.object({ path: z.string(), label: z.string(), step: z.enum(PARTS), before: z.string(), after: z.string() })),
    findings: z.object({ appeared: z.array(findingSummarySchema), cleared: z.array(findingSummarySchema), unchanged: z.number().int() }),
    plan: z.object({ before: planFiguresSchema, after: planFiguresSchema }).meta({ description: 'Computed from each version’s design by the calculation the Plan tab offers.' }),
    stress: z
      .object({
        fromRun: z.uuid(),
        toRun: z.uuid(),
        rows: z.array(z.object({ scenario: z.string(), scenarioName: z.string().nullable(), violation: z.string(), analysis: z.string(), before: cellVerdict, after: cellVerdict })),
      })
      .nullable()
      .meta({ description: 'Present when both versions have a finished stress test: the verdicts of the scenarios and analyses both runs have.' }),
  })
  .meta({ id: 'VersionComparison' });
export type ComparisonDto = z.output<typeof comparisonSchema>;

export function comparisonDto(c: Comparison): ComparisonDto {
  return {
    ...c,
    stress: c.stress
      ? {
          fromRun: c.stress.fromRun,
          toRun: c.stress.toRun,
          rows: c.stress.rows.map((r) => ({ scenario: scenarioKey(r.scenario), scenarioName: r.scenario.name ?? null, violation: r.scenario.violation, analysis: r.analysis, before: r.before, after: r.after })),
        }
      : null,
  };
}
