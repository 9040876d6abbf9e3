/**
 * The calculation that fits a study's design, filled in from the design's assumptions: the Plan
 * tab's starting point. Pure: no database, no randomness.
 *
 * Which calculation (first match wins):
 * - no levels or no level of assignment: none yet (what to fill in is listed);
 * - time-to-event outcome: none (no calculation for survival outcomes yet);
 * - a continuous exposure: `regression`, the slope of the outcome on the exposure;
 * - the treatment varies within the experimental unit in a two-period cross-over:
 *   `two-group-means` on the period differences (the AB/BA analysis, Senn 2002), below;
 * - a count outcome (events over a follow-up time): whole clusters randomised → `cluster-rates`
 *   (Hayes & Bennett 1999), otherwise `two-rates` (Wald test on the log rate ratio, Poisson or
 *   negative binomial), from the baseline rate, rate ratio, follow-up time, overdispersion and
 *   between-cluster coefficient of variation of the Assumptions step (`planForCountOutcome`);
 * - the experimental unit holds observations of units below it that are not repeated
 *   measurements over time (pupils in classrooms, plants in trays, replicate wells): binary
 *   outcome → `cluster-proportions` (`planForBinaryOutcome`); otherwise `cluster-means`;
 * - the experimental unit is measured repeatedly: trajectory of interest → `longitudinal-slopes`;
 *   baselines and follow-ups, or several follow-ups → `repeated-measures` (ANCOVA when the plan or
 *   the recommendation adjusts for the baseline);
 * - independent units measured once: binary → `two-proportions` (`planForBinaryOutcome`);
 *   otherwise `two-group-means`.
 * Binary outcomes are planned from the control proportion and the effect as the Assumptions step
 * states it (second proportion, difference, risk ratio or odds ratio); no count or binary outcome
 * is sized by a normal approximation on an SD.
 *
 * Deeper nesting (trays → plants → leaves). The cluster-means calculation has two levels, the
 * cluster and its members. With ICCs read as shares ρₖ of the total variance σ² (the convention
 * of lib/design/facts.ts) and Mₖ observations per unit of level k, the mean of one member (level
 * c, the level below the cluster) varies within its cluster by v = Σ_{k ≥ c} ρₖ·Mₖ/M_c (the
 * bottom level's share is 1 − Σ of the others, M = 1). The cluster-means calculation is then
 * given the members' means: SD σ·√(ρ_cl + v), ICC ρ_cl / (ρ_cl + v), m = members per cluster —
 * which gives the variance of a cluster mean exactly: σ²·(ρ_cl + v/m). With two levels this is
 * the outcome's SD and ICC unchanged. Shares of levels above the cluster are added to the
 * cluster's share unless the randomisation is blocked by them and the analysis includes the
 * blocks (then they cancel from the comparison).
 *
 * Two-period cross-over (AB/BA). Each unit gives k observations per period; under compound
 * symmetry with correlation ρ between observations of one unit, the difference of its two period
 * means has variance 2σ²(1 − ρ)/k. The treatment effect is half the difference of the mean
 * period differences of the two sequences, so the test is the two-sample t test of the halved
 * period differences between sequences (Senn 2002, the basic AB/BA analysis, df n − 2):
 * delta = the effect, SD = σ·√((1 − ρ)/(2k)), n per group = units per sequence.
 * The same holds for two arms over an even number P of periods, each arm in half of them in one
 * of two mirrored orders (ABAB… / BABA…, or nights of a volunteer assigned in turn, a cross-over
 * in effect): the unit's contrast of its two arm means over P·k observations has variance
 * 4σ²(1 − ρ)/(P·k), so SD = σ·√((1 − ρ)/(P·k)) for the halved contrast — with P = 2 the formula
 * above. Compound symmetry is an approximation where neighbouring periods are more alike.
 *
 * Numbers that the design does not give are never made up: each is listed in `missing` with the
 * design step where it is entered (or none, when the design has no field for it and it is typed
 * on the Plan tab). When the effect is missing but the planned size is known, the smallest
 * detectable effect is solved for instead.
 */
import { nounFor, plural } from '@/lib/format';
import { COHEN_1988, DIGGLE_2002, DONNER_KLAR_2000, FLEISS_2003, FRISON_POCOCK_1992, HAYES_BENNETT_1999, narrative, SENN_2002, VICKERS_ALTMAN_2001, ZHU_LAKKIS_2014 } from '@/lib/citations';
import type { Assumptions, Design, Level, Source } from '@/lib/design/schema';
import { DESIGN_STEPS } from '@/lib/design/schema';
import { analysedPerParent, clusterRandomised as wholeClustersRandomised, designFacts, iccOf, measurementsPerUnit, sizeCv, smallestArm, type DesignFacts, type LevelInfo, type OutcomeFacts } from '@/lib/design/facts';
import { cap, dec, noun, num } from '@/lib/rules/text';
import { outcomeName } from '@/lib/rules/phrases';
import type { Recommendation } from '@/lib/rules/types';
import { calculationSchema, type CalculationKind, type CalculationRequest } from '@/lib/stats/calculations/request';

export type DesignStepSlug = (typeof DESIGN_STEPS)[number]['slug'];

/** Where a number came from: the design's own source kinds, or how the Plan tab obtained it. */
export type AssumptionOrigin = Source['kind'] | 'design' | 'derived';

export interface PlanAssumption {
  /** Plain name, e.g. 'ICC of classroom'. */
  name: string;
  /** The calculation input it fills, when it fills one directly. */
  input?: string;
  value: number | string;
  source: {
    kind: AssumptionOrigin;
    citation?: string;
    certainty?: Source['certainty'];
    /** For 'design' and 'derived': the step it was read from or how it was computed. */
    detail?: string;
  };
}

export interface MissingItem {
  /** The calculation input that cannot be filled. */
  input: string;
  /** What to fill in, in plain words. */
  text: string;
  /** The Design step where it is entered; absent when the design has no field for it (type it on the Plan tab). */
  step?: DesignStepSlug;
}

