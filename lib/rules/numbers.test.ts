/**
 * The quantified consequences in the findings, checked against the published formulas. Every
 * expected value is computed here from the formula itself (the normal distribution function by
 * Simpson's rule on the density), not by calling the helpers the rules use.
 */
import { describe, expect, it } from 'vitest';
import type { Design } from '@/lib/design/schema';
import { classroom, greenhouse, longitudinal, narrowDose, parallelNights, simple, sleep, variant } from './__fixtures__/designs';
import { runChecks } from './registry';
import type { Finding } from './types';

/** Φ(x) = ½ + ∫₀ˣ φ(t) dt by composite Simpson's rule (4,000 panels: error far below 1e-12 here). */
function phi(x: number): number {
  const n = 4000;
  const h = x / n;
  const f = (t: number) => Math.exp((-t * t) / 2) / Math.sqrt(2 * Math.PI);
  let s = f(0) + f(x);
  for (let i = 1; i < n; i++) s += (i % 2 === 1 ? 4 : 2) * f(i * h);
  return 0.5 + (s * h) / 3;
}
/** z₀.₉₇₅, the two-sided 5% critical value (to 15 significant digits). */
const Z975 = 1.95996398454005;
/** Real false-positive rate of a naive 5% test: 2·(1 − Φ(z₁₋α/₂/√DE)) (Donner & Klar 2000). */
const naiveFp = (de: number) => 2 * (1 - phi(Z975 / Math.sqrt(de)));

function finding(d: Design, ruleId: string, key?: string): Finding {
  const f = runChecks(d).findings.find((x) => x.ruleId === ruleId && (key === undefined || x.key === key));
  if (!f) throw new Error(`no ${ruleId}${key ? `/${key}` : ''} finding`);
  return f;
}

const close = (actual: number | undefined, expected: number, rel = 1e-9) => {
  expect(actual, `expected ${expected}`).toBeDefined();
  const tol = rel * Math.max(1, Math.abs(expected));
  expect(Math.abs(actual! - expected), `actual ${actual}, expected ${expected}, difference ${actual! - expected}, tolerance ${tol}`).toBeLessThanOrEqual(tol);
};

describe('self-check of the reference Φ', () => {
  it('Φ(1.959964) = 0.975 and Φ(1) = 0.841344746', () => {
    close(phi(Z975), 0.975, 1e-12);
    close(phi(1), 0.8413447460685429, 1e-12);
  });
});

describe('unit-of-analysis: classroom demo', () => {
  it.each<[string, number, number]>([
    // Kish 1965: DE = 1 + (m − 1)·ρ = 1 + 24 × 0.15 = 4.6 with equal classrooms.
    ['equal sizes (Kish 1965)', 0, 1 + (25 - 1) * 0.15],
    // Eldridge, Ashby & Kerry 2006: DE = 1 + ((cv² + 1)·m − 1)·ρ with cv 0.25.
    ['CV 0.25 (Eldridge, Ashby & Kerry 2006)', 0.25, 1 + ((0.25 ** 2 + 1) * 25 - 1) * 0.15],
  ])('%s', (_label, cv, de) => {
    const f = finding(variant(classroom, (d) => { d.structure.levels[1]!.countCv = cv; }), 'unit-of-analysis');
    close(f.numbers!.designEffect, de);
    close(f.numbers!.designEffectEqualSizes, 4.6);
    close(f.numbers!.effectiveN, 500 / de); // Kish 1965: N / DE
    close(f.numbers!.naiveTypeIError, naiveFp(de), 1e-9); // 2·(1 − Φ(1.96/√DE))
    expect(f.numbers!.clusters).toBe(20);
    expect(f.numbers!.unitsPerArm).toBe(10);
  });
  it('states the false-positive rate in words: about 36% with equal classrooms, 37% with CV 0.25', () => {
    expect(naiveFp(4.6)).toBeCloseTo(0.361, 3);
    expect(finding(variant(classroom, (d) => { d.structure.levels[1]!.countCv = 0; }), 'unit-of-analysis').why).toContain('about 36%');
    expect(finding(classroom, 'unit-of-analysis').why).toContain('about 37%');
    expect(finding(classroom, 'unit-of-analysis').why).toContain('design effect is 4.8 (4.6 if every classroom had the same size');
  });
  it('without an ICC: the figures over ICC 0.01–0.2, said to be a range', () => {
    const f = finding(variant(classroom, (d) => { d.assumptions.iccs = []; }), 'unit-of-analysis');
    const de = (rho: number) => 1 + ((0.25 ** 2 + 1) * 25 - 1) * rho; // Eldridge et al. 2006
    close(f.numbers!.designEffectLow, de(0.01));
    close(f.numbers!.designEffectHigh, de(0.2));
    close(f.numbers!.naiveTypeIErrorLow, naiveFp(de(0.01)));
    close(f.numbers!.naiveTypeIErrorHigh, naiveFp(de(0.2)));
    expect(f.why).toMatch(/No ICC is given/);
    expect(f.why).toMatch(/plausible range of 0\.01 to 0\.2/);
  });
  it('the nominal level is the design’s α (here 1%)', () => {
    const f = finding(variant(classroom, (d) => { d.assumptions.alpha = 0.01; d.structure.levels[1]!.countCv = 0; }), 'unit-of-analysis');
    const z995 = 2.5758293035489;
    close(f.numbers!.naiveTypeIError, 2 * (1 - phi(z995 / Math.sqrt(4.6))), 1e-9);
  });
});

