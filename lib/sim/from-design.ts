/**
 * A stress test's compact specification from a study's design (lib/design/schema.ts), so that a
 * run can start from the study without the team restating its design.
 *
 * What is taken from the design:
 * - design: two arms; the level the treatment is assigned at is the experimental unit.
 *   The assigned level is the top level, whose count is the total in the study over both arms
 *   (the counting convention of lib/design/derive.ts); it is split by the arms' allocation.
 *   · assigned to a grouping level (classroom, tray): clustersPerArm = the smaller arm's share
 *     (the specification has one number of clusters per arm; with equal allocation that is half
 *     the total), clusterSize = the count of the level below (the units) and clusterSizeCv =
 *     that level's count CV.
 *   · assigned to independent units: unitsPerArm = the total split by the allocation.
 *   · a level of repeated measures or sub-samples below the units (nights, leaves) becomes the
 *     occasions (count = that level's count; times from the design's occasions when there are as
 *     many non-baseline occasions, else 0, 1, 2, …). Without such a level, two or more
 *     non-baseline occasions become the occasions. A single follow-up after a baseline is
 *     simulated as the follow-up alone: the specification has no baseline covariate.
 * - truth: effect and SD from the assumptions; icc = the ICC of the assigned grouping level;
 *   occasionCorrelation = the units' share of the variance left after the clusters,
 *   ICC_unit / (1 − ICC_cluster) (the model in lib/sim/generate.ts), with ICC_unit the ICC given
 *   for the unit's level or else the design's occasion correlation (taken as the correlation of
 *   two occasions beyond the cluster). The design's ICCs are shares of the total variance.
 * - scenarios: `none`, plus `skewed` for a right-skewed outcome, `heavy-tailed` for a
 *   heavy-tailed one, `outliers` when outliers are expected, `unequal-variance` when unequal
 *   variance is expected, `serial` for occasions that are serial (AR(1) correlation, or a level
 *   marked close in time).
 * - analyses: `ols` (what ignoring the dependence gives); with clusters or occasions
 *   `cluster-robust`, `cluster-means` and `mixed`; `log-ols` for a right-skewed or log-analysed
 *   outcome; `huber` when outliers are expected or robust regression is planned; `ols-hc3` when
 *   unequal variance is expected or HC3 is planned.
 * - alpha from the assumptions; replicates 1,000 and seed 1 (the caller may override both).
 *
 * Not representable (the answer names what is missing or why): fewer or more than two arms, a
 * treatment assigned within units or within clusters (cross-over, split-plot), more than one
 * level of clustering above the units, more than one level below them, outcomes other than
 * continuous, and a missing effect, SD or ICC.
 */
import type { Design, Level } from '@/lib/design/schema';
import { ANALYSIS_NAMES, type AnalysisName } from '@/lib/models/types';
import type { SimulationSpecInput } from '@/lib/validation/simulations';

export type SpecFromDesign = { ok: true; spec: SimulationSpecInput } | { ok: false; missing: string[] };

type ScenarioInput = SimulationSpecInput['scenarios'][number];

const DEFAULT_REPLICATES = 1000;
const DEFAULT_SEED = 1;

function iccOf(design: Design, levelId: string): number | undefined {
  return design.assumptions.iccs.find((c) => c.levelId === levelId)?.value;
}

/** The top level's total split by the arms' allocation: one number when the arms are equal. */
function perArm(total: number, allocation: [number, number]): number | [number, number] {
  const n1 = Math.round((total * allocation[0]) / (allocation[0] + allocation[1]));
  const n2 = total - n1;
  return n1 === n2 ? n1 : [n1, n2];
}

