import { describe, expect, it } from 'vitest';
import { simulationSpecSchema } from './spec';
import { METRIC_NAMES, type Metrics } from './metrics';
import { percent, summarise } from './summarise';

const spec = simulationSpecSchema.parse({
  design: { arms: 2, clustersPerArm: 10, clusterSize: 20 },
  truth: { effect: 0.5, sd: 1, icc: 0.1 },
  scenarios: [{ violation: 'none' }, { violation: 'outliers', name: 'big outliers', scale: 10 }],
  analyses: ['ols', 'mixed'],
  replicates: 1000,
});

/** Metrics that meet every promise: 5% false positives, 95% coverage, no bias, honest SEs. */
function nominal(overrides: Partial<Metrics> = {}): Metrics {
  const m = Object.fromEntries(METRIC_NAMES.map((name) => [name, { value: 0, mcse: 0.01 }])) as Metrics;
  m.typeIError = { value: 0.05, mcse: 0.0069 };
  m.coverage = { value: 0.95, mcse: 0.0069 };
  m.seRatio = { value: 1, mcse: 0.02 };
  m.power = { value: 0.8, mcse: 0.013 };
  m.nonConverged = { value: 0, mcse: 0 };
  return { ...m, ...overrides };
}

describe('summarise', () => {
  it('says nothing when every measure is within 3 MC SE of its promise', () => {
    const results = { none: { ols: nominal({ typeIError: { value: 0.07, mcse: 0.008 } }), mixed: nominal() }, 'big outliers': { ols: nominal(), mixed: nominal() } };
    expect(summarise(spec, results)).toEqual([]);
  });

  it('writes one sentence per departure, naming the scenario and the analysis', () => {
    const results = {
      none: {
        ols: nominal({ typeIError: { value: 0.251, mcse: 0.0137 }, coverage: { value: 0.83, mcse: 0.012 }, seRatio: { value: 0.6, mcse: 0.02 } }),
        mixed: nominal({ nonConverged: { value: 12, mcse: 3.5 } }),
      },
      'big outliers': { ols: nominal({ bias: { value: 0.1, mcse: 0.01 } }), mixed: nominal() },
    };
    expect(summarise(spec, results)).toEqual([
      'When the assumptions hold, analysed with least squares, the false-positive rate is 25%, not 5%.',
      'When the assumptions hold, analysed with least squares, the 95% confidence interval covers the true effect 83% of the time, not 95%.',
      'When the assumptions hold, analysed with least squares, the reported standard error is 40% smaller than the real spread of the estimates.',
      'When the assumptions hold, analysed with linear mixed model, 12 of the 2,000 fits asked for (0.6%; 1,000 replicates, each fitted with and without the effect) did not converge or could not be estimated, and were left out of the other figures.',
      'With outliers (big outliers), analysed with least squares, the estimate is off by 0.1 on average (20% of the true effect).',
    ]);
  });

  it('says in one sentence when every fit of an analysis failed, with the count and share of the fits asked for', () => {
    const failed = nominal({ nonConverged: { value: 2000, mcse: 0 } });
    for (const k of ['typeIError', 'coverage', 'bias', 'seRatio', 'power'] as const) failed[k] = { value: NaN, mcse: NaN };
    expect(summarise(spec, { none: { ols: nominal(), mixed: failed } })).toEqual([
      'When the assumptions hold, analysed with linear mixed model, 2,000 of the 2,000 fits asked for (100%; 1,000 replicates, each fitted with and without the effect) did not converge or could not be estimated, so this analysis has no figures here.',
    ]);
  });

  it('does not call a rate of 0 on its own MC SE of 0 a departure unless the nominal MC SE says so', () => {
    const few = { ...spec, replicates: 10 };
    expect(summarise(few, { none: { ols: nominal({ typeIError: { value: 0, mcse: 0 } }) } })).toEqual([]);
    expect(summarise(spec, { none: { ols: nominal({ typeIError: { value: 0, mcse: 0 } }) } })).toEqual([
      'When the assumptions hold, analysed with least squares, the false-positive rate is 0%, not 5%.',
    ]);
  });

  it.each([
    [0.25, '25%'],
    [0.051, '5.1%'],
    [0.05, '5%'],
    [0.95, '95%'],
    [0.0004, '0.04%'],
    [0, '0%'],
  ])('percent(%s) = %s', (p, text) => expect(percent(p)).toBe(text));
});
