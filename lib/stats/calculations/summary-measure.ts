/**
 * Two groups of n subjects compared on one summary per subject (a mean of follow-ups, a change,
 * an ANCOVA-adjusted mean, an OLS slope) whose variance is σ²·f, f a variance factor that the
 * kind derives from its design. The difference of the group means has standard error
 * SE = √(2σ²·f/n).
 *
 * Sizes and effects use the normal approximation as the published formulas do:
 * n = (z₁₋α/sides + z₁₋β)²·2σ²·f/δ², i.e. power Φ(δ/SE − z₁₋α/sides) (one rejection tail). The
 * achieved power is also given by the t test on the summaries (noncentral t, both tails when
 * two-sided) with the kind's degrees of freedom, which is lower for small n.
 *
 * Shared by repeated-measures.ts (Frison & Pocock 1992) and longitudinal-slopes.ts
 * (Diggle et al. 2002).
 */
import { adjustAlpha, formatNumber, toRecruit } from './adjust';
import { inputError } from './errors';
import { sizeFeasibilityWarning, testSettings } from './output';
import { tTestPower, zSum, zTestPower, type Sides } from './power';
import { findUnknown, presence, requireTargetPower, solveSize } from './solve';
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
  /** Noncentral t with the design's degrees of freedom. */
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

  if (solvedFor === 'nPerGroup') {
    const published = (2 * design.factor * (zSum(a, sides, target) * sd) ** 2) / (effect! * effect!);
    const s = solveSize((size) => summaryPower(effect!, sd, size, design, a, sides).power, target, design.minN, MAX_N_PER_GROUP, published);
    ({ size: n, feasibility } = s);
    warnings.push(...sizeFeasibilityWarning(feasibility, 'subjects per group', s.size, s.power, target));
    const byT = solveSize((size) => summaryPower(effect!, sd, size, design, a, sides).powerT, target, design.minN, MAX_N_PER_GROUP, published);
    extra.nPerGroupByT = byT.feasibility === 'unreachable' ? null : byT.size;
    if (byT.size > n! && byT.feasibility !== 'unreachable') {
      warnings.push(
        `By the t distribution the power at ${n} per group is ${formatNumber(summaryPower(effect!, sd, n!, design, a, sides).powerT)}; ` +
          `${byT.size} per group would reach ${formatNumber(target)} by t.`,
      );
    }
  } else if (solvedFor === effectName) {
    // The normal approximation inverts exactly: δ = (z₁₋α/sides + z_power)·SE.
    effect = zSum(a, sides, target) * sd * Math.sqrt((2 * design.factor) / n!);
  }
  const { power, powerT } = summaryPower(effect!, sd, n!, design, a, sides);
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
      powerT,
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