export function specFromDesign(design: Design): SpecFromDesign {
  const missing: string[] = [];
  const { outcome, structure, assignment, occasions, assumptions, analysis } = design;
  const levels = structure.levels;

  if (outcome.type !== undefined && outcome.type !== 'continuous') {
    missing.push(`a continuous outcome (this one is ${outcome.type}; send a specification with family binary or count instead)`);
  }
  if (assignment.kind === 'continuous' || assignment.arms.length !== 2) {
    missing.push('two arms to compare (the stress test compares two arms)');
  }
  if (levels.length === 0) missing.push('the levels of the structure');
  if (assumptions.effect === undefined) missing.push('the effect worth detecting (Assumptions)');
  if (assumptions.outcomeSd === undefined) missing.push('the outcome SD (Assumptions)');
  if (levels.length === 0) return { ok: false, missing };

  const assignedIndex = assignment.levelId ? levels.findIndex((l) => l.id === assignment.levelId) : 0;
  const assigned = levels[assignedIndex];
  if (!assigned) return { ok: false, missing: [...missing, 'the level the treatment is assigned at (Assignment)'] };
  if (assignedIndex > 0) {
    const above = levels.slice(0, assignedIndex).map((l) => l.name).join(', ');
    const why = assigned.kind === 'repeated' || assigned.kind === 'replicate' ? 'a treatment that changes within units (cross-over)' : `a treatment assigned below ${above}`;
    missing.push(`a treatment assigned at the top level: this design has ${why}, which the stress test does not simulate yet`);
    return { ok: false, missing };
  }
  if (assigned.kind === 'repeated' || assigned.kind === 'replicate') {
    missing.push(`a treatment assigned to units or clusters, not to ${assigned.name.toLowerCase()}`);
    return { ok: false, missing };
  }

  const allocation: [number, number] = [assignment.arms[0]?.allocation ?? 1, assignment.arms[1]?.allocation ?? 1];
  const clustered = assigned.kind === 'grouping';
  const units = clustered ? levels[1] : assigned;
  const inner = clustered ? levels[2] : levels[1];
  const beyond = clustered ? levels.slice(3) : levels.slice(2);

  if (clustered && (!units || units.kind === 'grouping')) {
    missing.push(units ? `one level of clustering (this design nests ${assigned.name} and ${units.name}; the stress test simulates one)` : `the units within each ${assigned.name.toLowerCase()} (Structure)`);
  }
  if (clustered && units && (units.kind === 'repeated' || units.kind === 'replicate')) {
    missing.push(`units within each ${assigned.name.toLowerCase()} (the level below it holds ${units.kind === 'repeated' ? 'repeated measures' : 'sub-samples'})`);
  }
  if (inner && inner.kind !== 'repeated' && inner.kind !== 'replicate') {
    missing.push(`at most one level of clustering above the units (${inner.name} is another)`);
  }
  if (beyond.length > 0) missing.push(`at most one level of measurements within units (${beyond.map((l) => l.name).join(', ')} would be another)`);

  const clusterIcc = clustered ? iccOf(design, assigned.id) : undefined;
  if (clustered && clusterIcc === undefined) missing.push(`the ICC of ${assigned.name} (Assumptions)`);
  if (missing.length > 0) return { ok: false, missing };

  // Occasions: a level of repeated measures or sub-samples, or else the design's follow-ups.
  const followUps = occasions.list.filter((o) => !o.baseline);
  let occasionCount: number | undefined;
  let times: number[] | undefined;
  if (inner && inner.count >= 2) {
    occasionCount = inner.count;
    if (inner.kind === 'repeated' && followUps.length === inner.count) times = followUps.map((o) => o.time);
  } else if (!inner && followUps.length >= 2) {
    occasionCount = followUps.length;
    times = followUps.map((o) => o.time);
  }
  if (times && times.some((t, i) => i > 0 && !(t > times![i - 1]!))) times = undefined;

  const icc = clusterIcc ?? 0;
  let occasionCorrelation = 0;
  if (occasionCount !== undefined && units) {
    const unitIcc = iccOf(design, units.id);
    const share = unitIcc !== undefined ? unitIcc / (1 - icc) : assumptions.occasionCorrelation?.value;
    if (share === undefined) return { ok: false, missing: [`the ICC of ${units.name} or the correlation between occasions (Assumptions)`] };
    occasionCorrelation = Math.min(0.99, Math.max(0, share));
  }

  const scenarios: ScenarioInput[] = [{ violation: 'none' }];
  if (outcome.shape === 'right-skewed') scenarios.push({ violation: 'skewed' });
  if (outcome.shape === 'heavy-tailed') scenarios.push({ violation: 'heavy-tailed' });
  if (outcome.outliersExpected) scenarios.push({ violation: 'outliers' });
  if (outcome.unequalVarianceExpected) scenarios.push({ violation: 'unequal-variance' });
  const serial = occasions.correlationStructure === 'ar1' || (inner?.kind === 'repeated' && inner.spatialOrSerial);
  if (occasionCount !== undefined && serial) scenarios.push({ violation: 'serial' });

  const wanted = new Set<AnalysisName>(['ols']);
  if (clustered || occasionCount !== undefined) ['cluster-robust', 'cluster-means', 'mixed'].forEach((a) => wanted.add(a as AnalysisName));
  if (outcome.shape === 'right-skewed' || analysis.transformation === 'log') wanted.add('log-ols');
  if (outcome.outliersExpected || analysis.method === 'robust-regression') wanted.add('huber');
  if (outcome.unequalVarianceExpected || analysis.standardErrors === 'hc3') wanted.add('ols-hc3');
  if (analysis.method === 'mixed-model') wanted.add('mixed');
  if (analysis.method === 'cluster-means') wanted.add('cluster-means');
  if (analysis.standardErrors === 'cluster-robust' || analysis.standardErrors === 'cr2') wanted.add('cluster-robust');

  const spec: SimulationSpecInput = {
    design: {
      arms: 2,
      ...(clustered
        ? { clustersPerArm: Math.max(2, Math.min(...[perArm(assigned.count, allocation)].flat())), clusterSize: units!.count, clusterSizeCv: units!.countCv }
        : { unitsPerArm: perArm(assigned.count, allocation) }),
      ...(occasionCount !== undefined ? { occasions: occasionCount, ...(times ? { times } : {}) } : {}),
    },
    truth: {
      effect: assumptions.effect!.value,
      sd: assumptions.outcomeSd!.value,
      icc,
      ...(occasionCount !== undefined ? { occasionCorrelation } : {}),
    },
    scenarios,
    analyses: ANALYSIS_NAMES.filter((a) => wanted.has(a)),
    replicates: DEFAULT_REPLICATES,
    seed: DEFAULT_SEED,
    alpha: assumptions.alpha,
  };
  return { ok: true, spec };
}
