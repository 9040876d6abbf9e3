/**
 * Two independent proportions p1 and p2 (p2 may be given as a difference, risk ratio or odds
 * ratio: proportion-effect.ts), by the normal approximation of Fleiss, Levin & Paik (2003):
 *   n = [z₁₋α/sides·√(2p̄q̄) + z₁₋β·√(p1q1 + p2q2)]² / (p1 − p2)²,  p̄ = (p1 + p2)/2, q = 1 − p,
 * and so power Φ((|p1 − p2|·√n − z₁₋α/sides·√(2p̄q̄)) / √(p1q1 + p2q2)) (one rejection tail, as
 * published). With the continuity correction the size is n/4·(1 + √(1 + 4/(n·|p1 − p2|)))²;
 * its inverse, used for power at a corrected size N, is n = (N − 1/|p1 − p2|)²/N for
 * N > 1/|p1 − p2| (and 0 below).
 *
 * Clustered (icc and clusterSize given): the size is multiplied by
 * DE = 1 + ((cv² + 1)·m − 1)·ICC (Eldridge et al. 2006), i.e. power at N units per group is the
 * power at N/DE independent ones; clusters per arm are ⌈N/m⌉ (Donner & Klar 2000).
 *
 * Valid range: 0 < p1, p2 < 1, the schema's bounds. Accuracy: that of Φ and Φ⁻¹ (1e-14); tested
 * against R's power.prop.test to 1e-6. Bad input: CalculationInputError.
 */
import { DONNER_KLAR_2000, ELDRIDGE_2006, FLEISS_2003 } from '@/lib/citations';
import { designEffect } from '@/lib/stats/design-effect';
import { normalSf } from '@/lib/stats/normal';
import { SOLVABLE, type CalculationRequest } from './request';
import { adjustAlpha, dropoutWarning, roundUp, toRecruit } from './adjust';
import { inputError } from './errors';
import { effectFeasibilityWarning, fullReferences, sizeFeasibilityWarning, TWO_SIDED, testSettings } from './output';
import { zCritical, type Sides } from './power';
import { effectMeasures, p2FromEffect } from './proportion-effect';
import { effectPresence, findUnknown, requireTargetPower, solveEffect, solveSize } from './solve';
import type { CalculationOutput, Feasibility } from './types';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export type TwoProportionsRequest = Extract<CalculationRequest, { kind: 'two-proportions' }>;

const MAX_N = 10_000_000;
/** How close to 0 or 1 a solved p2 may come. */
const P_EDGE = 1e-9;

/** Fleiss et al.'s continuity-corrected size for an uncorrected size n and |p1 − p2| = d. */
export function continuityCorrected(n: number, d: number): number {
  return (n / 4) * (1 + Math.sqrt(1 + 4 / (n * d))) ** 2;
}

/** The uncorrected size whose corrected size is N (the inverse of `continuityCorrected`). */
export function continuityUncorrected(corrected: number, d: number): number {
  return corrected > 1 / d ? (corrected - 1 / d) ** 2 / corrected : 0;
}

export interface TwoProportionsPowerInput {
  p1: number;
  p2: number;
  /** Independent units per group (already divided by DE when clustered). */
  n: number;
  alpha: number;
  sides: Sides;
  continuityCorrection: boolean;
}

/** Power by Fleiss et al.'s normal approximation (see the file's comment). */
export function twoProportionsPower({ p1, p2, n, alpha, sides, continuityCorrection }: TwoProportionsPowerInput): number {
  const d = Math.abs(p1 - p2);
  const nEff = continuityCorrection ? continuityUncorrected(n, d) : n;
  const pBar = (p1 + p2) / 2;
  const z = (d * Math.sqrt(nEff) - zCritical(alpha, sides) * Math.sqrt(2 * pBar * (1 - pBar))) / Math.sqrt(p1 * (1 - p1) + p2 * (1 - p2));
  return normalSf(-z);
}

