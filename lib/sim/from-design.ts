/**
 * A stress test's compact specification from a study's design, so that a run can start from the
 * study without the team restating its design. The design is read only through its facts
 * (lib/design/facts.ts), the reader the checks and the Plan use too: the same counts, units,
 * ICCs and outcome numbers.
 *
 * The outcome (truth.family and its numbers, as the Plan reads them):
 * - continuous: gaussian, effect and SD from the facts.
 * - binary: the control proportion is the baseline; the effect as the Assumptions step states it
 *   (second proportion, difference, risk ratio or odds ratio) gives the second proportion p2
 *   (lib/stats/calculations/proportion-effect.ts, as the Plan's calculations), and the effect is
 *   the log odds ratio ln[p2/(1 − p2)] − ln[p1/(1 − p1)].
 * - count: the baseline is the mean count of one observation, baseline rate × follow-up time;
 *   the effect is the log rate ratio; the dispersion d of the Assumptions step (variance
 *   μ + d·μ²) is the negative-binomial shape k = 1/d (Poisson counts when d is 0 or not given).
 *   When whole clusters are randomised the clusters' rates vary by the between-cluster CV
 *   (clusterCv), as in the Plan's Hayes & Bennett calculation. As in the Plan, the counts of a
 *   unit's occasions are taken together (one count per unit over its follow-up), so a count
 *   outcome has no occasions outside a cross-over.
 * Other outcome types (a proportion, a bounded score, a time to an event) are not simulated.
 *
 * The shape (design), one of:
 * - Treatment at the top level, the same for all observations of a unit. The level of
 *   assignment is the cluster when it groups units or groups below it (classrooms of pupils,
 *   trays of plants, schools of classrooms): clustersPerArm = the smaller arm's number (the
 *   specification has one number per arm), clusterSize = members per cluster analysed, as the Plan
 *   counts them (`analysedPerParent`: the whole part of the number per cluster less the design's
 *   largest attrition), clusterSizeCv = the members' count CV. Otherwise units are
 *   independent: unitsPerArm = the units in each arm. A level below the units (nights,
 *   leaves, or the pupils of classrooms in schools) becomes the occasions — for a level of
 *   independent members (pupils) these are sub-samples, so a design with two levels of
 *   clustering and the treatment at the top simulates school, classroom and pupil; the pupils'
 *   own count CV is not simulated (every classroom has the average). Without such a level, two
 *   or more follow-ups become the occasions (times from the design). A single follow-up after a
 *   baseline is simulated as the follow-up alone: the specification has no baseline covariate.
 *   A binary outcome measured on several occasions keeps one occasion, as the Plan does.
 * - Treatment at a level within an upper one (classrooms within schools, plants within trays):
 *   the upper level's units are blocks that each hold both arms (design.blocks), as in a
 *   randomisation stratified by them; per block and arm, the smaller arm's share of the units
 *   per block, rounded down (at least 2). The upper level's ICC is blockIcc.
 * - Treatment within units (a cross-over, or occasions of one unit assigned to arms): each unit
 *   receives both arms, one per period (design.crossover). The periods are the unit's
 *   observations (the level below it). With a cross-over of P periods described in the
 *   Assignment step and N observations per unit, each period holds N / P consecutive
 *   observations, so the sleep-timing demo (8 nights, 2 periods of 4 nights) is simulated as 8
 *   periods with the sequences AAAABBBB and BBBBAAAA; period effects (default 0) are fitted
 *   for each night. P periods follow the sequences ABBA… and its mirror image (AB/BA, ABB/BAA,
 *   …; `defaultSequences`). Without a cross-over described, the design does not say which
 *   occasions get which arm: they follow ABBA… over the N occasions and its mirror image, which
 *   balances the arms over time. Half the units (rounded up) follow each sequence.
 *   The carry-over scenario is added when the design says carry-over is possible.
 * - A trajectory of interest (Occasions step) or a planned random slope for time, with occasions
 *   at two or more times, on a continuous outcome: the target is the difference in slopes
 *   (treat:time), effect / (last time − first time) per time unit as the Plan reads it. The
 *   design has no number for how much the units' slopes vary, so randomSlopeSd stays 0 (the
 *   Plan's compound symmetry); the team can add it to a specification sent through the API.
 *
 * Random effects (truth): the design's ICCs are shares of the total variance (facts.ts).
 * icc = the ICC of the clusters; occasionCorrelation = the units' share of the variance left
 * after the clusters and blocks, ICC_unit / (1 − ICC_cluster − ICC_block) (the model of
 * lib/sim/generate.ts), with ICC_unit the ICC given for the unit's level or else the design's
 * occasion correlation. For binary and count outcomes they are shares on the link scale, except
 * for a binary outcome whose only random effect is the clusters: there icc is on the proportion
 * scale (iccScale 'proportion', Donner & Klar 2000), the ICC the Plan's calculation uses.
 *
 * Scenarios: `none`, plus for a continuous outcome `skewed` (right-skewed), `heavy-tailed`,
 * `outliers` and `unequal-variance` as the Outcome step expects them, and `serial` for
 * occasions that are serial (AR(1) correlation, or a level marked close in time; not in a
 * cross-over); `carry-over` for a cross-over where carry-over is possible.
 *
 * Analyses: of those that apply to the simulated data (lib/sim/analyses.ts), for a continuous
 * outcome `ols` (what ignoring the dependence gives), with clusters, occasions, blocks or a
 * cross-over `cluster-robust`, `cluster-means` and `mixed`, `period-difference` for AB/BA,
 * `log-ols`, `huber`, `ols-hc3` as the outcome and plan suggest; for binary and count outcomes
 * `glm`, `glmm`, `glm-nb` (counts), `cluster-means` and `cluster-robust`.
 * alpha from the assumptions; replicates 1,000 and seed 1 (the caller may override both).
 *
 * When the design cannot be simulated, the answer says why in the researcher's words: `missing`
 * lists numbers or choices the Design tab can supply (each naming its step), `unsupported` has
 * one sentence per feature of the design the stress test does not simulate, with what the team
 * can do instead.
 */