describe('unit-of-analysis: greenhouse demo (nested levels)', () => {
  it('per leaf: DE = 1 + (24 − 1)·0.2 + (4 − 1)·0.4 = 6.8 (Kish 1965 extended to nested levels)', () => {
    const f = finding(greenhouse, 'unit-of-analysis');
    const de = 1 + (24 - 1) * 0.2 + (4 - 1) * 0.4;
    close(f.numbers!.designEffect, de);
    close(f.numbers!.effectiveN, 288 / de);
    close(f.numbers!.naiveTypeIError, naiveFp(de));
  });
  it('per plant mean: ICC of plant means within trays 0.2 / (0.2 + 0.4 + 0.4/4), DE = 1 + 5·that', () => {
    const f = finding(variant(greenhouse, (d) => { d.analysis.unitOfAnalysisLevelId = 'plant'; }), 'unit-of-analysis');
    const iccMeans = 0.2 / (0.2 + 0.4 + 0.4 / 4);
    const de = 1 + (6 - 1) * iccMeans;
    close(f.numbers!.designEffect, de);
    close(f.numbers!.effectiveN, 72 / de);
  });
  it('parallel groups over nights: DE = 1 + (8 − 1)·0.5 = 4.5, naive rate 2(1 − Φ(1.96/√4.5))', () => {
    const f = finding(variant(sleep, (d) => { d.assignment.levelId = 'volunteer'; d.assignment.crossover.enabled = false; }), 'unit-of-analysis');
    close(f.numbers!.designEffect, 4.5);
    close(f.numbers!.naiveTypeIError, naiveFp(4.5));
  });
});

describe('nested-clusters, pseudoreplication, repeated measures', () => {
  it('nested-clusters classroom: DE and effective n as in Eldridge et al. 2006 / Kish 1965', () => {
    const f = finding(classroom, 'nested-clusters', 'classroom');
    const de = 1 + ((0.0625 + 1) * 25 - 1) * 0.15;
    close(f.numbers!.designEffect, de);
    close(f.numbers!.effectiveN, 500 / de);
  });
  it('pseudoreplication: leaves of one plant correlate 0.2 + 0.4; DE of 4 leaves = 1 + 3·0.6 (Kish 1965; Lazic 2010)', () => {
    const f = finding(greenhouse, 'pseudoreplication', 'leaf');
    close(f.numbers!.withinUnitCorrelation, 0.6);
    close(f.numbers!.designEffect, 1 + 3 * 0.6);
    close(f.numbers!.effectiveReplicatesPerUnit, 4 / (1 + 3 * 0.6));
  });
  it('repeated measures, volunteers randomised between schedules: DE 1 + 7·0.5 (Kish 1965), within-volunteer factor 1 − 0.5 (Diggle et al. 2002)', () => {
    const f = finding(parallelNights, 'repeated-measures', 'night');
    close(f.numbers!.designEffectBetween, 4.5);
    close(f.numbers!.effectiveNBetween, 192 / 4.5);
    close(f.numbers!.varianceFactorWithin, 0.5);
  });

  it('repeated measures, schedules compared within volunteers (sleep demo): only the factor 1 − 0.5, no design effect', () => {
    const f = finding(sleep, 'repeated-measures', 'night');
    close(f.numbers!.varianceFactorWithin, 0.5);
    expect(f.numbers!.designEffectBetween).toBeUndefined();
    expect(f.why).not.toMatch(/design effect/);
    // Says which share is left, not a number followed by a formula in brackets.
    expect(f.why).toContain('leaving a share 1 − ρ = 0.5 of the variance');
  });
});