export interface PlanDraft {
  /** The calculation that fits, or null when none does yet (see `missing` and `rationale`). */
  kind: CalculationKind | null;
  /** The quantity solved for: the size by default, the effect when no effect is given. */
  solveFor: string | null;
  /** Every input that could be filled, by the API's names (without `kind`); the solved one is left out. */
  inputs: Record<string, number | string | boolean | number[]>;
  /** The complete, validated request, or null while something is missing. */
  request: CalculationRequest | null;
  /** The size the design plans, for comparison with the one solved for (e.g. 10 classrooms per arm). */
  planned?: { input: string; value: number };
  /** Names of the units counted by the size input: e.g. { size: 'classrooms per arm', member: 'pupils per classroom' }. */
  labels: Record<string, string>;
  /** Why this calculation, in plain sentences. */
  rationale: string[];
  /** Cautions and approximations: what the calculation does not take credit for. */
  notes: string[];
  assumptions: PlanAssumption[];
  missing: MissingItem[];
}

type Inputs = PlanDraft['inputs'];

const fromSource = (s: Source): PlanAssumption['source'] => ({ kind: s.kind, ...(s.citation ? { citation: s.citation } : {}), certainty: s.certainty });
const design = (detail: string): PlanAssumption['source'] => ({ kind: 'design', detail });
const derived = (detail: string): PlanAssumption['source'] => ({ kind: 'derived', detail });

/** Rounds a derived input to 10 significant digits so the inputs read cleanly without changing any result. */
const tidy = (x: number) => Number(x.toPrecision(10));

class Builder {
  readonly inputs: Inputs = {};
  readonly assumptions: PlanAssumption[] = [];
  readonly missing: MissingItem[] = [];
  readonly rationale: string[] = [];
  readonly notes: string[] = [];
  readonly labels: Record<string, string> = {};
  planned?: { input: string; value: number };

  set(input: string, value: number | string | boolean | number[], name?: string, source?: PlanAssumption['source']) {
    this.inputs[input] = value;
    if (name && source) this.assumptions.push({ name, input, value: Array.isArray(value) ? value.join(', ') : typeof value === 'boolean' ? String(value) : value, source });
  }

  note(name: string, value: number | string, source: PlanAssumption['source']) {
    this.assumptions.push({ name, value, source });
  }

  need(input: string, text: string, step?: DesignStepSlug) {
    if (!this.missing.some((m) => m.input === input)) this.missing.push({ input, text, ...(step ? { step } : {}) });
  }
}

/**
 * The scale of the analysis. When the recommended (or planned) analysis works on the log of a
 * continuous outcome, the Plan still plans on the raw scale, with the SD and the difference in
 * the outcome's own units as the design gives them, and says so. Converting them would need the
 * outcome's mean and a distribution (a lognormal: SD of the log = √log(1 + CV²), the difference
 * as the ratio 1 + δ/μ), and the design gives no mean: an invented one would be a number nobody
 * chose. To first order (the delta method) the two scales give the same standardised effect,
 * δ/σ ≈ log(1 + δ/μ)/√log(1 + σ²/μ²) when σ/μ and δ/μ are small, so the raw-scale size holds
 * for moderate skew; the note says when it stops holding.
 */
function scaleOfAnalysis(b: Builder, f: DesignFacts, rec: Recommendation | undefined) {
  if (f.outcome.family !== 'continuous') return;
  const logScale = rec ? rec.analysisPatch.transformation === 'log' : f.analysedOnLogScale;
  if (!logScale) return;
  const name = outcomeName(f.design);
  const unit = f.design.outcome.unit ? ` (${f.design.outcome.unit})` : '';
  b.notes.push(
    `The recommended analysis works on log(${name}); this calculation plans on the raw scale${unit}, with the SD and the difference as given. ` +
      `On the log scale the difference becomes a ratio (about 1 + difference / mean) and the SD about SD / mean, so the standardised effect, and with it the size, ` +
      `is nearly the same while the SD is small beside the mean. When the SD is more than about half the mean (common practice, not a sourced threshold), ` +
      `plan instead from the SD of log(${name}) in a pilot and the effect as a ratio.`,
  );
}

/** Significance level, power, attrition and multiplicity: shared by every kind. */
function common(b: Builder, d: Design, f: DesignFacts, rec: Recommendation | undefined) {
  scaleOfAnalysis(b, f, rec);
  b.set('alpha', d.assumptions.alpha, 'Significance level (alpha)', design('Assumptions step'));
  b.set('power', d.assumptions.power, 'Target power', design('Assumptions step'));
  const last = f.occasions.at(-1);
  const dropout = f.maxAttrition;
  if (dropout > 0) {
    if (dropout > 0.9) {
      b.need('dropout', `The attrition of ${dec(dropout * 100, 0)}% is above the 90% the calculation accepts: check the occasions.`, 'occasions');
    } else {
      b.set('dropout', tidy(dropout), 'Attrition by the last occasion', design(`Occasions step${last ? `, largest cumulative attrition (${last.label})` : ''}`));
    }
  }
  const K = d.outcome.primaryOutcomes;
  if (K >= 2) {
    b.set('outcomes', K, 'Primary outcomes', design('Outcome step'));
    const planned = d.analysis.multiplicity;
    const recommended = rec?.analysisPatch.multiplicity;
    let method: 'none' | 'bonferroni' | 'holm' = 'none';
    if (planned === 'bonferroni' || planned === 'holm') {
      method = planned;
      b.rationale.push(`The alpha is adjusted for ${K} primary outcomes by the ${cap(planned)} method the analysis plan names.`);
    } else if (planned === 'hierarchical') {
      b.notes.push(`The plan tests the ${K} primary outcomes in a fixed hierarchy, which keeps the full alpha for the first; the calculation is for that first outcome.`);
    } else if (recommended === 'holm' || recommended === 'bonferroni') {
      method = recommended;
      b.rationale.push(`The analysis plan names no adjustment for the ${K} primary outcomes; the calculation uses the ${cap(recommended)} method the Checks recommend.`);
    } else {
      b.notes.push(`Each of the ${K} primary outcomes is tested at the full alpha: the chance of at least one false positive is higher than alpha.`);
    }
    b.set('multiplicity', method, 'Adjustment for several outcomes', design(method === planned ? 'Analysis plan step' : 'Recommended analysis (Checks)'));
  }
}

function effect(b: Builder, f: DesignFacts, input: string, name: string): boolean {
  const e = f.outcome.effect;
  if (e) {
    b.set(input, e.value, name, fromSource(e.source));
    return true;
  }
  return false;
}

function sd(b: Builder, f: DesignFacts): number | undefined {
  const s = f.outcome.sd;
  if (!s) {
    b.need('sd', `The standard deviation of ${outcomeName(f.design)} (Assumptions step).`, 'assumptions');
    return undefined;
  }
  return s.value;
}

