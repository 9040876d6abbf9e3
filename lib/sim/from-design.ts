/**
 * A stress test's compact specification from a study's design, so that a run can start from the
 * study without the team restating its design. The design is read only through its facts
 * (lib/design/facts.ts), the reader the checks and the Plan use too: the same counts, units and
 * ICCs.
 *
 * What is taken from the facts:
 * - design: two arms; the experimental unit is the level of assignment, the top level. Its units
 *   are split between the arms by the allocation (`unitsByArm`).
 *   · assigned to a grouping level (classroom, tray): clustersPerArm = the smaller arm's number
 *     (the specification has one number of clusters per arm; with equal allocation that is half
 *     the total), clusterSize = the number of units per cluster (the level below, per parent,
 *     rounded to a whole number when the counts give an average) and clusterSizeCv = that
 *     level's count CV.
 *   · assigned to independent units: unitsPerArm = the units in each arm.
 *   · a level of repeated measures or sub-samples below the units (nights, leaves) becomes the
 *     occasions (its number per unit; times from the design's occasions when there are as many
 *     follow-ups, else 0, 1, 2, …). Without such a level, two or more follow-ups become the
 *     occasions. A single follow-up after a baseline is simulated as the follow-up alone: the
 *     specification has no baseline covariate.
 * - truth: effect and SD from the outcome's facts; icc = the ICC of the assigned grouping level;
 *   occasionCorrelation = the units' share of the variance left after the clusters,
 *   ICC_unit / (1 − ICC_cluster) (the model in lib/sim/generate.ts), with ICC_unit the ICC given
 *   for the unit's level or else the design's occasion correlation (taken as the correlation of
 *   two occasions beyond the cluster). The design's ICCs are shares of the total variance.
 * - scenarios: `none`, plus `skewed` for a right-skewed outcome, `heavy-tailed` for a
 *   heavy-tailed one, `outliers` when outliers are expected, `unequal-variance` when unequal
 *   variance is expected, `serial` for occasions that are serial (AR(1) correlation, or a level
 *   marked close in time).
 * - analyses: of those that apply to the simulated data (lib/sim/analyses.ts), `ols` (what
 *   ignoring the dependence gives); with clusters or occasions `cluster-robust`, `cluster-means`
 *   and `mixed`; `log-ols` for a right-skewed or log-analysed outcome; `huber` when outliers are
 *   expected or robust regression is planned; `ols-hc3` when unequal variance is expected or HC3
 *   is planned.
 * - alpha from the assumptions; replicates 1,000 and seed 1 (the caller may override both).
 *
 * When the design cannot be simulated, the answer says why in the researcher's words: `missing`
 * lists numbers or choices the Design tab can supply (each naming its step), `unsupported` has
 * one sentence per feature of the design the stress test does not simulate yet, with what the
 * team can do instead.
 */
import { designFacts, iccOf, sizeCv, unitsByArm, type DesignFacts, type LevelInfo } from '@/lib/design/facts';
import type { Design } from '@/lib/design/schema';
import type { AnalysisName } from '@/lib/models/types';
import { REPLICATES, SEED, type SimulationSpecInput } from './spec';
import { offeredAnalyses } from './analyses';

export type SpecFromDesign =
  | {
      ok: true;
      spec: SimulationSpecInput;
      /** Every analysis that applies to the simulated data: what the Stress test tab offers. */
      offered: AnalysisName[];
    }
  | { ok: false; missing: string[]; unsupported: string[] };

type ScenarioInput = SimulationSpecInput['scenarios'][number];

const lower = (L: LevelInfo) => L.level.name.toLowerCase();
/** "classroom" → "classrooms"; names that already end in s stay. */
const plural = (L: LevelInfo) => (lower(L).endsWith('s') ? lower(L) : `${lower(L)}s`);
const OUTCOME_WORDS: Record<string, string> = {
  binary: 'binary (yes or no)',
  count: 'a count',
  proportion: 'a proportion',
  'bounded-score': 'a score with a floor and a ceiling',
  'time-to-event': 'a time to an event',
};