import { capitalise as cap, formatNumber, nounFor } from '@/lib/format';
import { analysedPerParent, clusterRandomised, designFacts, sizeCv, unitsByArm, type DesignFacts, type LevelInfo, type Sourced } from '@/lib/design/facts';
import type { Design } from '@/lib/design/schema';
import type { AnalysisName } from '@/lib/models/types';
import { p2FromEffect } from '@/lib/stats/calculations/proportion-effect';
import { defaultSequences, MAX_OCCASIONS, MAX_PERIODS, REPLICATES, SEED, type SimulationSpecInput } from './spec';
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
type DesignInput = SimulationSpecInput['design'];
type TruthInput = SimulationSpecInput['truth'];
type Family = NonNullable<TruthInput['family']>;

const lower = (L: LevelInfo) => L.level.name.toLowerCase();
/** "classroom" → "classrooms", "person" → "people" (lib/format.ts). */
const plural = (L: LevelInfo) => nounFor(2, lower(L));
const nice = (x: number) => formatNumber(x, 4);

const NOT_SIMULATED: Record<string, string> = {
  proportion:
    'The outcome is a proportion: the stress test simulates continuous, yes-or-no and count outcomes, not values between 0 and 1; the Plan tab sizes it with a normal approximation.',
  'bounded-score':
    'The outcome is a score with a floor and a ceiling: the stress test cannot yet simulate values piling up at a bound; the Plan tab sizes it with a normal approximation.',
  'time-to-event': 'The outcome is a time to an event: the stress test cannot simulate survival data yet; ask a statistician for an events-based simulation.',
};