export function twoProportions(request: TwoProportionsRequest): CalculationOutput {
  const { p1, sides, alpha, outcomes, multiplicity, dropout, continuityCorrection, cv } = request;
  const clustered = request.icc !== undefined || request.clusterSize !== undefined;
  if (clustered && (request.icc === undefined || request.clusterSize === undefined)) {
    const missing = request.icc === undefined ? 'icc' : 'clusterSize';
    throw inputError(`For clustered proportions give both icc and clusterSize: ${missing} is missing.`, [missing]);
  }
  const de = clustered ? designEffect({ clusterSize: request.clusterSize!, icc: request.icc!, cv }) : 1;
  const adjusted = adjustAlpha(alpha, outcomes, multiplicity);
  const a = adjusted.alphaAdjusted;
  const solvedFor = findUnknown(SOLVABLE['two-proportions'], effectPresence(request, SOLVABLE['two-proportions']), request.solveFor);
  let p2 = solvedFor === 'p2' ? undefined : p2FromEffect(request);
  if (solvedFor === 'nPerGroup' && p2 === p1) {
    throw inputError('p2 equals p1: no sample size detects a difference of zero. Give a p2 different from p1.', ['p2']);
  }
  if (solvedFor !== 'power') requireTargetPower(request.power!, a);
  const target = request.power!;

  const warnings = [...adjusted.warnings];
  let n = request.nPerGroup;
  let power: number;
  let feasibility: Feasibility = 'ok';
  const powerAt = (q2: number, size: number) => twoProportionsPower({ p1, p2: q2, n: size / de, alpha: a, sides, continuityCorrection });

  if (solvedFor === 'power') {
    power = powerAt(p2!, n!);
  } else if (solvedFor === 'nPerGroup') {
    const s = solveSize((size) => powerAt(p2!, size), target, 2, MAX_N);
    ({ size: n, power, feasibility } = s);
    warnings.push(...sizeFeasibilityWarning(feasibility, 'units per group', s.size, s.power, target));
  } else {
    const lower = request.direction === 'lower';
    const room = lower ? p1 - P_EDGE : 1 - P_EDGE - p1;
    const sign = lower ? -1 : 1;
    if (!(room > 0)) throw inputError(`p1 leaves no room for a p2 ${lower ? 'below' : 'above'} it.`, ['p1', 'direction']);
    const s = solveEffect((d) => powerAt(p1 + sign * d, n!), target, Math.min(room / 2, 1 / Math.sqrt(n! / de)), room);
    p2 = p1 + sign * s.effect;
    ({ power, feasibility } = s);
    warnings.push(...effectFeasibilityWarning(feasibility, `p2 ${lower ? 'below' : 'above'} p1`, p2, s.power, target));
  }

  const nRecruit = toRecruit(n!, dropout);
  const clusterPart: Record<string, number | null> = clustered
    ? {
        icc: request.icc!,
        clusterSize: request.clusterSize!,
        cv,
        designEffect: de,
        effectiveNPerGroup: n! / de,
        clustersPerArm: roundUp(n! / request.clusterSize!),
        clustersPerArmToRecruit: roundUp(nRecruit / request.clusterSize!),
      }
    : { icc: null, clusterSize: null, designEffect: 1 };
  warnings.push(...dropoutWarning(dropout, 'units'));
  if (clustered && cv > 0) warnings.push(`Unequal cluster sizes are allowed for by the coefficient of variation ${cv} (${ELDRIDGE_2006.short}).`);
  return {
    kind: 'two-proportions',
    solvedFor,
    result: {
      p1,
      p2: p2!,
      ...effectMeasures(p1, p2!),
      nPerGroup: n!,
      sides,
      continuityCorrection,
      ...testSettings({ alpha, alphaAdjusted: a, outcomes, multiplicity, power, targetPower: solvedFor === 'power' ? null : target }),
      ...clusterPart,
      dropout,
      nPerGroupToRecruit: nRecruit,
      totalAnalysed: 2 * n!,
      totalToRecruit: 2 * nRecruit,
    },
    feasibility,
    method:
      `Normal approximation for two independent proportions (${FLEISS_2003.short}), ${TWO_SIDED(sides)}` +
      `${continuityCorrection ? ', with continuity correction' : ', without continuity correction'}` +
      `${clustered ? `, multiplied by the design effect ${formatNumber(de, SENTENCE_DIGITS)}` : ''}.`,
    formula:
      'n per group = [z for alpha × √(2 × p̄ × (1 − p̄)) + z for power × √(p1(1 − p1) + p2(1 − p2))]² / (p1 − p2)², with p̄ the mean of p1 and p2' +
      (continuityCorrection ? '; corrected to n/4 × (1 + √(1 + 4/(n × |p1 − p2|)))²' : '') +
      (clustered ? '; multiplied by the design effect 1 + ((cv² + 1) × m − 1) × ICC.' : '.'),
    references: fullReferences([FLEISS_2003, ...(clustered ? [ELDRIDGE_2006, DONNER_KLAR_2000] : []), ...adjusted.references]),
    warnings,
  };
}