/** Solve for the size, or for the effect when no effect is given but the planned size is; else record what is missing. */
function chooseUnknown(b: Builder, hasEffect: boolean, sizeInput: string, effectInput: string, plannedSize: number | undefined, minSize: number): string | null {
  if (plannedSize !== undefined && plannedSize >= minSize) b.planned = { input: sizeInput, value: plannedSize };
  if (hasEffect) return sizeInput;
  if (b.planned) {
    b.set(sizeInput, b.planned.value, `Planned ${b.labels.size ?? 'size'}`, design('Structure and Assignment steps'));
    b.rationale.push('No smallest effect worth detecting is given, so the calculation finds the smallest effect the planned size can detect.');
    return effectInput;
  }
  b.need(effectInput, 'The smallest difference worth detecting (Assumptions step), or the planned numbers (Structure step).', 'assumptions');
  return sizeInput;
}

const STEP_WORD: Record<DesignStepSlug, string> = Object.fromEntries(DESIGN_STEPS.map((s) => [s.slug, s.label])) as Record<DesignStepSlug, string>;

function iccNeeded(b: Builder, L: Level, input: string, what: string) {
  b.need(input, `The ICC of ${noun(L)} — ${what} (${STEP_WORD.assumptions} step).`, 'assumptions');
}

function armsNotes(b: Builder, f: DesignFacts, kindCanTakeRatio: boolean) {
  const shares = f.armShares;
  if (shares.length > 2) b.notes.push(`The design has ${shares.length} arms; the calculation compares two of them (each pairwise comparison needs this size per arm).`);
  if (!kindCanTakeRatio && shares.length >= 2 && Math.max(...shares) - Math.min(...shares) > 1e-9) {
    b.notes.push('The arms are not equal in size; the calculation assumes equal arms, with the planned number taken from the smallest arm.');
  }
}

// ---------------------------------------------------------------- kinds