/** The outcome's part of the truth, read from the facts, with what is missing. */
function outcomeTruth(f: DesignFacts, clustered: boolean, missing: string[]): { family: Family; truth: Partial<TruthInput> } {
  const o = f.outcome;
  if (o.family === 'binary') {
    const p1 = o.controlProportion?.value;
    const e = o.proportionEffect;
    if (p1 === undefined) missing.push('the proportion expected without the intervention (Assumptions step)');
    if (!e) missing.push('the effect worth detecting on the proportion (Assumptions step)');
    if (p1 === undefined || !e) return { family: 'binary', truth: {} };
    let p2: number | undefined;
    try {
      p2 = p2FromEffect({ p1, [e.measure]: e.value });
    } catch {
      p2 = undefined;
    }
    if (p2 === undefined) {
      missing.push(`an effect that keeps the proportion with the intervention between 0 and 1 (the effect given puts it at ${nice(e.measure === 'difference' ? p1 + e.value : p1 * e.value)}; Assumptions step)`);
      return { family: 'binary', truth: {} };
    }
    const logit = (p: number) => Math.log(p / (1 - p));
    return { family: 'binary', truth: { baseline: p1, effect: logit(p2) - logit(p1) } };
  }
  if (o.family === 'count') {
    const need = (x: Sourced | undefined, what: string) => {
      if (!x) missing.push(`${what} (Assumptions step)`);
      return x?.value;
    };
    const rate = need(o.baselineRate, 'the rate of events expected without the intervention');
    const ratio = need(o.rateRatio, 'the rate ratio worth detecting');
    const time = need(o.followUpTime, 'the follow-up time of each unit');
    const cv = clustered ? need(o.betweenClusterCv, 'the coefficient of variation of the rates between clusters') : undefined;
    const d = o.dispersion?.value ?? 0;
    return {
      family: 'count',
      truth: {
        ...(rate !== undefined && time !== undefined ? { baseline: rate * time } : {}),
        ...(ratio !== undefined ? { effect: Math.log(ratio) } : {}),
        ...(d > 0 ? { overdispersion: 1 / d } : {}),
        ...(cv !== undefined && cv > 0 ? { clusterCv: cv } : {}),
      },
    };
  }
  if (!o.effect) missing.push('the effect worth detecting (Assumptions step)');
  if (!o.sd) missing.push('the outcome SD (Assumptions step)');
  return { family: 'gaussian', truth: { ...(o.effect ? { effect: o.effect.value } : {}), ...(o.sd ? { sd: o.sd.value } : {}) } };
}

/** What the shape of the design gives the specification. */
interface Shape {
  design: DesignInput;
  /** The level whose ICC is `icc` (the clusters), if any. */
  clusters?: LevelInfo;
  /** The level of the units, whose ICC (or the occasion correlation) gives occasionCorrelation when they have occasions or periods. */
  units: LevelInfo;
  /** The level of blocks, whose ICC is blockIcc. */
  blocks?: LevelInfo;
  /** Occasions or periods per unit (1 when measured once). */
  repeats: number;
  /** Occasions are serial in time (AR(1) or a level marked close in time). */
  serial: boolean;
}

type ShapeResult = Shape | { unsupported: string[] } | { missing: string[] };

/** A whole number of `inner` per `outer`, or a missing item naming the Structure step. */
function whole(inner: LevelInfo, outer: LevelInfo, missing: string[]): number {
  if (!Number.isInteger(inner.perParent)) {
    missing.push(`a whole number of ${plural(inner)} per ${lower(outer)} (the structure gives ${nice(inner.perParent)} on average; Structure step)`);
  }
  return Math.round(inner.perParent);
}

