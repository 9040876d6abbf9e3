/**
 * F test of u tested predictors among k predictors in a linear regression with an intercept.
 *
 * Power (exact): F is noncentral F with df (u, n − k − 1) and noncentrality λ = f²·n, Cohen's
 * (1988, ch. 9) convention; power = P(F > F₁₋α(u, n − k − 1)). The effect is Cohen's f² (the
 * share of variance the tested predictors explain, over the share left unexplained) or, for one
 * tested predictor, a slope: f² = slope²·sdX²/residualSd², with sdX the SD of the predictor
 * after the other predictors (its residual SD) and residualSd the SD of the outcome around the
 * full model.
 *
 * Valid range: the schema's; n ≥ k + 2 so that the error has at least one degree of freedom;
 * u ≤ k. Accuracy: that of the noncentral F and the F quantile; tested against R's pf and
 * pwr.f2.test to 1e-6 relative. Bad input: CalculationInputError.
 */
import { COHEN_1988 } from '@/lib/citations';
import type { CalculationRequest } from './request';
import { adjustAlpha, dropoutWarning, toRecruit } from './adjust';
import { inputError } from './errors';
import { effectFeasibilityWarning, fullReferences, sizeFeasibilityWarning, testSettings } from './output';
import { fTestPower, zSum } from './power';
import { findUnknown, requireTargetPower, solveEffect, solveSize } from './solve';
import type { CalculationOutput, Feasibility } from './types';
import { formatNumber, SENTENCE_DIGITS } from '@/lib/format';

export type RegressionRequest = Extract<CalculationRequest, { kind: 'regression' }>;

const MAX_N = 10_000_000;

export interface RegressionPowerInput {
  f2: number;
  n: number;
  testedPredictors: number;
  predictors: number;
  alpha: number;
}

/** Exact power of the F test, λ = f²·n (see the file's comment). */
export function regressionPower({ f2, n, testedPredictors, predictors, alpha }: RegressionPowerInput): number {
  return fTestPower(f2 * n, testedPredictors, n - predictors - 1, alpha);
}

/** Which form the effect takes: Cohen's f², or a slope with sdX and residualSd. */
function effectForm(request: RegressionRequest): 'f2' | 'slope' {
  const slopeParts = [request.slope, request.sdX, request.residualSd].filter((v) => v !== undefined).length;
  if (request.f2 !== undefined && slopeParts > 0) {
    throw inputError('Give the effect as f2, or as slope with sdX and residualSd, not both.', ['f2', 'slope', 'sdX', 'residualSd']);
  }
  if (request.f2 !== undefined) return 'f2';
  if (request.sdX === undefined || request.residualSd === undefined) {
    if (slopeParts > 0) {
      const missing = ['sdX', 'residualSd'].filter((name) => request[name as 'sdX' | 'residualSd'] === undefined);
      throw inputError(`A slope needs sdX and residualSd: give ${missing.join(' and ')}.`, missing);
    }
    return 'f2';
  }
  return 'slope';
}

export function regression(request: RegressionRequest): CalculationOutput {
  const { testedPredictors: u, alpha, outcomes, multiplicity, dropout } = request;
  const k = request.predictors ?? u;
  if (k < u) {
    throw inputError(`predictors (${k}) must be at least testedPredictors (${u}): the tested predictors are among the model's predictors.`, [
      'predictors',
      'testedPredictors',
    ]);
  }
  const form = effectForm(request);
  if (form === 'slope' && u !== 1) {
    throw inputError('A slope describes one tested predictor: set testedPredictors to 1, or give the effect as f2.', ['testedPredictors', 'slope']);
  }
  const adjusted = adjustAlpha(alpha, outcomes, multiplicity);
  const a = adjusted.alphaAdjusted;
  const present = { power: request.power !== undefined, n: request.n !== undefined, f2: request.f2 !== undefined || request.slope !== undefined };
  const unknown = findUnknown(['power', 'n', 'f2'], present, request.solveFor === 'slope' ? 'f2' : request.solveFor);
  const minN = k + 2;
  if (unknown !== 'n' && request.n! < minN) {
    throw inputError(`n must be at least ${minN} (predictors + 2) to leave the error at least one degree of freedom.`, ['n']);
  }
  if (unknown !== 'power') requireTargetPower(request.power!, a);

  const slopeScale = form === 'slope' ? request.sdX! / request.residualSd! : 1;
  const toF2 = (effect: number) => (form === 'slope' ? (effect * slopeScale) ** 2 : effect);
  const warnings: string[] = [...adjusted.warnings];
  let f2 = present.f2 ? toF2(form === 'slope' ? request.slope! : request.f2!) : NaN;
  let n = request.n;
  let power: number;
  let feasibility: Feasibility = 'ok';
  const powerAt = (effectF2: number, size: number) => regressionPower({ f2: effectF2, n: size, testedPredictors: u, predictors: k, alpha: a });

  if (unknown === 'power') {
    power = powerAt(f2, n!);
  } else if (unknown === 'n') {
    const guess = (zSum(a, 2, request.power!) ** 2 + u) / f2;
    const s = solveSize((size) => powerAt(f2, size), request.power!, minN, MAX_N, guess);
    ({ size: n, power, feasibility } = s);
    warnings.push(...sizeFeasibilityWarning(feasibility, 'observations', s.size, s.power, request.power!));
  } else {
    // Solve on the scale of the effect asked for (f² or the slope), so its tolerance is relative to it.
    const guessF2 = (zSum(a, 2, request.power!) ** 2 + u) / n!;
    const guess = form === 'slope' ? Math.sqrt(guessF2) / slopeScale : guessF2;
    const s = solveEffect((e) => powerAt(toF2(e), n!), request.power!, guess);
    f2 = toF2(s.effect);
    ({ power, feasibility } = s);
    warnings.push(...effectFeasibilityWarning(feasibility, form === 'slope' ? 'slope' : 'f2', s.effect, s.power, request.power!));
  }
  const slope = form === 'slope' ? Math.sqrt(f2) / slopeScale : null;
  if (request.predictors === undefined) warnings.push(`predictors was not given: the model is taken to have only the ${u} tested predictor(s).`);
  const nRecruit = toRecruit(n!, dropout);
  warnings.push(...dropoutWarning(dropout, 'observations'));

  return {
    kind: 'regression',
    solvedFor: unknown === 'f2' && form === 'slope' ? 'slope' : unknown,
    result: {
      f2,
      slope,
      sdX: request.sdX ?? null,
      residualSd: request.residualSd ?? null,
      testedPredictors: u,
      predictors: k,
      n: n!,
      ...testSettings({ alpha, alphaAdjusted: a, outcomes, multiplicity, power, targetPower: unknown === 'power' ? null : request.power! }),
      noncentrality: f2 * n!,
      degreesOfFreedom: [u, n! - k - 1],
      dropout,
      nToRecruit: nRecruit,
      totalAnalysed: n!,
      totalToRecruit: nRecruit,
    },
    feasibility,
    method: `Exact power of the F test of ${u} of ${k} predictor(s) (noncentral F, df = (${u}, n − ${k + 1}), noncentrality f² × n as in ${COHEN_1988.short}).`,
    formula:
      'Power is the chance that an F statistic with (tested predictors, n − predictors − 1) degrees of freedom and noncentrality f² × n exceeds ' +
      `the critical value of the F distribution at alpha${form === 'slope' ? `; f² = slope² × sdX² / residualSd² (here ${formatNumber(slopeScale ** 2, SENTENCE_DIGITS)} × slope²)` : ''}.`,
    references: fullReferences([COHEN_1988, ...adjusted.references]),
    warnings,
  };
}