function clustered(b: Builder, d: Design, f: DesignFacts, E: LevelInfo, binary: boolean, rec: Recommendation | undefined) {
  const member = f.levels[E.index + 1]!;
  const bottom = f.bottom!;
  const m = member.perParent;
  b.labels.size = `${noun(E.level, true)} per arm`;
  b.labels.member = `${noun(member.level, true)} per ${noun(E.level)}`;
  b.rationale.push(
    `${cap(noun(E.level, true))} are assigned to the arms and ${noun(member.level, true)} within a ${noun(E.level)} share it, so the ${noun(E.level)} is the experimental unit and the size to plan is the number of ${noun(E.level, true)} per arm, with ${num(m)} ${noun(member.level, true)} in each.`,
  );

  // ICC shares: the cluster's own, plus levels above it unless blocked on in the analysis.
  const own = iccOf(f, E.level.id);
  if (!own) iccNeeded(b, E.level, 'icc', `the share of the variance of ${outcomeName(d)} between ${noun(E.level, true)}`);
  let clusterShare = own?.value ?? 0;
  // The blocks are in the analysis when the Assignment step says so, or the planned or the
  // recommended model carries a term for them (as for the baseline: the plan or the recommendation).
  const blocking = d.assignment.blocking;
  const blocked = blocking.kind !== 'none' && (blocking.inAnalysis || d.analysis.blockEffect !== undefined || rec?.analysisPatch.blockEffect !== undefined);
  // Shares removed with the blocks: they leave the comparison and the variance within clusters alike.
  let removed = 0;
  for (const up of f.levels.slice(0, E.index)) {
    const c = iccOf(f, up.level.id);
    if (!c || c.value === 0) continue;
    if (blocked) {
      removed += c.value;
      b.note(`ICC of ${noun(up.level)}`, c.value, fromSource(c.source));
      b.notes.push(`The variance between ${noun(up.level, true)} (ICC ${dec(c.value, 3)}) is left out: the randomisation is ${blocking.kind} and the analysis includes the blocks, so it drops out of the comparison; the SD and ICC are those within ${noun(up.level, true)}.`);
    } else {
      clusterShare += c.value;
      b.note(`ICC of ${noun(up.level)}`, c.value, fromSource(c.source));
      b.rationale.push(`The variance between ${noun(up.level, true)} (ICC ${dec(c.value, 3)}) is added to that between ${noun(E.level, true)}, since the ${noun(E.level, true)} are not compared within ${noun(up.level, true)}.`);
    }
  }

  // Shares below the member level (deeper nesting), as described in the header.
  let within: number | undefined = 1 - clusterShare - removed;
  if (member !== bottom) {
    const sharesBelow: { L: LevelInfo; rho: number }[] = [];
    let sumAbove = clusterShare + removed;
    for (const L of f.levels.slice(member.index, bottom.index)) {
      const c = iccOf(f, L.level.id);
      if (!c) {
        iccNeeded(b, L.level, `icc:${L.level.id}`, `the share of the variance between ${noun(L.level, true)} within a ${noun(f.levels[L.index - 1]!.level)}`);
        within = undefined;
        continue;
      }
      b.note(`ICC of ${noun(L.level)}`, c.value, fromSource(c.source));
      sharesBelow.push({ L, rho: c.value });
      sumAbove += c.value;
    }
    if (within !== undefined) {
      if (sumAbove > 1 + 1e-9) {
        b.need('icc', `The ICCs add up to ${dec(sumAbove, 3)}, more than 1: as shares of one variance they must add up to at most 1 (${STEP_WORD.assumptions} step).`, 'assumptions');
        within = undefined;
      } else {
        const Mc = member.obsPerUnit;
        within = sharesBelow.reduce((s, x) => s + (x.rho * x.L.obsPerUnit) / Mc, 0) + Math.max(0, 1 - sumAbove) / Mc;
        b.rationale.push(
          `The ${num(Mc)} ${noun(bottom.level, Mc !== 1)} of each ${noun(member.level)} are averaged first; the calculation works on ${noun(member.level)} means, whose SD and ICC follow from the variance shares of every level.`,
        );
      }
    }
  } else if (clusterShare > 1 + 1e-9) {
    b.need('icc', `The ICCs add up to ${dec(clusterShare, 3)}, more than 1 (${STEP_WORD.assumptions} step).`, 'assumptions');
    within = undefined;
  }

  const sigma = binary ? undefined : sd(b, f);
  if (within !== undefined && own) {
    const total = clusterShare + within;
    const icc = total > 0 ? Math.min(1, clusterShare / total) : 0;
    const deeper = member !== bottom;
    const withinBlocks = removed > 0;
    if (deeper || withinBlocks || clusterShare !== own.value) {
      b.note(`ICC of ${noun(E.level)}`, own.value, fromSource(own.source));
      b.set(
        'icc',
        tidy(icc),
        deeper ? `ICC of ${noun(E.level)}, on ${noun(member.level)} means` : withinBlocks ? `ICC of ${noun(E.level)} within blocks` : `ICC of ${noun(E.level)} with the levels above`,
        derived(deeper ? 'ρ / (ρ + v), from the ICCs of every level' : withinBlocks ? 'ρ / (1 − the shares of the blocks)' : 'sum of the ICCs of the cluster and the levels above'),
      );
    } else {
      b.set('icc', own.value, `ICC of ${noun(E.level)}`, fromSource(own.source));
    }
    if (sigma !== undefined) {
      if (deeper || withinBlocks) {
        b.note(`SD of ${outcomeName(d)}`, sigma, fromSource(f.outcome.sd!.source));
        b.set('sd', tidy(sigma * Math.sqrt(total)), deeper ? `SD of ${noun(member.level)} means` : `SD of ${outcomeName(d)} within blocks`, derived(deeper ? 'σ·√(ρ + v), from the outcome SD and the ICCs' : 'σ·√(1 − the shares of the blocks)'));
      } else {
        b.set('sd', sigma, `SD of ${outcomeName(d)}`, fromSource(f.outcome.sd!.source));
      }
    }
  } else if (sigma !== undefined && member === bottom) {
    b.set('sd', sigma, `SD of ${outcomeName(d)}`, fromSource(f.outcome.sd!.source));
  }
  // The number per cluster is fixed by the clusters (a class has its pupils): attrition shrinks
  // the number analysed, and the calculation's dropout turns that back into the number recruited.
  const dropout = typeof b.inputs.dropout === 'number' ? b.inputs.dropout : 0;
  const analysed = analysedPerParent(f, member, dropout);
  if (dropout > 0) {
    b.note(`${cap(noun(member.level, true))} per ${noun(E.level)} (planned)`, tidy(m), design('Structure step'));
    b.set('clusterSize', analysed, `${cap(noun(member.level, true))} per ${noun(E.level)} analysed`, derived(`${num(m)} × (1 − ${dec(dropout, 3)}), rounded down`));
  } else {
    b.set('clusterSize', analysed, `${cap(noun(member.level, true))} per ${noun(E.level)}`, design('Structure step'));
    if (!Number.isInteger(m)) b.notes.push(`The structure gives ${num(m)} ${noun(member.level, true)} per ${noun(E.level)} on average; the calculation uses ${analysed}.`);
  }
  // The Checks tab quotes the design effect of the analysis it warns about (every measurement
  // counted, at the planned numbers); this one is the Plan's own: say so, so the two never read as
  // one figure that disagrees with itself.
  if (member !== bottom) {
    b.notes.push(`The design effect here is that of the ${noun(member.level)} means the calculation analyses; the Checks tab quotes a larger one, for an analysis that would count every ${noun(bottom.level)} as independent.`);
  } else if (analysed !== m) {
    b.notes.push(`The design effect here is at the ${num(analysed)} ${noun(member.level, analysed !== 1)} per ${noun(E.level)} analysed; the Checks tab quotes it at the ${num(m)} planned, before attrition or rounding.`);
  }
  const cv = sizeCv(f, E.index, member.index);
  if (cv > 0) b.set('cv', tidy(Math.min(3, cv)), `CV of the number of ${noun(member.level, true)} per ${noun(E.level)}`, design('Structure step'));

  armsNotes(b, f, false);
  const planned = smallestArm(f, E);

  if (binary) return planForBinaryOutcome(b, f.outcome, { clustered: true, planned });

  const hasEffect = effect(b, f, 'delta', 'Smallest difference worth detecting');
  const solveFor = chooseUnknown(b, hasEffect, 'clustersPerArm', 'delta', planned, 2);
  if (f.baselines.length > 0 && f.occasionCorrelation) {
    const r = f.occasionCorrelation.value;
    b.notes.push(
      `The design measures a baseline (correlation ${dec(r, 2)} between occasions). Adjusting for it can shrink the variance — for individual-level data by the factor 1 − ρ² = ${dec(1 - r * r, 2)} — but in a cluster trial the gain also depends on how well cluster means track over time, which the design does not give; this calculation does not count on it.`,
    );
  }
  return { kind: 'cluster-means' as const, solveFor };
}

function crossover(b: Builder, d: Design, f: DesignFacts, E: LevelInfo, periods: number) {
  b.labels.size = `${noun(E.level, true)} per sequence`;
  b.rationale.push(
    periods === 2
      ? `Each ${noun(E.level)} receives both arms in a two-period cross-over, so ${noun(E.level, true)} are compared with themselves: the size to plan is the number of ${noun(E.level, true)} per sequence (AB or BA), and the test is the two-sample t test of the halved period differences between the sequences (${SENN_2002.short}).`
      : `Each ${noun(E.level)} receives both arms in turn over ${num(periods)} periods, half each, in one of two mirrored orders, so ${noun(E.level, true)} are compared with themselves: the size to plan is the number of ${noun(E.level, true)} per order, and the test is the two-sample t test, between the orders, of each ${noun(E.level)}'s halved contrast of its two arm means (the AB/BA analysis extended to ${num(periods)} periods; ${SENN_2002.short}).`,
  );
  const perUnit = measurementsPerUnit(f, E);
  const k = perUnit / periods;
  const rhoSource = iccOf(f, E.level.id) ?? f.occasionCorrelation;
  if (!rhoSource) b.need('rho', `The correlation between observations of one ${noun(E.level)}: the ICC of ${noun(E.level)} or the occasion correlation (Assumptions step).`, 'assumptions');
  else if (rhoSource.value < 0 || rhoSource.value >= 1) b.need('rho', `The correlation between observations of one ${noun(E.level)} must be between 0 and 1 (Assumptions step).`, 'assumptions');
  const sigma = sd(b, f);
  b.note(`${cap(noun(f.bottom!.level, true))} per ${noun(E.level)} in each period`, tidy(k), design('Structure and Assignment steps'));
  if (!Number.isInteger(k)) b.notes.push(`${num(perUnit)} observations per ${noun(E.level)} do not split evenly over ${periods} periods; the calculation uses ${dec(k, 2)} per period.`);
  if (rhoSource && rhoSource.value >= 0 && rhoSource.value < 1 && sigma !== undefined) {
    b.note(`SD of ${outcomeName(d)}`, sigma, fromSource(f.outcome.sd!.source));
    b.note(`Correlation between observations of one ${noun(E.level)}`, rhoSource.value, fromSource(rhoSource.source));
    b.set(
      'sd',
      tidy(sigma * Math.sqrt((1 - rhoSource.value) / (periods * k))),
      periods === 2 ? 'SD of the halved period difference' : `SD of the halved contrast of the arm means of one ${noun(E.level)}`,
      derived(periods === 2 ? 'σ·√((1 − ρ)/(2k)), k observations per period' : `σ·√((1 − ρ)/(P·k)), P = ${periods} periods of k observations`),
    );
  }
  if (d.occasions.correlationStructure === 'ar1') {
    b.notes.push('The occasions are described as AR(1) (neighbouring observations more alike); the calculation assumes equal correlation between all observations of a unit, which is only an approximation then.');
  }
  if (f.crossover?.carryoverPossible) b.notes.push(`Carry-over is possible: the calculation assumes none; plan a washout (${SENN_2002.short}).`);
  const hasEffect = effect(b, f, 'delta', 'Smallest difference worth detecting');
  const units = E.total;
  const solveFor = chooseUnknown(b, hasEffect, 'nPerGroup', 'delta', Math.floor(units / 2), 2);
  return { kind: 'two-group-means' as const, solveFor };
}