const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/** How the design maps onto the specification's one level of clusters, units and occasions. */
interface Shape {
  /** The level of assignment groups units of the level below: those are the clusters. */
  clustered: boolean;
  /** The units: the level below the clusters, or the level of assignment itself. */
  units: LevelInfo;
  /** The level of repeated measurements or sub-samples of the units, if any. */
  inner?: LevelInfo;
}

/**
 * The design's shape, or one sentence per feature of it that the stress test does not simulate
 * yet (with what the team can do instead). The level of assignment is the cluster when it groups
 * observations of independent units or groups below it (classrooms of pupils, trays of plants,
 * mice of cells); otherwise it is the unit, and a level of repeated measurements or sub-samples
 * below it gives the occasions.
 */
function shapeOf(f: DesignFacts, A: LevelInfo): Shape | { unsupported: string[] } {
  const out: string[] = [];
  const family = f.outcome.family;
  if (family !== 'continuous') {
    out.push(
      `The outcome is ${OUTCOME_WORDS[family] ?? family}: the stress test simulates only continuous outcomes from the design so far, so it cannot run on this study yet; the Plan tab sizes it${family === 'binary' ? ' with two proportions' : ''}.`,
    );
  }
  const arms = f.armShares.length;
  if (f.design.assignment.kind === 'continuous') {
    out.push('The explanatory variable is continuous: the stress test compares two arms, so it cannot run on this design; the Plan tab sizes its regression.');
  } else if (arms > 2) {
    out.push(`The design has ${arms} arms: the stress test compares two, so stress-test the main comparison in a copy of the study that keeps only those two arms.`);
  }
  if (f.withinUnit && f.eu) {
    const how = f.crossover ? `both arms in turn (a ${f.crossover.periods}-period cross-over)` : `more than one arm, on different ${plural(A)}`;
    const plan = f.crossover?.periods === 2 ? 'the Plan tab sizes the two-period cross-over' : 'the Checks name the analysis it needs';
    out.push(`Each ${lower(f.eu)} receives ${how}: the stress test does not yet simulate a treatment that changes within a ${lower(f.eu)}; ${plan}.`);
    return { unsupported: out };
  }
  if (A.index > 0) {
    const above = f.levels[A.index - 1]!;
    out.push(`The treatment is assigned to ${plural(A)} within ${plural(above)}: the stress test simulates a treatment assigned at the top level only, so it cannot run on this design yet; the Plan tab sizes it.`);
    return { unsupported: out };
  }
  const below = f.levels[A.index + 1];
  const clustered = A.groupsObservations && below !== undefined && (below.level.kind === 'independent' || below.level.kind === 'grouping');
  const units = clustered ? below! : A;
  const inner = f.levels[units.index + 1];
  const beyond = f.levels.slice(units.index + 2);
  if (inner && units.groupsObservations && (inner.level.kind === 'independent' || inner.level.kind === 'grouping')) {
    out.push(`${cap(plural(inner))} are grouped in ${plural(units)}${clustered ? `, and those in ${plural(A)}` : ''}: the stress test simulates one level of clustering so far, so it cannot run on this design yet; the Plan tab sizes it with the ICCs of every level.`);
  } else if (inner && beyond.length > 0) {
    out.push(`The ${plural(units)} are measured at more than one level below them (${[...beyond].reverse().concat(inner).map(plural).join(' within ')}): the stress test simulates one level of measurements within units so far; the Plan tab sizes this design.`);
  }
  if (out.length > 0) return { unsupported: out };
  return { clustered, units, ...(inner ? { inner } : {}) };
}