/** Each unit receives both arms in turn: a cross-over (or within-subject design) of single units. */
function crossoverShape(f: DesignFacts, E: LevelInfo): ShapeResult {
  const inner = f.levels[E.index + 1];
  if (E.index > 0) {
    const above = f.levels[E.index - 1]!;
    return { unsupported: [`The ${plural(E)} who receive both arms in turn are grouped in ${plural(above)}: the stress test simulates a cross-over of independent ${plural(E)} only, so stress-test a copy of the study without the ${plural(above)}.`] };
  }
  // Periods given only as occasions (no level below the unit): one observation per occasion.
  const byOccasions = !inner && f.followUps.length >= 2;
  if (!byOccasions && (!inner || inner.level.kind === 'independent' || inner.level.kind === 'grouping' || f.levels.length > E.index + 2)) {
    return {
      unsupported: [
        `Each ${lower(E)} receives both arms in turn with several ${inner ? plural(inner) : 'members'} measured in each period: the stress test simulates a cross-over with one observation per ${lower(E)} and period, so it cannot run on this design; the Plan tab and the Checks describe it.`,
      ],
    };
  }
  const missing: string[] = [];
  const N = inner ? whole(inner, E, missing) : f.followUps.length;
  const periodWords = inner ? plural(inner) : 'occasions';
  if (N > MAX_PERIODS) {
    return { unsupported: [`Each ${lower(E)} is measured on ${N} ${periodWords}: the stress test simulates at most ${MAX_PERIODS} periods per ${lower(E)}, so stress-test a copy of the study with at most ${MAX_PERIODS} ${periodWords}.`] };
  }
  const P = f.crossover?.periods ?? N;
  if (N < 2 || P < 2 || N % P !== 0) {
    missing.push(`a number of ${periodWords} per ${lower(E)} that splits evenly into the ${P} periods of the cross-over (${N} now; ${inner ? 'Structure' : 'Occasions'} or Assignment step)`);
  }
  if (missing.length > 0) return { missing };
  const perPeriod = N / P;
  const sequences = defaultSequences(P).map((q) => [...q].map((x) => x.repeat(perPeriod)).join('')) as [string, string];
  const units = Math.round(E.total);
  const first = Math.ceil(units / 2);
  const second = units - first;
  if (second < 2) return { missing: [`at least 4 ${plural(E)}, 2 for each order of the arms (Structure step)`] };
  const standard = sequences[0] === defaultSequences(N)[0];
  return {
    design: {
      arms: 2,
      unitsPerArm: first === second ? first : [first, second],
      crossover: { periods: N, ...(standard ? {} : { sequences }) },
    },
    units: E,
    repeats: N,
    serial: false,
  };
}

/**
 * The treatment is the same for all observations of a unit of level A: clusters of members, or
 * independent units, with occasions below them; inside blocks when A has a level above it.
 */