function repeated(b: Builder, d: Design, f: DesignFacts, E: LevelInfo, rec: Recommendation | undefined) {
  const { baselines, followUps } = f;
  const times = f.occasions.map((o) => o.time);
  const trajectory = d.occasions.trajectoryOfInterest || d.analysis.randomSlopeForTime;
  b.labels.size = `${noun(E.level, true)} per arm`;
  const planned = smallestArm(f, E);
  armsNotes(b, f, false);
  const rho = f.occasionCorrelation ?? iccOf(f, E.level.id);
  const setRho = () => {
    if (!rho) b.need('rho', `The correlation between occasions of one ${noun(E.level)} (Assumptions step).`, 'assumptions');
    else if (rho.value < 0) b.need('rho', `The occasion correlation is negative (${dec(rho.value, 2)}); the calculation needs a correlation between 0 and 1 (Assumptions step).`, 'assumptions');
    else if (rho.value >= 1) b.need('rho', 'The occasion correlation must be below 1 (Assumptions step).', 'assumptions');
    else b.set('rho', rho.value, 'Correlation between occasions', fromSource(rho.source));
  };

  if (trajectory && times.length >= 2) {
    b.rationale.push(
      `The trajectory is of interest: the calculation compares the rates of change of ${outcomeName(d)} between the arms over the ${times.length} occasions (${DIGGLE_2002.short}, compound symmetry).`,
    );
    const sigma = sd(b, f);
    if (sigma !== undefined) b.set('sd', sigma, `SD of ${outcomeName(d)}`, fromSource(f.outcome.sd!.source));
    setRho();
    b.set('times', times, `Times of the occasions (${d.occasions.timeUnit})`, design('Occasions step'));
    const span = times[times.length - 1]! - times[0]!;
    let hasEffect = false;
    const delta = f.outcome.effect;
    if (delta && span > 0) {
      b.note('Smallest difference worth detecting', delta.value, fromSource(delta.source));
      b.set('slopeDifference', tidy(delta.value / span), `Difference in slopes (per ${d.occasions.timeUnit.replace(/s$/, '')})`, derived(`the effect reached by the last occasion: δ / ${dec(span, 3)}`));
      b.rationale.push(`The effect is read as the difference reached by the last occasion, so the difference in slopes is ${dec(delta.value, 3)} / ${dec(span, 3)} per ${d.occasions.timeUnit.replace(/s$/, '')}.`);
      hasEffect = true;
    }
    const solveFor = chooseUnknown(b, hasEffect, 'nPerGroup', 'slopeDifference', planned, 2);
    return { kind: 'longitudinal-slopes' as const, solveFor };
  }
  if (trajectory) b.need('times', 'At least two occasions with their times, for a trajectory (Occasions step).', 'occasions');

  const nBase = baselines.length;
  const nFollow = followUps.length > 0 ? followUps.length : Math.max(1, Math.round(E.obsPerUnit) - nBase);
  if (followUps.length === 0) b.notes.push(`No follow-up occasions are listed; the calculation takes ${nFollow} from the structure (${num(E.obsPerUnit)} observations per ${noun(E.level)}).`);
  const planAdjusts = d.analysis.adjustsForBaseline || d.analysis.method === 'ancova';
  const recAdjusts = rec?.analysisPatch.adjustsForBaseline === true;
  const analysis = nBase > 0 && (planAdjusts || recAdjusts) ? 'ancova' : nBase > 0 ? 'change' : 'post';
  const analysisWords = { ancova: 'ANCOVA (follow-up mean adjusted for the baseline mean)', change: 'the change from baseline', post: 'the mean of the follow-ups' }[analysis];
  // The answer is for ANCOVA where there is a baseline (never less efficient); the Plan shows the
  // three analyses side by side, the plan's own marked (components/calculations/baseline-comparison.tsx).
  b.rationale.push(
    `${cap(noun(E.level, true))} are assigned to the arms and measured ${nBase > 0 ? `at ${nBase} baseline and ${nFollow} ${nounFor(nFollow, 'follow-up occasion')}` : `on ${nFollow} occasions`}; the calculation compares ${nBase > 0 ? `ANCOVA (follow-up mean adjusted for the baseline mean), beside the follow-up only and the change from baseline; the analysis plan uses ${analysisWords}` : analysisWords} between the arms (${FRISON_POCOCK_1992.short}).` +
      (analysis === 'ancova' ? (planAdjusts ? ' The analysis plan adjusts for the baseline.' : ' The Checks recommend adjusting for the baseline.') : ''),
  );
  if (analysis === 'change') b.notes.push(`The plan compares changes from baseline; ANCOVA on the baseline is never less efficient (${FRISON_POCOCK_1992.short}; ${VICKERS_ALTMAN_2001.short}).`);
  const sigma = sd(b, f);
  if (sigma !== undefined) b.set('sd', sigma, `SD of ${outcomeName(d)}`, fromSource(f.outcome.sd!.source));
  setRho();
  b.set('baselines', nBase, 'Baseline occasions', design('Occasions step'));
  b.set('followUps', nFollow, 'Follow-up occasions', design(followUps.length > 0 ? 'Occasions step' : 'Structure step'));
  b.set('analysis', analysis, 'Analysis', design(planAdjusts ? 'Analysis plan step' : recAdjusts ? 'Recommended analysis (Checks)' : 'Analysis plan step'));
  const hasEffect = effect(b, f, 'delta', 'Smallest difference worth detecting');
  const solveFor = chooseUnknown(b, hasEffect, 'nPerGroup', 'delta', planned, 2);
  return { kind: 'repeated-measures' as const, solveFor };
}

