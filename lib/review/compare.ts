/**
 * Two versions of a design side by side (issue 12, point 2): the fields that changed in the
 * wizard's words (lib/design/fields.ts), the findings that appeared or cleared (the checks
 * stored with each version's last revision), the Plan's sample size and power before and after,
 * and the stress-test verdicts when a finished run exists for both.
 *
 * The Plan's figures are computed from each version's design with lib/plan — the calculation the
 * Plan tab offers for that design — rather than read from saved Plan results: a saved result
 * exists only when someone pressed Save on the Plan tab at that revision, and its inputs may have
 * been edited by hand, so two saved results need not be comparable. The required size solves
 * for the size at the design's target power; the power is that of the size the design plans.
 */
import { describeChanges, type FieldChange } from '@/lib/design/fields';
import type { Design } from '@/lib/design/schema';
import { planFromDesign } from '@/lib/plan/from-design';
import type { Finding, Recommendation } from '@/lib/rules/types';
import { calculate } from '@/lib/stats/calculations';
import type { CalculationRequest } from '@/lib/stats/calculations/request';
import type { SimulationResults } from '@/lib/sim/run';
import { scenarioKey, type Scenario, type SimulationSpec } from '@/lib/sim/spec';
import { verdictOf, type CellVerdict } from '@/lib/sim/verdict';

export type FindingSummary = Pick<Finding, 'ruleId' | 'key' | 'severity' | 'title'>;

/** A finished stress test of a version's design. */
export interface StressRun {
  id: string;
  spec: SimulationSpec;
  results: SimulationResults;
}

export interface VersionSnapshot {
  number: number;
  name: string | null;
  design: Design;
  findings: FindingSummary[];
  recommendation: Recommendation;
  /** The newest finished stress test of the version's revisions, if any. */
  run: StressRun | null;
}

export interface PlanFigures {
  /** The calculation the Plan tab offers (null when the design does not have enough for one). */
  kind: string | null;
  /** What the size counts, e.g. "classrooms per arm". */
  sizeLabel: string | null;
  /** The size needed for the target power. */
  requiredSize: number | null;
  /** The size the design plans. */
  plannedSize: number | null;
  /** Power at the planned size. */
  powerAtPlanned: number | null;
  targetPower: number;
  /** What is missing for a calculation, in plain words. */
  missing: string[];
}

export interface StressRow {
  scenario: Scenario;
  analysis: string;
  before: CellVerdict;
  after: CellVerdict;
}

export interface Comparison {
  from: { number: number; name: string | null };
  to: { number: number; name: string | null };
  changes: FieldChange[];
  findings: { appeared: FindingSummary[]; cleared: FindingSummary[]; unchanged: number };
  plan: { before: PlanFigures; after: PlanFigures };
  /** Null unless both versions have a finished run; the rows are the scenario × analysis pairs both runs have. */
  stress: { fromRun: string; toRun: string; rows: StressRow[] } | null;
}

/** The size inputs the Plan solves for (lib/plan/from-design.ts); the others it solves for are effects. */
const SIZE_INPUTS = new Set(['nPerGroup', 'clustersPerArm', 'n']);

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/** The Plan's size and power for a design (see the file's comment). */
export function planFigures(design: Design, recommendation?: Recommendation): PlanFigures {
  const draft = planFromDesign(design, recommendation);
  const targetPower = design.assumptions.power;
  const base: PlanFigures = {
    kind: draft.kind,
    sizeLabel: draft.labels.size ?? null,
    requiredSize: null,
    plannedSize: draft.planned?.value ?? null,
    powerAtPlanned: null,
    targetPower,
    missing: draft.missing.map((m) => m.text),
  };
  if (!draft.request) return base;
  try {
    const solved = calculate(draft.request);
    if (draft.solveFor && SIZE_INPUTS.has(draft.solveFor)) base.requiredSize = num(solved.result[draft.solveFor]);
    if (draft.planned) {
      const atPlanned = calculate({ ...draft.request, [draft.planned.input]: draft.planned.value, solveFor: 'power' } as CalculationRequest);
      base.powerAtPlanned = num(atPlanned.result.power);
    }
  } catch {
    // A request the calculation refuses (an impossible target, say) leaves the figures empty.
  }
  return base;
}

const findingId = (f: FindingSummary) => `${f.ruleId}/${f.key}`;

function stressRows(a: StressRun, b: StressRun, targetA: number, targetB: number): StressRow[] {
  const rows: StressRow[] = [];
  const verdict = (run: StressRun, key: string, analysis: string, target: number): CellVerdict => {
    const metrics = run.results[key]?.[analysis as keyof SimulationResults[string]];
    if (!metrics) return 'no-result';
    return verdictOf(metrics as Parameters<typeof verdictOf>[0], { alpha: run.spec.alpha ?? 0.05, targetPower: target, replicates: run.spec.replicates }).cell;
  };
  for (const s of b.spec.scenarios) {
    const key = scenarioKey(s);
    if (!a.results[key] || !b.results[key]) continue;
    for (const analysis of Object.keys(b.results[key]!)) {
      if (!(analysis in a.results[key]!)) continue;
      rows.push({ scenario: s, analysis, before: verdict(a, key, analysis, targetA), after: verdict(b, key, analysis, targetB) });
    }
  }
  return rows;
}

/** Version `a` (from) against version `b` (to). */
export function compareVersions(a: VersionSnapshot, b: VersionSnapshot): Comparison {
  const before = new Map(a.findings.map((f) => [findingId(f), f]));
  const after = new Map(b.findings.map((f) => [findingId(f), f]));
  return {
    from: { number: a.number, name: a.name },
    to: { number: b.number, name: b.name },
    changes: describeChanges(a.design, b.design),
    findings: {
      appeared: b.findings.filter((f) => !before.has(findingId(f))),
      cleared: a.findings.filter((f) => !after.has(findingId(f))),
      unchanged: b.findings.filter((f) => before.has(findingId(f))).length,
    },
    plan: { before: planFigures(a.design, a.recommendation), after: planFigures(b.design, b.recommendation) },
    stress: a.run && b.run ? { fromRun: a.run.id, toRun: b.run.id, rows: stressRows(a.run, b.run, a.design.assumptions.power, b.design.assumptions.power) } : null,
  };
}