function betweenShape(f: DesignFacts, A: LevelInfo, family: Family): ShapeResult {
  const missing: string[] = [];
  const blocks = A.index > 0 ? f.levels[A.index - 1] : undefined;
  if (A.index > 1) {
    const names = f.levels.slice(0, A.index).map(plural);
    return { unsupported: [`The treatment is assigned to ${plural(A)} within ${names.slice(1).reverse().join(' within ')} within ${names[0]}: the stress test simulates one level above the level of assignment, so stress-test a copy of the study without the ${names[0]}.`] };
  }
  const below = f.levels[A.index + 1];
  // A continuous outcome simulates replicates below the units (cells of a mouse) as occasions of
  // the unit, the same variance model; counts and proportions follow the Plan's clusters.
  const clustered = clusterRandomised(f) && below !== undefined && (family !== 'gaussian' || below.level.kind === 'independent' || below.level.kind === 'grouping');
  const members = clustered ? below! : A;
  // Counts: one count per member over its follow-up (the Plan's reading); levels below are taken together.
  let inner = family === 'count' ? undefined : f.levels[members.index + 1];
  if (inner && f.levels.length > inner.index + 1) {
    const chain = f.levels.slice(A.index).map(plural).reverse();
    return { unsupported: [`The ${chain.at(-1)} hold ${chain.slice(0, -1).join(' within ')}: the stress test simulates at most three levels from the level of assignment down, so stress-test a copy of the study that leaves out the lowest level (its observations averaged).`] };
  }
  if (family === 'binary' && inner?.level.kind === 'repeated') inner = undefined;

  let repeats = 1;
  let times: number[] | undefined;
  if (inner && inner.perParent >= 2) {
    repeats = whole(inner, members, missing);
    if (inner.level.kind === 'repeated' && f.followUps.length === repeats) times = f.followUps.map((o) => o.time);
  } else if (!inner && family === 'gaussian' && f.followUps.length >= 2) {
    repeats = f.followUps.length;
    times = f.followUps.map((o) => o.time);
  }
  if (repeats > MAX_OCCASIONS) {
    return { unsupported: [`Each ${lower(members)} holds ${repeats} ${inner ? plural(inner) : 'occasions'}: the stress test simulates at most ${MAX_OCCASIONS} per ${lower(members)}, so stress-test a copy of the study with fewer.`] };
  }
  if (times && times.some((t, i) => i > 0 && !(t > times![i - 1]!))) times = undefined;

  let perBlock: number | undefined;
  if (blocks) {
    const perParent = Math.floor(A.perParent * Math.min(...f.armShares) + 1e-9);
    if (perParent < 2) {
      return {
        unsupported: [
          `Each ${lower(blocks)} holds ${nice(A.perParent)} ${A.perParent === 1 ? lower(A) : plural(A)}: the stress test compares the arms within ${plural(blocks)} with at least 2 ${plural(A)} of each arm in every ${lower(blocks)}, so it cannot run on this design; the Plan tab sizes it.`,
        ],
      };
    }
    perBlock = perParent;
  }
  if (missing.length > 0) return { missing };

  const byArm = unitsByArm(f, A);
  const perArm = byArm[0] === byArm[1] ? byArm[0]! : ([byArm[0]!, byArm[1]!] as [number, number]);
  const size: Partial<DesignInput> = clustered
    ? { clustersPerArm: perBlock ?? Math.max(2, Math.min(...byArm)), clusterSize: analysedPerParent(f, members), clusterSizeCv: sizeCv(f, A.index, members.index) }
    : { unitsPerArm: perBlock ?? perArm };
  const overTime = inner === undefined || inner.level.kind === 'repeated';
  const trajectory = family === 'gaussian' && overTime && (f.design.occasions.trajectoryOfInterest || f.design.analysis.randomSlopeForTime) && repeats >= 2;
  const serial = f.design.occasions.correlationStructure === 'ar1' || (inner?.level.kind === 'repeated' && inner.level.spatialOrSerial);
  return {
    design: {
      arms: 2,
      ...size,
      ...(repeats >= 2 ? { occasions: repeats, ...(times ? { times } : {}) } : {}),
      ...(trajectory ? { target: 'treat:time' as const } : {}),
      ...(blocks ? { blocks: Math.round(blocks.total) } : {}),
    },
    ...(clustered ? { clusters: A } : {}),
    units: members,
    ...(blocks ? { blocks } : {}),
    repeats,
    serial: repeats >= 2 && serial,
  };
}