/**
 * Does the planned or the recommended model carry a term for level L (a random intercept or a
 * fixed effect)? Like the baseline adjustment, the Plan sizes for an analysis that includes what
 * either of them includes; the Checks flag a planned analysis that leaves it out.
 */
function carriedByModel(d: Design, L: LevelInfo, rec: Recommendation | undefined): boolean {
  const id = L.level.id;
  const a = d.analysis;
  const planned = ((a.method === 'mixed-model' || a.method === 'glmm') && a.randomIntercepts.includes(id)) || (a.fixedEffectLevels ?? []).includes(id);
  const recommended = rec !== undefined && (rec.randomIntercepts.includes(id) || (rec.analysisPatch.fixedEffectLevels ?? []).includes(id));
  return planned || recommended;
}

function independent(b: Builder, d: Design, f: DesignFacts, E: LevelInfo, binary: boolean, rec: Recommendation | undefined) {
  b.labels.size = `${noun(E.level, true)} per arm`;
  const shares = f.armShares;
  const planned = smallestArm(f, E);
  armsNotes(b, f, true);
  if (shares.length >= 2 && Math.abs(shares[1]! / shares[0]! - 1) > 1e-9) {
    b.set('ratio', tidy(shares[1]! / shares[0]!), `${cap(noun(E.level, true))} in ${d.assignment.arms[1]!.name} for each one in ${d.assignment.arms[0]!.name}`, design('Assignment step'));
    b.labels.ratio = `${cap(noun(E.level, true))} in ${d.assignment.arms[1]!.name} for each one in ${d.assignment.arms[0]!.name}`;
    b.labels.size = `${noun(E.level, true)} in ${d.assignment.arms[0]!.name}`;
  }
  if (binary) return planForBinaryOutcome(b, f.outcome, { clustered: false, planned });
  b.rationale.push(`${cap(noun(E.level, true))} are assigned to the arms and measured once each, independently: the calculation is the two-sample t test (${COHEN_1988.short}).`);
  const above = f.levels.slice(0, E.index).filter((l) => l.groupsObservations);
  // Levels above the units that the planned or recommended model carries, with an ICC: the arms
  // are compared within them, so their share of the variance leaves the comparison.
  const removed = above.filter((l) => l.icc && carriedByModel(d, l, rec));
  const removedShare = removed.reduce((s, l) => s + l.icc!.value, 0);
  const rest = above.filter((l) => !removed.includes(l));
  if (rest.length > 0) {
    const names = rest.map((l) => noun(l.level, true)).join(' and ');
    b.notes.push(`The ${noun(E.level, true)} share ${names}; if both arms are found within each, an analysis that accounts for the ${names} (see Checks) compares the arms within them and is at least as precise as this t test assumes.`);
  }
  const sigma = sd(b, f);
  if (sigma !== undefined && removed.length > 0 && removedShare < 1) {
    const names = removed.map((l) => noun(l.level, true)).join(' and ');
    b.note(`SD of ${outcomeName(d)}`, sigma, fromSource(f.outcome.sd!.source));
    for (const l of removed) b.note(`ICC of ${noun(l.level)}`, l.icc!.value, fromSource(l.icc!.source));
    b.set('sd', tidy(sigma * Math.sqrt(1 - removedShare)), `SD of ${outcomeName(d)} within ${names}`, derived('σ·√(1 − the ICCs of the levels the model carries)'));
    b.rationale.push(
      `The ${noun(E.level, true)} are compared within ${names}, and the analysis has a term for ${removed.length > 1 ? 'them' : 'it'}: the variance between ${names} (ICC ${removed.map((l) => dec(l.icc!.value, 3)).join(' and ')}) drops out of the comparison, so the calculation uses the SD within ${names}. This holds when both arms are found within each of the ${names}, as randomisation within them ensures.`,
    );
  } else if (sigma !== undefined) b.set('sd', sigma, `SD of ${outcomeName(d)}`, fromSource(f.outcome.sd!.source));
  const hasEffect = effect(b, f, 'delta', 'Smallest difference worth detecting');
  const solveFor = chooseUnknown(b, hasEffect, 'nPerGroup', 'delta', planned, 2);
  return { kind: 'two-group-means' as const, solveFor };
}

function exposure(b: Builder, d: Design, f: DesignFacts, E: LevelInfo | undefined) {
  const v = d.outcome.explanatoryVariables.find((x) => x.role === 'exposure' && x.kind === 'continuous') ?? d.outcome.explanatoryVariables.find((x) => x.kind === 'continuous' && x.role !== 'covariate');
  const name = v?.name ?? d.assignment.variableName ?? 'the exposure';
  b.labels.size = E ? `${noun(E.level, true)} in total` : 'units in total';
  b.rationale.push(`The exposure (${name}) is continuous: the calculation is the F test of its slope in a linear regression (${COHEN_1988.short}).`);
  const covariates = d.outcome.explanatoryVariables.filter((x) => x.role === 'covariate').length;
  b.set('testedPredictors', 1, 'Predictors tested', design('Outcome step'));
  b.set('predictors', 1 + covariates, 'Predictors in the model', design(`Outcome step: the exposure${covariates ? ` and ${plural(covariates, 'covariate')}` : ''}`));
  const sigma = sd(b, f);
  if (sigma !== undefined) {
    b.set('residualSd', sigma, `Residual SD (taken as the SD of ${outcomeName(d)})`, fromSource(f.outcome.sd!.source));
    b.notes.push('The residual SD is taken as the SD of the outcome, which is conservative: the covariates and the exposure explain some of it.');
  }
  b.need('sdX', `The SD of ${name} in the study: the design gives a range, not an SD; type it below.`);
  const hasEffect = effect(b, f, 'slope', `Slope: change in ${outcomeName(d)} per unit of ${name}`);
  if (E && E.groupsObservations) b.notes.push(`${cap(noun(E.level, true))} hold several observations each; this regression treats observations as independent, so its size is for ${noun(E.level)}-level data (one value per ${noun(E.level)}).`);
  const planned = E ? E.total : undefined;
  const solveFor = chooseUnknown(b, hasEffect, 'n', 'f2', planned, 3);
  return { kind: 'regression' as const, solveFor };
}