export function specFromDesign(design: Design): SpecFromDesign {
  const f = designFacts(design);
  const missing: string[] = [];
  const { outcome } = f;

  if (f.levels.length === 0) missing.push('the levels of the structure, from top to bottom (Structure step)');
  if (f.levels.length > 0 && !f.assignment) missing.push('the level the treatment is assigned at (Assignment step)');
  if (design.assignment.kind !== 'continuous' && f.armShares.length < 2) missing.push('the two arms to compare (Assignment step)');
  if (!outcome.effect) missing.push('the effect worth detecting (Assumptions step)');
  if (outcome.family === 'continuous' && !outcome.sd) missing.push('the outcome SD (Assumptions step)');
  const A = f.assignment;
  if (!A) return { ok: false, missing, unsupported: [] };

  const shape = shapeOf(f, A);
  if ('unsupported' in shape) return { ok: false, missing, unsupported: shape.unsupported };
  const { clustered, units, inner } = shape;

  const clusterIcc = clustered ? iccOf(f, A.level.id) : undefined;
  if (clustered && clusterIcc === undefined) missing.push(`the ICC of ${A.level.name} (Assumptions step)`);

  // Occasions: a level of repeated measures or sub-samples below the units, or else the follow-ups.
  const followUps = f.followUps;
  let occasionCount: number | undefined;
  let times: number[] | undefined;
  if (inner && inner.perParent >= 2) {
    if (!Number.isInteger(inner.perParent)) {
      missing.push(`a whole number of ${plural(inner)} per ${lower(units)} (the structure gives ${Number(inner.perParent.toPrecision(4))} on average; Structure step)`);
    }
    occasionCount = Math.round(inner.perParent);
    if (inner.level.kind === 'repeated' && followUps.length === occasionCount) times = followUps.map((o) => o.time);
  } else if (!inner && followUps.length >= 2) {
    occasionCount = followUps.length;
    times = followUps.map((o) => o.time);
  }
  if (times && times.some((t, i) => i > 0 && !(t > times![i - 1]!))) times = undefined;

  const icc = clusterIcc?.value ?? 0;
  let occasionCorrelation = 0;
  if (occasionCount !== undefined) {
    const unitIcc = iccOf(f, units.level.id);
    const share = unitIcc !== undefined ? unitIcc.value / (1 - icc) : f.occasionCorrelation?.value;
    if (share === undefined) missing.push(`the ICC of ${units.level.name} or the correlation between occasions (Assumptions step)`);
    else occasionCorrelation = Math.min(0.99, Math.max(0, share));
  }
  if (missing.length > 0) return { ok: false, missing, unsupported: [] };

  const o = design.outcome;
  const scenarios: ScenarioInput[] = [{ violation: 'none' }];
  if (outcome.shape === 'right-skewed') scenarios.push({ violation: 'skewed' });
  if (outcome.shape === 'heavy-tailed') scenarios.push({ violation: 'heavy-tailed' });
  if (o.outliersExpected) scenarios.push({ violation: 'outliers' });
  if (o.unequalVarianceExpected) scenarios.push({ violation: 'unequal-variance' });
  const serial = design.occasions.correlationStructure === 'ar1' || (inner?.level.kind === 'repeated' && inner.level.spatialOrSerial);
  if (occasionCount !== undefined && serial) scenarios.push({ violation: 'serial' });

  const byArm = unitsByArm(f, A);
  const perArm = byArm[0] === byArm[1] ? byArm[0]! : ([byArm[0]!, byArm[1]!] as [number, number]);
  const spec: SimulationSpecInput = {
    design: {
      arms: 2,
      ...(clustered
        ? { clustersPerArm: Math.max(2, Math.min(...byArm)), clusterSize: Math.max(1, Math.round(units.perParent)), clusterSizeCv: sizeCv(f, A.index, units.index) }
        : { unitsPerArm: perArm }),
      ...(occasionCount !== undefined ? { occasions: occasionCount, ...(times ? { times } : {}) } : {}),
    },
    truth: {
      effect: outcome.effect!.value,
      sd: outcome.sd!.value,
      icc,
      ...(occasionCount !== undefined ? { occasionCorrelation } : {}),
    },
    scenarios,
    analyses: [],
    replicates: REPLICATES.default,
    seed: SEED.default,
    alpha: design.assumptions.alpha,
  };
  const offered = offeredAnalyses(spec);
  const a = design.analysis;
  const wanted = new Set<AnalysisName>(['ols']);
  if (clustered || occasionCount !== undefined) (['cluster-robust', 'cluster-means', 'mixed'] as const).forEach((x) => wanted.add(x));
  if (outcome.shape === 'right-skewed' || a.transformation === 'log') wanted.add('log-ols');
  if (o.outliersExpected || a.method === 'robust-regression') wanted.add('huber');
  if (o.unequalVarianceExpected || a.standardErrors === 'hc3') wanted.add('ols-hc3');
  spec.analyses = offered.filter((x) => wanted.has(x));
  return { ok: true, spec, offered };
}