export function specFromDesign(design: Design): SpecFromDesign {
  const f = designFacts(design);
  const missing: string[] = [];
  const unsupported: string[] = [];

  if (f.levels.length === 0) missing.push('the levels of the structure, from top to bottom (Structure step)');
  if (f.levels.length > 0 && !f.assignment) missing.push('the level the treatment is assigned at (Assignment step)');
  if (design.assignment.kind !== 'continuous' && f.armShares.length < 2) missing.push('the two arms to compare (Assignment step)');

  const notSimulated = NOT_SIMULATED[f.outcome.family];
  if (notSimulated) unsupported.push(notSimulated);
  if (design.assignment.kind === 'continuous') {
    unsupported.push('The explanatory variable is continuous: the stress test compares two arms, so it cannot run on this design; the Plan tab sizes its regression.');
  } else if (f.armShares.length > 2) {
    unsupported.push(`The design has ${f.armShares.length} arms: the stress test compares two, so stress-test the main comparison in a copy of the study that keeps only those two arms.`);
  }
  const A = f.assignment;
  const E = f.eu;
  if (!A || !E || missing.length > 0 || unsupported.length > 0) return { ok: false, missing, unsupported };

  const family: Family = f.outcome.family === 'binary' ? 'binary' : f.outcome.family === 'count' ? 'count' : 'gaussian';
  const shape = f.withinUnit ? crossoverShape(f, E) : betweenShape(f, A, family);
  if ('unsupported' in shape) return { ok: false, missing: [], unsupported: shape.unsupported };
  if ('missing' in shape) return { ok: false, missing: [...missing, ...shape.missing], unsupported: [] };

  const { family: fam, truth: outcome } = outcomeTruth(f, shape.clusters !== undefined, missing);

  // Random effects: the design's ICCs (shares of the total variance).
  const shareOf = (L: LevelInfo | undefined, what: string) => {
    if (!L) return 0;
    if (!L.icc) missing.push(`the ICC of ${L.level.name}${what} (Assumptions step)`);
    return L.icc?.value ?? 0;
  };
  const countCv = fam === 'count' && shape.clusters !== undefined;
  const icc = countCv ? 0 : shareOf(shape.clusters, '');
  const blockIcc = shareOf(shape.blocks, '');
  let occasionCorrelation = 0;
  if (shape.repeats >= 2) {
    const unit = shape.units.icc ?? f.occasionCorrelation;
    if (!unit) missing.push(`the ICC of ${shape.units.level.name} or the correlation between occasions (Assumptions step)`);
    else occasionCorrelation = Math.min(0.99, Math.max(0, unit.value / Math.max(1e-9, 1 - icc - blockIcc)));
  }
  if (icc + blockIcc >= 1) missing.push(`ICCs that add up to less than 1 (now ${nice(icc + blockIcc)}; Assumptions step)`);
  if (missing.length > 0) return { ok: false, missing, unsupported: [] };

  const proportionScale = fam === 'binary' && shape.clusters !== undefined && shape.repeats < 2 && !shape.blocks;
  const crossover = shape.design.crossover !== undefined;
  let effect = outcome.effect!;
  if (shape.design.target === 'treat:time') {
    const t = shape.design.times ?? Array.from({ length: shape.repeats }, (_, i) => i);
    effect = effect / (t.at(-1)! - t[0]!);
  }
  const truth: TruthInput = {
    ...outcome,
    effect,
    ...(fam !== 'gaussian' ? { family: fam } : {}),
    icc,
    ...(proportionScale && icc > 0 ? { iccScale: 'proportion' as const } : {}),
    ...(blockIcc > 0 ? { blockIcc } : {}),
    ...(shape.repeats >= 2 ? { occasionCorrelation } : {}),
  };

  const o = design.outcome;
  const scenarios: ScenarioInput[] = [{ violation: 'none' }];
  if (fam === 'gaussian') {
    if (f.outcome.shape === 'right-skewed') scenarios.push({ violation: 'skewed' });
    if (f.outcome.shape === 'heavy-tailed') scenarios.push({ violation: 'heavy-tailed' });
    if (o.outliersExpected) scenarios.push({ violation: 'outliers' });
    if (o.unequalVarianceExpected) scenarios.push({ violation: 'unequal-variance' });
    if (shape.serial && !crossover) scenarios.push({ violation: 'serial' });
  }
  if (crossover && f.crossover?.carryoverPossible) scenarios.push({ violation: 'carry-over' });

  const spec: SimulationSpecInput = {
    design: shape.design,
    truth,
    scenarios,
    analyses: [],
    replicates: REPLICATES.default,
    seed: SEED.default,
    alpha: design.assumptions.alpha,
  };
  const offered = offeredAnalyses(spec);
  const a = design.analysis;
  const dependent = shape.clusters !== undefined || shape.repeats >= 2 || shape.blocks !== undefined;
  const wanted = new Set<AnalysisName>();
  if (fam === 'gaussian') {
    wanted.add('ols');
    if (dependent) (['cluster-robust', 'cluster-means', 'mixed', 'period-difference'] as const).forEach((x) => wanted.add(x));
    if (f.outcome.shape === 'right-skewed' || a.transformation === 'log') wanted.add('log-ols');
    if (o.outliersExpected || a.method === 'robust-regression') wanted.add('huber');
    if (o.unequalVarianceExpected || a.standardErrors === 'hc3') wanted.add('ols-hc3');
  } else {
    (['glm', 'glmm', 'cluster-means', 'cluster-robust'] as const).forEach((x) => wanted.add(x));
    if (truth.overdispersion !== undefined || truth.clusterCv !== undefined) wanted.add('glm-nb');
  }
  spec.analyses = offered.filter((x) => wanted.has(x));
  return { ok: true, spec, offered };
}