// ---------------------------------------------------------------- count and binary outcomes

/** What the count and binary plans need from the design, read by the caller. */
export interface OutcomeSizing {
  /** Whole clusters are randomised (the size is clusters per arm); the members per cluster are set by the caller or given here. */
  clustered: boolean;
  /** Members analysed per cluster, for counts (the binary plan takes it from the cluster inputs already set). */
  clusterSize?: { value: number; name: string; source: PlanAssumption['source'] };
  /** The size the design plans: units per arm, or clusters per arm. */
  planned?: number;
  /** Units in the second arm for each one in the first, when the arms are unequal (units randomised one by one). */
  ratio?: number;
}

const EFFECT_NAMES: Record<NonNullable<Assumptions['proportionEffect']>['measure'], string> = {
  p2: 'Proportion expected with the intervention',
  difference: 'Difference in proportions worth detecting',
  riskRatio: 'Risk ratio worth detecting',
  oddsRatio: 'Odds ratio worth detecting',
};

/**
 * A yes-or-no outcome: two proportions (units randomised one by one) or cluster-randomised
 * proportions (the ICC, cluster size and its CV already set by the caller), with the control
 * proportion and the effect in the form the Assumptions step gives it.
 */
function planForBinaryOutcome(b: Builder, a: OutcomeFacts, read: OutcomeSizing) {
  const kind = read.clustered ? ('cluster-proportions' as const) : ('two-proportions' as const);
  const sizeInput = read.clustered ? 'clustersPerArm' : 'nPerGroup';
  b.rationale.push(
    read.clustered
      ? `The outcome is yes or no and whole clusters are randomised: two proportions at the effective number per arm, clusters × members / design effect, with the ICC on the proportion scale (${DONNER_KLAR_2000.short}); the power of a t test on cluster proportions is shown beside it.`
      : `Units are randomised one by one and the outcome is yes or no: two proportions by the normal approximation (${FLEISS_2003.short}).`,
  );
  if ('ratio' in b.inputs) {
    delete b.inputs.ratio;
    b.notes.push('The arms are not equal in size; the calculation for two proportions assumes equal arms, with the planned number taken from the smallest arm.');
  }
  if (a.controlProportion) b.set('p1', a.controlProportion.value, 'Proportion expected without the intervention', fromSource(a.controlProportion.source));
  else b.need('p1', 'The proportion expected without the intervention (Assumptions step).', 'assumptions');
  const e = a.proportionEffect;
  if (e) b.set(e.measure, e.value, EFFECT_NAMES[e.measure], fromSource(e.source));
  const solveFor = chooseUnknown(b, e !== undefined, sizeInput, 'p2', read.planned, 2);
  return { kind, solveFor };
}

/**
 * Counts of events: two event rates (units randomised one by one; Wald test on the log rate
 * ratio, Poisson or negative binomial) or cluster-randomised rates (Hayes & Bennett 1999), from
 * the baseline rate, rate ratio, follow-up time, overdispersion and — for clusters — the
 * variation of rates between clusters that the Assumptions step gives.
 */
function planForCountOutcome(b: Builder, a: OutcomeFacts, read: OutcomeSizing) {
  const kind = read.clustered ? ('cluster-rates' as const) : ('two-rates' as const);
  const sizeInput = read.clustered ? 'clustersPerArm' : 'nPerGroup';
  b.rationale.push(
    read.clustered
      ? `The outcome is a count of events and whole clusters are randomised: clusters per arm by ${narrative(HAYES_BENNETT_1999)}, from the variation of the rates between clusters and the person-time followed in each.`
      : `The outcome is a count of events over each unit’s follow-up: the Wald test on the log rate ratio, for Poisson or negative binomial counts (${ZHU_LAKKIS_2014.short}).`,
  );
  const sourced = (input: string, value: OutcomeFacts['baselineRate'], name: string, missing: string) => {
    if (value) b.set(input, value.value, name, fromSource(value.source));
    else b.need(input, `${missing} (Assumptions step).`, 'assumptions');
  };
  sourced('baselineRate', a.baselineRate, 'Baseline rate (events per unit of follow-up time)', 'The rate of events expected without the intervention');
  sourced('exposure', a.followUpTime, 'Follow-up time per unit', 'The follow-up time of each unit, in the time unit of the rate');
  sourced('dispersion', a.dispersion, 'Overdispersion between units', 'The overdispersion of the counts between units (0 for plain Poisson counts)');
  if (read.clustered) {
    sourced('betweenClusterCv', a.betweenClusterCv, 'Between-cluster coefficient of variation of the rate', 'The coefficient of variation of the rates between clusters');
    if (read.clusterSize) b.set('clusterSize', read.clusterSize.value, read.clusterSize.name, read.clusterSize.source);
  } else if (read.ratio !== undefined && Math.abs(read.ratio - 1) > 1e-9) {
    b.set('ratio', tidy(read.ratio), 'Units in the second arm for each one in the first', design('Assignment step'));
  }
  if (a.rateRatio) b.set('rateRatio', a.rateRatio.value, 'Rate ratio worth detecting', fromSource(a.rateRatio.source));
  const solveFor = chooseUnknown(b, a.rateRatio !== undefined, sizeInput, 'rateRatio', read.planned, 2);
  return { kind, solveFor };
}

/**
 * The numbers a count plan reads from the design's facts: cluster-randomised with the members
 * per cluster analysed (after attrition, as for cluster means), or units randomised one by one
 * with their allocation ratio; and the planned size.
 */
