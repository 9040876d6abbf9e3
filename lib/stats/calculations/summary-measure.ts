/**
 * Two groups of n subjects compared on one summary per subject (a mean of follow-ups, a change,
 * an ANCOVA-adjusted mean, an OLS slope) whose variance is σ²·f, f a variance factor that the
 * kind derives from its design. The difference of the group means has standard error
 * SE = √(2σ²·f/n).
 *
 * The answer is exact: power is that of the t test on the summaries (noncentral t, both tails
 * when two-sided) with the kind's degrees of freedom, the size is the smallest whole n that
 * reaches the target by it, and the effect the one that gives the target by it. The published
 * formulas use the normal approximation n = (z₁₋α/sides + z₁₋β)²·2σ²·f/δ², i.e. power
 * Φ(δ/SE − z₁₋α/sides) (one rejection tail), which ignores that σ is estimated and so asks for
 * one or two subjects fewer at small n; it is given beside the answer (`powerNormal`,
 * `nPerGroupNormal`, the effect's `…Normal`), never as the answer. With one follow-up and no
 * baseline the summary is the outcome itself and the answer is the two-sample t test's.
 *
 * Shared by repeated-measures.ts (Frison & Pocock 1992) and longitudinal-slopes.ts
 * (Diggle et al. 2002).
 */
import { adjustAlpha, toRecruit } from './adjust';
import { inputError } from './errors';
import { effectFeasibilityWarning, sizeFeasibilityWarning, testSettings } from './output';
import { tTestPower, zSum, zTestPower, type Sides } from './power';
import { findUnknown, presence, requireTargetPower, solveEffect, solveSize } from './solve';
import type { Feasibility, ResultValue } from './types';
import type { Multiplicity } from './adjust';
import type { Citation } from '@/lib/citations';

export const MAX_N_PER_GROUP = 10_000_000;

export interface SummaryDesign {
  /** Variance of one subject's summary in units of σ². */
  factor: number;
  /** Degrees of freedom of the t test on the summaries with n per group. */
  degreesOfFreedom: (n: number) => number;
  /** Smallest n per group with at least one degree of freedom. */
  minN: number;
}

export interface SummaryPower {
  /** Normal approximation, as published. */
  power: number;
  /** Noncentral t with the design's degrees of freedom: the exact power, the answer. */
  powerT: number;
}

export function summaryPower(effect: number, sd: number, n: number, design: SummaryDesign, alpha: number, sides: Sides): SummaryPower {
  const ncp = effect / (sd * Math.sqrt((2 * design.factor) / n));
  return { power: zTestPower(ncp, alpha, sides), powerT: tTestPower(ncp, design.degreesOfFreedom(n), alpha, sides) };
}

export interface SummaryRequest {
  sd: number;
  nPerGroup?: number;
  power?: number;
  sides: Sides;
  alpha: number;
  outcomes: number;
  multiplicity: Multiplicity;
  dropout: number;
  solveFor?: string;
}

export interface SummarySolution {
  solvedFor: string;
  effect: number;
  feasibility: Feasibility;
  result: Record<string, ResultValue>;
  warnings: string[];
  references: Citation[];
}

/**
 * Solves for power, nPerGroup or the effect (named `effectName`), with the adjustments, and
 * returns the common part of `result` (n, both powers, alpha, attrition).
 */
export function solveSummary(request: SummaryRequest, effectName: string, effectGiven: number | undefined, design: SummaryDesign): SummarySolution {
  const { sd, sides, alpha, outcomes, multiplicity, dropout } = request;
  const adjusted = adjustAlpha(alpha, outcomes, multiplicity);
  const a = adjusted.alphaAdjusted;
  const solvable = ['power', 'nPerGroup', effectName];
  const solvedFor = findUnknown(solvable, presence({ ...request, [effectName]: effectGiven }, solvable), request.solveFor);
  if (solvedFor !== 'nPerGroup' && request.nPerGroup! < design.minN) {
    throw inputError(`nPerGroup must be at least ${design.minN} to leave the t test one degree of freedom.`, ['nPerGroup']);
  }
  if (solvedFor !== 'power') requireTargetPower(request.power!, a);
  const target = request.power!;
  const warnings = [...adjusted.warnings];
  let effect = effectGiven;
  let n = request.nPerGroup;
  let feasibility: Feasibility = 'ok';
  const extra: Record<string, ResultValue> = {};

  const exactAt = (e: number, size: number) => summaryPower(e, sd, size, design, a, sides).powerT;
  if (solvedFor === 'nPerGroup') {
    const published = (2 * design.factor * (zSum(a, sides, target) * sd) ** 2) / (effect! * effect!);
    const s = solveSize((size) => exactAt(effect!, size), target, design.minN, MAX_N_PER_GROUP, published);
    ({ size: n, feasibility } = s);
    warnings.push(...sizeFeasibilityWarning(feasibility, 'subjects per group', s.size, s.power, target));
    const byNormal = solveSize((size) => summaryPower(effect!, sd, size, design, a, sides).power, target, design.minN, MAX_N_PER_GROUP, published);
    extra.nPerGroupNormal = byNormal.feasibility === 'unreachable' ? null : byNormal.size;
    if (feasibility === 'ok' && byNormal.feasibility === 'ok' && byNormal.size !== n) {
      warnings.push(
        `The published normal-approximation formula gives ${byNormal.size} per group; it ignores that the standard deviation is estimated, ` +
          `so the answer above uses the t distribution: ${n} per group.`,
      );
    }
  } else if (solvedFor === effectName) {
    // The normal approximation inverts exactly, δ = (z₁₋α/sides + z_power)·SE: the start for the exact effect.
    const normal = zSum(a, sides, target) * sd * Math.sqrt((2 * design.factor) / n!);
    const s = solveEffect((e) => exactAt(e, n!), target, normal);
    ({ effect, feasibility } = s);
    warnings.push(...effectFeasibilityWarning(feasibility, 'difference', s.effect, s.power, target));
    extra[`${effectName}Normal`] = normal;
  }
  const { power: powerNormal, powerT: power } = summaryPower(effect!, sd, n!, design, a, sides);
  const nRecruit = toRecruit(n!, dropout);
  return {
    solvedFor,
    effect: effect!,
    feasibility,
    warnings,
    references: adjusted.references,
    result: {
      [effectName]: effect!,
      sd,
      nPerGroup: n!,
      ...extra,
      sides,
      ...testSettings({ alpha, alphaAdjusted: a, outcomes, multiplicity, power, targetPower: solvedFor === 'power' ? null : target }),
      powerNormal,
      varianceFactor: design.factor,
      standardError: sd * Math.sqrt((2 * design.factor) / n!),
      degreesOfFreedom: design.degreesOfFreedom(n!),
      dropout,
      nPerGroupToRecruit: nRecruit,
      totalAnalysed: 2 * n!,
      totalToRecruit: 2 * nRecruit,
    },
  };
}