describe('unequal-cluster-sizes (Eldridge, Ashby & Kerry 2006)', () => {
  it('extra inflation = DE(cv)/DE(0) − 1 and clusters for the same precision', () => {
    const f = finding(classroom, 'unequal-cluster-sizes', 'classroom');
    const unequal = 1 + ((0.0625 + 1) * 25 - 1) * 0.15;
    const equal = 1 + 24 * 0.15;
    close(f.numbers!.extraInflation, unequal / equal - 1);
    close(f.numbers!.clustersForSamePrecision, (20 * unequal) / equal);
  });
  it('CV of a two-step size: cv² = cv_plants² + cv_leaves²/n_plants (law of total variance)', () => {
    const d = variant(greenhouse, (x) => { x.structure.levels[1]!.countCv = 0.3; x.structure.levels[2]!.countCv = 0.5; });
    const f = finding(d, 'unequal-cluster-sizes', 'tray');
    close(f.numbers!.sizeCv, Math.sqrt(0.3 ** 2 + 0.5 ** 2 / 6));
  });
});

describe('uncertain-icc: sensitivity range half to twice the value', () => {
  it('greenhouse tray ICC 0.2 → DE at 0.1, 0.2 and 0.4 with the plant ICC 0.4 kept', () => {
    const f = finding(greenhouse, 'uncertain-icc', 'tray');
    const de = (rho: number) => 1 + 23 * rho + 3 * 0.4;
    close(f.numbers!.designEffectLow, de(0.1));
    close(f.numbers!.designEffect, de(0.2));
    close(f.numbers!.designEffectHigh, de(0.4));
    close(f.numbers!.sampleSizeRatio, de(0.4) / de(0.1));
  });
});

describe('multiplicity', () => {
  it.each([2, 3, 5])('K = %i: family-wise error 1 − (1 − α)^K, Bonferroni α/K (Holm 1979)', (K) => {
    const f = finding(variant(simple, (d) => { d.outcome.primaryOutcomes = K; }), 'multiplicity');
    close(f.numbers!.familyWiseError, 1 - 0.95 ** K);
    close(f.numbers!.bonferroniAlpha, 0.05 / K);
  });
});

describe('baseline-adjustment (Frison & Pocock 1992)', () => {
  it.each([0.3, 0.6, 0.8])('ρ = %f: ANCOVA 1 − ρ², change score 2(1 − ρ)', (r) => {
    const f = finding(variant(classroom, (d) => { d.assumptions.occasionCorrelation = { value: r, source: { kind: 'pilot', certainty: 'medium' } }; }), 'baseline-adjustment');
    close(f.numbers!.ancovaVarianceFactor, 1 - r * r);
    close(f.numbers!.changeScoreVarianceFactor, 2 * (1 - r));
  });
});

describe('attrition (Diggle et al. 2002; SPIRIT 2013 item 14)', () => {
  it('sleep: mixed model keeps the mean of (1 − aₜ) of measurements; recruitment N/(1 − a)', () => {
    const f = finding(sleep, 'attrition');
    close(f.numbers!.measurementsUsedByMixedModel, (4 * 1 + 4 * 0.9) / 8);
    close(f.numbers!.completeCases, 24 * 0.9);
    expect(f.numbers!.recruitmentForSameN).toBe(Math.ceil(24 / 0.9));
  });
  it('classroom: 8% of 500 pupils', () => {
    const f = finding(classroom, 'attrition');
    close(f.numbers!.unitsLost, 40);
    expect(f.numbers!.recruitmentForSameN).toBe(544); // ⌈500 / 0.92⌉
  });
});

describe('other quantities', () => {
  it('few-units: 6 trays per arm, 12 − 2 = 10 df between trays', () => {
    const f = finding(greenhouse, 'few-units', 'per-arm');
    expect(f.numbers!.unitsPerArm).toBe(6);
    expect(f.numbers!.betweenUnitDf).toBe(10);
  });
  it('analysis-mismatch on the sleep cross-over: naive df 192 − 2, design df 24 − 2 (Senn 2002)', () => {
    const f = finding(sleep, 'analysis-mismatch', 'repeated-volunteer');
    expect(f.numbers!.naiveDf).toBe(190);
    expect(f.numbers!.designDf).toBe(22);
  });
  it('spatial-serial: AR(1) correlation ρ^7 between nights 7 apart (Diggle et al. 2002)', () => {
    close(finding(sleep, 'spatial-serial', 'night').numbers!.correlationAtMaxLag, 0.5 ** 7);
  });
  it('many-occasions: unstructured covariance has T(T + 1)/2 = 36 parameters for 8 nights', () => {
    expect(finding(sleep, 'many-occasions', 'covariance').numbers!.unstructuredParameters).toBe(36);
    expect(finding(longitudinal, 'many-occasions', 'covariance').numbers!.unstructuredParameters).toBe(15);
  });
  it('narrow-range: 10–20 of 0–40 covers 25%; slope SE ratio 40/10 (Var(b) = σ²/Σ(x − x̄)²)', () => {
    const f = finding(narrowDose, 'narrow-range', 'dose');
    close(f.numbers!.targetRangeCovered, 0.25);
    close(f.numbers!.slopeSeRatio, 4);
  });
});
