/**
 * Difference between two independent means, compared by the two-sample t test with pooled
 * variance.
 *
 * Power (exact): T is noncentral t with df = n1 + n2 − 2 and noncentrality
 * δ/(σ·√(1/n1 + 1/n2)); two-sided power P(T > t₁₋α/2) + P(T < −t₁₋α/2) counts both rejection
 * tails, one-sided power is P(T > t₁₋α). Group 2 has n2 = ⌈ratio·n1⌉ units (Cohen 1988, ch. 2).
 *
 * Valid range: the schema's (δ, σ > 0; n1 ≥ 2 and n2 ≥ 2; ratio 0.01–100). Accuracy: that of the
 * noncentral t (absolute 1e-10); tested against R's power.t.test(strict = TRUE) and
 * pwr.t2n.test to 1e-6 relative. Bad input: CalculationInputError.
 */
import { COHEN_1988 } from '@/lib/citations';
import { SOLVABLE, type CalculationRequest } from './request';
import { adjustAlpha, dropoutWarning, roundUp, toRecruit } from './adjust';
import { inputError } from './errors';
import { effectFeasibilityWarning, fullReferences, sizeFeasibilityWarning, TWO_SIDED, testSettings } from './output';
import { tTestPower, zSum, type Sides } from './power';
import { findUnknown, presence, requireTargetPower, solveEffect, solveSize } from './solve';
import type { CalculationOutput, Feasibility } from './types';

export type TwoGroupMeansRequest = Extract<CalculationRequest, { kind: 'two-group-means' }>;

const MAX_N = 10_000_000;

/** Units in group 2: ⌈ratio·n1⌉. */
export function groupTwoSize(n1: number, ratio: number): number {
  return roundUp(ratio * n1);
}

/** The smallest n1 ≥ 2 that leaves group 2 at least 2 units. */
export function smallestGroupOne(ratio: number): number {
  let n1 = Math.max(2, Math.floor(1 / ratio) - 1);
  while (groupTwoSize(n1, ratio) < 2) n1++;
  return n1;
}

export interface TwoGroupMeansPowerInput {
  delta: number;
  sd: number;
  nPerGroup: number;
  ratio: number;
  alpha: number;
  sides: Sides;
}

/** Exact power of the two-sample t test (see the file's comment). */
export function twoGroupMeansPower({ delta, sd, nPerGroup, ratio, alpha, sides }: TwoGroupMeansPowerInput): number {
  const n2 = groupTwoSize(nPerGroup, ratio);
  const ncp = delta / (sd * Math.sqrt(1 / nPerGroup + 1 / n2));
  return tTestPower(ncp, nPerGroup + n2 - 2, alpha, sides);
}

export function twoGroupMeans(request: TwoGroupMeansRequest): CalculationOutput {
  const { sd, ratio, sides, alpha, outcomes, multiplicity, dropout } = request;
  const adjusted = adjustAlpha(alpha, outcomes, multiplicity);
  const a = adjusted.alphaAdjusted;
  const solvedFor = findUnknown(SOLVABLE['two-group-means'], presence(request, SOLVABLE['two-group-means']), request.solveFor);
  const minN = smallestGroupOne(ratio);
  if (solvedFor !== 'nPerGroup' && request.nPerGroup! < minN) {
    throw inputError(`With ratio ${ratio}, nPerGroup must be at least ${minN} so that group 2 has at least 2 units.`, ['nPerGroup', 'ratio']);
  }
  if (solvedFor !== 'power') requireTargetPower(request.power!, a);

  const warnings: string[] = [...adjusted.warnings];
  let delta = request.delta;
  let nPerGroup = request.nPerGroup;
  let power: number;
  let feasibility: Feasibility = 'ok';
  const powerAt = (d: number, n: number) => twoGroupMeansPower({ delta: d, sd, nPerGroup: n, ratio, alpha: a, sides });

  if (solvedFor === 'power') {
    power = powerAt(delta!, nPerGroup!);
  } else if (solvedFor === 'nPerGroup') {
    const guess = ((zSum(a, sides, request.power!) * sd) / delta!) ** 2 * (1 + 1 / ratio);
    const s = solveSize((n) => powerAt(delta!, n), request.power!, minN, MAX_N, guess);
    ({ size: nPerGroup, power, feasibility } = s);
    warnings.push(...sizeFeasibilityWarning(feasibility, 'units in group 1', s.size, s.power, request.power!));
  } else {
    const n = nPerGroup!;
    const n2 = groupTwoSize(n, ratio);
    const guess = sd * zSum(a, sides, request.power!) * Math.sqrt(1 / n + 1 / n2);
    const s = solveEffect((d) => powerAt(d, n), request.power!, Math.max(guess, sd * 1e-6));
    ({ effect: delta, power, feasibility } = s);
    warnings.push(...effectFeasibilityWarning(feasibility, 'difference', s.effect, s.power, request.power!));
  }

  const n1 = nPerGroup!;
  const n2 = groupTwoSize(n1, ratio);
  const n1Recruit = toRecruit(n1, dropout);
  const n2Recruit = toRecruit(n2, dropout);
  warnings.push(...dropoutWarning(dropout, 'units'));
  return {
    kind: 'two-group-means',
    solvedFor,
    result: {
      delta: delta!,
      sd,
      standardizedEffect: delta! / sd,
      nPerGroup: n1,
      nGroup2: n2,
      ratio,
      sides,
      ...testSettings({ alpha, alphaAdjusted: a, outcomes, multiplicity, power, targetPower: solvedFor === 'power' ? null : request.power! }),
      degreesOfFreedom: n1 + n2 - 2,
      dropout,
      nPerGroupToRecruit: n1Recruit,
      nGroup2ToRecruit: n2Recruit,
      totalAnalysed: n1 + n2,
      totalToRecruit: n1Recruit + n2Recruit,
    },
    feasibility,
    method: `Exact power of the ${TWO_SIDED(sides)} two-sample t test (noncentral t, df = n1 + n2 − 2)${sides === 2 ? ', both rejection tails counted' : ''}.`,
    formula:
      'Power is the chance that a t statistic with n1 + n2 − 2 degrees of freedom and noncentrality delta / (sd × √(1/n1 + 1/n2)) ' +
      `falls beyond the critical value of the t distribution at alpha${sides === 2 ? '/2 on either side' : ''}; group 2 has ratio × n1 units, rounded up.`,
    references: fullReferences([COHEN_1988, ...adjusted.references]),
    warnings,
  };
}