/**
 * What the specification's size per arm counts, in the design's words: "classrooms per arm",
 * "volunteers per sequence" (a cross-over), "classrooms per arm in each school" (blocks), or
 * "units per arm" when the design does not name them.
 */
export function sizeWords(design: Design, spec: SimulationSpecInput): string {
  const f = designFacts(design);
  const d = spec.design;
  if (d.crossover) return `${f.eu ? plural(f.eu) : 'units'} per sequence`;
  const A = f.assignment;
  if (!A) return d.clustersPerArm !== undefined ? 'clusters per arm' : 'units per arm';
  const above = f.levels[A.index - 1];
  return `${plural(A)} per arm${d.blocks !== undefined && above ? ` in each ${lower(above)}` : ''}`;
}

/** "nights 1–4", "night 5": a run of consecutive occasions, counted from 1. */
function span(L: LevelInfo | undefined, from: number, to: number): string {
  const name = L ? lower(L) : 'period';
  return from === to ? `${name} ${from}` : `${name.endsWith('s') ? name : `${name}s`} ${from}–${to}`;
}

/** "Early schedule on nights 1–4, then Late schedule on nights 5–8": a sequence in the arms' names. */
function sequenceWords(sequence: string, arms: string[], L: LevelInfo | undefined): string {
  const runs: string[] = [];
  for (let i = 0; i < sequence.length; ) {
    let j = i;
    while (j + 1 < sequence.length && sequence[j + 1] === sequence[i]) j++;
    runs.push(`${arms[sequence[i] === 'A' ? 0 : 1]} on ${span(L, i + 1, j + 1)}`);
    i = j + 1;
  }
  return runs.join(', then ');
}

/**
 * What a specification simulates, in the design's words, for the Stress test tab: the units and
 * how the arms fall on them (in a cross-over, the two orders of the arms), and for binary and
 * count outcomes the scale of the effect, on which bias and CI width are reported.
 */