function countSizing(b: Builder, d: Design, f: DesignFacts, E: LevelInfo, clustered: boolean): OutcomeSizing {
  const planned = smallestArm(f, E);
  if (!clustered) {
    b.labels.size = `${noun(E.level, true)} per arm`;
    armsNotes(b, f, true);
    const shares = f.armShares;
    return { clustered, planned, ...(shares.length >= 2 ? { ratio: shares[1]! / shares[0]! } : {}) };
  }
  const member = f.levels[E.index + 1]!;
  b.labels.size = `${noun(E.level, true)} per arm`;
  b.labels.member = `${noun(member.level, true)} per ${noun(E.level)}`;
  armsNotes(b, f, false);
  const dropout = typeof b.inputs.dropout === 'number' ? b.inputs.dropout : 0;
  const analysed = analysedPerParent(f, member, dropout);
  const name = `${cap(noun(member.level, true))} per ${noun(E.level)}${dropout > 0 ? ' analysed' : ''}`;
  const source = dropout > 0 ? derived(`${num(member.perParent)} × (1 − ${dec(dropout, 3)}), rounded down`) : design('Structure step');
  return { clustered, planned, clusterSize: { value: analysed, name, source } };
}

// ---------------------------------------------------------------- entry point

/**
 * The calculation that fits `design`, with its inputs, why, where each number came from and what
 * is missing. `recommendation` is `runChecks(design).recommendation`: its baseline adjustment and
 * multiplicity method are used when the analysis plan does not name them.
 */
export function planFromDesign(input: Design, recommendation?: Recommendation): PlanDraft {
  const d = input;
  const f = designFacts(d);
  const b = new Builder();
  const done = (kind: CalculationKind | null, solveFor: string | null): PlanDraft => {
    const inputs = { ...b.inputs };
    if (solveFor) delete inputs[solveFor];
    let request: CalculationRequest | null = null;
    if (kind && b.missing.length === 0) {
      const parsed = calculationSchema.safeParse({ kind, ...inputs, ...(solveFor ? { solveFor } : {}) });
      if (parsed.success) request = parsed.data;
      else for (const issue of parsed.error.issues) b.need(String(issue.path[0] ?? 'input'), issue.message);
    }
    return {
      kind,
      solveFor: kind ? solveFor : null,
      inputs,
      request,
      ...(b.planned ? { planned: b.planned } : {}),
      labels: b.labels,
      rationale: b.rationale,
      notes: b.notes,
      assumptions: b.assumptions,
      missing: b.missing,
    };
  };

  if (f.levels.length === 0) {
    b.need('structure', 'The levels of the design, from top to bottom (Structure step).', 'structure');
    b.rationale.push('The structure is not described yet, so no calculation can be chosen.');
    return done(null, null);
  }
  if (f.outcome.family === 'time-to-event') {
    b.rationale.push('The outcome is a time to an event; Unitwise has no calculation for survival outcomes yet. Ask a statistician for an events-based calculation.');
    return done(null, null);
  }
  const E = f.eu;
  if (d.assignment.kind === 'continuous') {
    common(b, d, f, recommendation);
    const r = exposure(b, d, f, E);
    return done(r.kind, r.solveFor);
  }
  if (!E) {
    b.need('assignment', 'The level at which the treatment is assigned (Assignment step).', 'assignment');
    b.rationale.push('The level of assignment is not given yet, so the experimental unit — and with it the calculation — cannot be chosen.');
    return done(null, null);
  }
  if (f.armShares.length < 2 && !f.withinUnit) {
    b.need('arms', 'The arms being compared (Assignment step).', 'assignment');
  }
  const family = f.outcome.family;
  const binary = family === 'binary';
  const count = family === 'count';
  if (!f.outcome.type) b.notes.push('The outcome type is not given; the calculation treats the outcome as continuous (Outcome step).');
  else if (family !== 'continuous' && !binary && !count) {
    b.notes.push(`The outcome is a ${family.replace(/-/g, ' ')}; the calculation uses its mean and SD (a normal approximation), which is rough when values pile up at a bound or are small counts.`);
  }
  common(b, d, f, recommendation);

  if (f.withinUnit) {
    // Periods: as the Assignment step gives them, or the assigned occasions of a cross-over in effect.
    const periods = f.crossover?.periods ?? (f.changesOverTime && f.assignment ? Math.round(f.assignment.perParent) : undefined);
    // Beyond two periods, only one observation per period: with several (patients of a ward in
    // each period, a stepped or cluster cross-over) the period-within-unit variance is not modelled.
    const onePerPeriod = periods !== undefined && Math.abs(measurementsPerUnit(f, E) - periods) < 1e-9;
    if (periods === undefined || periods % 2 !== 0 || (periods > 2 && !onePerPeriod) || f.armShares.length !== 2 || binary || count) {
      b.rationale.push(
        `The treatment varies within each ${noun(E.level)}${periods !== undefined ? ` over ${periods} periods` : ''}; Unitwise calculates within-unit comparisons only for two arms over an even number of periods (a two-period cross-over, or arms in turn) with a continuous outcome.`,
      );
      b.need('crossover', 'A two-period cross-over (Assignment step), or ask a statistician for this design.', 'assignment');
      return done(null, null);
    }
    const r = crossover(b, d, f, E, periods);
    return done(r.kind, r.solveFor);
  }

  const below = f.levels[E.index + 1];
  const measuredOverTime = below?.level.kind === 'repeated' || (!below && f.followUps.length + f.baselines.length >= 2);
  const clusterRandomised = wholeClustersRandomised(f);
  if (count) {
    if (measuredOverTime) b.notes.push('The counts of all occasions are taken together: one rate per unit over its whole follow-up time.');
    const r = planForCountOutcome(b, f.outcome, countSizing(b, d, f, E, clusterRandomised));
    return done(r.kind, r.solveFor);
  }
  if (clusterRandomised) {
    const r = clustered(b, d, f, E, binary, recommendation);
    return done(r.kind, r.solveFor);
  }
  if (measuredOverTime && !binary) {
    const r = repeated(b, d, f, E, recommendation);
    return done(r.kind, r.solveFor);
  }
  if (measuredOverTime && binary) b.notes.push('The outcome is binary and measured on several occasions; the calculation uses one occasion (the primary one).');
  const r = independent(b, d, f, E, binary, recommendation);
  return done(r.kind, r.solveFor);
}

/** The Design step's address for a missing item. */
export function designStepHref(studyId: string, step: DesignStepSlug): string {
  return `/studies/${studyId}/design/${step}`;
}