export function describeSimulation(design: Design, spec: SimulationSpecInput): string[] {
  const f = designFacts(design);
  const d = spec.design;
  const t = spec.truth;
  const arms = design.assignment.arms.map((a) => a.name);
  const out: string[] = [];
  /** The level one simulated observation belongs to: a period's night, a cluster's member, or the unit. */
  let row: LevelInfo | undefined = f.assignment;
  const perArm = typeof d.unitsPerArm === 'number' ? `${d.unitsPerArm}` : d.unitsPerArm ? `${d.unitsPerArm[0]} and ${d.unitsPerArm[1]}` : '';
  if (d.crossover && f.eu && arms.length >= 2) {
    const inner = f.levels[f.eu.index + 1];
    row = inner;
    const [s1, s2] = d.crossover.sequences ?? defaultSequences(d.crossover.periods);
    out.push(
      `Simulated from the design: ${perArm} ${plural(f.eu)} in each of two orders, each measured on ${d.crossover.periods} ${inner ? plural(inner) : 'periods'} — ${sequenceWords(s1, arms, inner)}; or ${sequenceWords(s2, arms, inner)}. Every analysis adjusts for the ${inner ? lower(inner) : 'period'}.`,
    );
  } else if (f.assignment) {
    const A = f.assignment;
    const members = f.levels[A.index + 1];
    if (d.clustersPerArm !== undefined) row = members;
    const within = d.blocks !== undefined && A.index > 0 ? ` in each of ${d.blocks} ${plural(f.levels[A.index - 1]!)}` : '';
    const lost = members && d.clusterSize !== undefined && d.clusterSize < Math.round(members.perParent) && f.maxAttrition > 0 ? ` analysed in each (${nice(members.perParent)} planned, less the ${nice(f.maxAttrition * 100)}% lost by the last occasion, as the Plan counts them)` : '';
    const what = d.clustersPerArm !== undefined ? `${d.clustersPerArm} ${plural(A)} per arm${within}, ${d.clusterSize} ${members ? plural(members) : 'members'}${lost || ' each'}` : `${perArm} ${plural(A)} per arm${within}`;
    const occasions = d.occasions !== undefined ? `, measured ${d.occasions} times` : '';
    out.push(`Simulated from the design: ${what}${occasions}.${d.target === 'treat:time' ? ' The effect is the difference in slopes over time between the arms.' : ''}`);
  }
  const base = t.baseline;
  if (t.family === 'binary' && base !== undefined) {
    const p2 = 1 / (1 + Math.exp(-(Math.log(base / (1 - base)) + t.effect)));
    out.push(`The effect is a log odds ratio of ${nice(t.effect)} (a proportion of ${nice(base)} without the intervention and ${nice(p2)} with it); bias and CI width are on the log-odds scale.`);
  } else if (t.family === 'count' && base !== undefined) {
    out.push(`The effect is a log rate ratio of ${nice(t.effect)} (rate ratio ${nice(Math.exp(t.effect))}; a mean count of ${nice(base)} per ${row ? lower(row) : 'unit'} over the follow-up without the intervention); bias and CI width are on the log scale.`);
  }
  return out;
}

/**
 * The stress test's analysis that is the design's planned one (Analysis step), when the run can
 * show it: a mixed model → `mixed` (`glmm` for a binary or count outcome); GEE or cluster-robust
 * standard errors → `cluster-robust`; cluster means → `cluster-means`; a GLM → `glm` (`glm-nb`
 * for a negative-binomial family); robust regression → `huber`; a t test, linear regression or
 * ANCOVA → `ols` (`period-difference` for a t test of a two-period cross-over, `ols-hc3` with
 * HC3 standard errors, `log-ols` on the log scale). Null when no method is planned ('other' or
 * none). A run that did not include it cannot show it: the caller checks the run's analyses.
 */
export function plannedAnalysis(design: Design, spec: SimulationSpecInput): AnalysisName | null {
  const a = design.analysis;
  const binaryOrCount = (spec.truth.family ?? 'gaussian') !== 'gaussian';
  const planned = ((): AnalysisName | null => {
    switch (a.method) {
      case 'mixed-model':
      case 'glmm':
        return binaryOrCount ? 'glmm' : 'mixed';
      case 'gee':
        return 'cluster-robust';
      case 'cluster-means':
        return 'cluster-means';
      case 'glm':
        return a.glmFamily === 'negative-binomial' ? 'glm-nb' : binaryOrCount ? 'glm' : 'ols';
      case 'robust-regression':
        return 'huber';
      case 't-test':
      case 'linear-regression':
      case 'ancova':
        if (a.standardErrors === 'cluster-robust' || a.standardErrors === 'cr2') return 'cluster-robust';
        if (a.standardErrors === 'hc3') return 'ols-hc3';
        if (a.transformation === 'log') return 'log-ols';
        if (spec.design.crossover?.periods === 2 && a.method === 't-test' && !binaryOrCount) return 'period-difference';
        return binaryOrCount ? 'glm' : 'ols';
      default:
        return null;
    }
  })();
  return planned;
}
