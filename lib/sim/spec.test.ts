import { describe, expect, it } from 'vitest';
import { defaultSequences, rowsPerDataset, scenarioKey, simulationSpecSchema, type SimulationSpecInput } from './spec';

const base: SimulationSpecInput = {
  design: { arms: 2, clustersPerArm: 10, clusterSize: 20 },
  truth: { effect: 0.3, sd: 1, icc: 0.1 },
  scenarios: [{ violation: 'none' }],
  analyses: ['ols', 'mixed'],
  replicates: 1000,
  seed: 42,
  alpha: 0.05,
};

/** The messages of a failed parse, as "path: message". */
function problems(input: unknown): string[] {
  const result = simulationSpecSchema.safeParse(input);
  expect(result.success, 'the specification should be refused').toBe(false);
  return result.success ? [] : result.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
}

describe('simulationSpecSchema', () => {
  it('fills the defaults of each scenario and of the specification', () => {
    const spec = simulationSpecSchema.parse({
      design: { arms: 2, unitsPerArm: [40, 60], occasions: 4 },
      truth: { effect: 0.2, sd: 2 },
      scenarios: [
        { violation: 'skewed' },
        { violation: 'heavy-tailed' },
        { violation: 'outliers' },
        { violation: 'unequal-variance' },
        { violation: 'nonlinear' },
        { violation: 'serial' },
      ],
      analyses: ['ols'],
    });
    expect(spec.scenarios).toEqual([
      { violation: 'skewed', sigmaLog: 0.8 },
      { violation: 'heavy-tailed', df: 3 },
      { violation: 'outliers', fraction: 0.05, scale: 5 },
      { violation: 'unequal-variance', model: 'arm', sdRatio: 2 },
      { violation: 'nonlinear', shape: 'quadratic', strength: 1 },
      { violation: 'serial', ar: 0.5 },
    ]);
    expect(spec.truth).toMatchObject({ icc: 0, occasionCorrelation: 0, randomSlopeSd: 0, family: 'gaussian' });
    expect(spec.design).toMatchObject({ clusterSizeCv: 0, target: 'treat' });
    expect([spec.replicates, spec.seed, spec.alpha]).toEqual([1000, 1, 0.05]);
    expect(spec.scenarios.map(scenarioKey)).toEqual(['skewed', 'heavy-tailed', 'outliers', 'unequal-variance', 'nonlinear', 'serial']);
  });

  it('accepts the reference cluster design', () => {
    expect(simulationSpecSchema.safeParse(base).success).toBe(true);
  });

  it.each<[string, unknown, string]>([
    ['three arms', { ...base, design: { ...base.design, arms: 3 } }, 'design.arms: Choose the arms from the options offered.'],
    ['clusters and units', { ...base, design: { ...base.design, unitsPerArm: 50 } }, 'design.unitsPerArm: Give either the clusters per arm with the cluster size, or the units per arm, not both.'],
    ['no units at all', { ...base, design: { arms: 2 }, truth: { effect: 1, sd: 1 } }, 'design.unitsPerArm: Enter the units per arm, or the clusters per arm with the cluster size.'],
    ['a cluster size without clusters', { ...base, design: { arms: 2, unitsPerArm: 10, clusterSize: 5 }, truth: { effect: 1, sd: 1 } }, 'design.clustersPerArm: Enter the clusters per arm as well as the cluster size.'],
    ['times that do not match the occasions', { ...base, design: { ...base.design, occasions: 3, times: [0, 1] } }, 'design.times: Enter one time per occasion'],
    ['times that go back', { ...base, design: { ...base.design, occasions: 3, times: [0, 2, 1] } }, 'design.times: Enter the times in increasing order'],
    ['a slope target without occasions', { ...base, design: { ...base.design, target: 'treat:time' } }, 'design.target: A difference in slopes needs occasions'],
    ['an unreachable cluster-size CV', { ...base, design: { arms: 2, clustersPerArm: 2, clusterSize: 20, clusterSizeCv: 1.5 } }, 'design.clusterSizeCv: a cluster-size CV of 1.5 cannot be reached with 2 clusters per arm'],
    ['an ICC without clusters', { ...base, design: { arms: 2, unitsPerArm: 50 } }, 'truth.icc: An intracluster correlation needs clusters'],
    ['a gaussian outcome without sd', { ...base, truth: { effect: 0.3, icc: 0.1 } }, 'truth.sd: Enter the standard deviation of the outcome.'],
    ['a random slope without occasions', { ...base, truth: { ...base.truth, randomSlopeSd: 0.1 } }, 'truth.randomSlopeSd: A spread of the slopes between units needs occasions'],
    ['ν = 2 for heavy tails', { ...base, scenarios: [{ violation: 'heavy-tailed', df: 2 }] }, 'scenarios.0.df: Enter the degrees of freedom as a number above 2, so that the errors have a finite SD.'],
    ['serial correlation without occasions', { ...base, scenarios: [{ violation: 'serial' }] }, 'scenarios.0.violation: Serial correlation needs occasions.'],
    ['an unknown violation', { ...base, scenarios: [{ violation: 'gremlins' }] }, 'violation: Choose the violation from the options offered.'],
    ['two scenarios with one name', { ...base, scenarios: [{ violation: 'outliers' }, { violation: 'outliers', scale: 10 }] }, 'scenarios.1.name: Two scenarios are called "outliers": give each a different name.'],
    ['a skewed binary outcome', { ...base, truth: { effect: 0.5, icc: 0.1, family: 'binary' }, scenarios: [{ violation: 'skewed' }] }, 'scenarios.0.violation: This scenario applies to measured outcomes'],
    ['a binary baseline of 1.5', { ...base, truth: { effect: 0.5, icc: 0.1, family: 'binary', baseline: 1.5 } }, 'truth.baseline: For a yes/no outcome, enter the baseline as a proportion between 0 and 1.'],
    ['a count baseline of 0', { ...base, truth: { effect: 0.5, icc: 0.1, family: 'count', baseline: 0 } }, 'truth.baseline: For a count outcome, enter the baseline as a mean count above 0.'],
    ['a slope target for a binary outcome', { ...base, design: { arms: 2, unitsPerArm: 50, occasions: 3, target: 'treat:time' }, truth: { effect: 0.5, family: 'binary' } }, 'design.target: For yes/no and count outcomes the stress test estimates the difference between the arms'],
    ['glm on a gaussian outcome', { ...base, analyses: ['glm'] }, 'analyses: Logistic or Poisson regression needs a yes/no or count outcome.'],
    ['an analysis named twice', { ...base, analyses: ['ols', 'ols'] }, 'analyses: Name each analysis once.'],
    ['an unknown analysis', { ...base, analyses: ['anova'] }, 'analyses.0: Choose the analyses from the options offered.'],
    ['too many replicates', { ...base, replicates: 100_001 }, 'replicates: Enter the number of replicates as a number of at most 100,000.'],
    ['too many rows', { ...base, design: { arms: 2, clustersPerArm: 100, clusterSize: 300 } }, 'design: The design has 60,000 rows per data set; at most 50,000 are simulated.'],
    ['too much work', { ...base, design: { arms: 2, clustersPerArm: 100, clusterSize: 200 }, replicates: 100_000 }, 'replicates: Replicates × scenarios × rows of data come to 4,000,000,000, more than the 500,000,000 simulated at most'],
    ['alpha above 0.5', { ...base, alpha: 0.6 }, 'alpha: Enter the significance level (alpha) as a number of at most 0.5.'],
    ['a fractional seed', { ...base, seed: 1.5 }, 'seed: Enter the random seed as a whole number.'],
  ])('refuses %s, saying what to fix', (_case, input, message) => {
    expect(problems(input).some((p) => p.includes(message)), `${JSON.stringify(problems(input))} should contain "${message}"`).toBe(true);
  });
});

describe('design shapes beyond two arms of clusters or units', () => {
  const crossover: SimulationSpecInput = {
    design: { arms: 2, unitsPerArm: 12, crossover: { periods: 2 } },
    truth: { effect: 0.5, sd: 1, occasionCorrelation: 0.6, periodEffects: [0.2] },
    scenarios: [{ violation: 'none' }, { violation: 'carry-over' }],
    analyses: ['ols', 'mixed', 'period-difference'],
  };
  const binaryClusters: SimulationSpecInput = {
    design: { arms: 2, clustersPerArm: 10, clusterSize: 20 },
    truth: { effect: 0.5, family: 'binary', baseline: 0.2, icc: 0.05, iccScale: 'proportion', marginal: true },
    scenarios: [{ violation: 'none' }],
    analyses: ['glm', 'glmm', 'cluster-means'],
  };
  const countClusters: SimulationSpecInput = {
    design: { arms: 2, clustersPerArm: 10, clusterSize: 20 },
    truth: { effect: 0.3, family: 'count', baseline: 2, clusterCv: 0.4, clusterDistribution: 'gamma', overdispersion: 2 },
    scenarios: [{ violation: 'none' }],
    analyses: ['glm', 'glm-nb', 'glmm', 'cluster-means'],
  };
  const blocked: SimulationSpecInput = {
    design: { arms: 2, blocks: 6, clustersPerArm: 2, clusterSize: 15 },
    truth: { effect: 0.3, sd: 1, icc: 0.1, blockIcc: 0.15 },
    scenarios: [{ violation: 'none' }],
    analyses: ['ols', 'mixed', 'cluster-robust'],
  };

  it('accepts an AB/BA cross-over, binary and count clusters, and blocks; fills the new defaults', () => {
    const parsed = [crossover, binaryClusters, countClusters, blocked].map((s) => simulationSpecSchema.parse(s));
    expect(parsed[0]!.scenarios[1]).toEqual({ violation: 'carry-over', fraction: 0.5 });
    expect(parsed[3]!.truth).toMatchObject({ iccScale: 'latent', marginal: false, blockIcc: 0.15, clusterDistribution: 'log-normal' });
    expect(rowsPerDataset(parsed[0]!.design)).toBe(48);
    expect(rowsPerDataset(parsed[3]!.design)).toBe(6 * 2 * 2 * 15);
  });

  it('default sequences: AB/BA, ABB/BAA, ABBA/BAAB, ABBAA/BAABB', () => {
    expect([2, 3, 4, 5].map(defaultSequences)).toEqual([['AB', 'BA'], ['ABB', 'BAA'], ['ABBA', 'BAAB'], ['ABBAA', 'BAABB']]);
  });

  it.each<[string, unknown, string]>([
    ['a cross-over of clusters', { ...crossover, design: { arms: 2, clustersPerArm: 5, clusterSize: 4, crossover: { periods: 2 } } }, 'design.crossover: A cross-over needs the units per sequence'],
    ['a cross-over with occasions', { ...crossover, design: { ...crossover.design, occasions: 2 } }, 'design.occasions: In a cross-over the periods are the occasions'],
    ['a sequence of the wrong length', { ...crossover, design: { ...crossover.design, crossover: { periods: 2, sequences: ['ABA', 'BA'] } } }, 'design.crossover.sequences.0: Each sequence is 2 letters A or B'],
    ['two equal sequences', { ...crossover, design: { ...crossover.design, crossover: { periods: 2, sequences: ['AB', 'AB'] } } }, 'design.crossover.sequences: Give two different sequences'],
    ['period effects of the wrong length', { ...crossover, truth: { ...crossover.truth, periodEffects: [0.1, 0.2] } }, 'truth.periodEffects: Enter one period effect per period after the first (1).'],
    ['period effects without a cross-over', { ...blocked, truth: { ...blocked.truth, periodEffects: [0.1] } }, 'truth.periodEffects: Leave the period effects out: they apply to a cross-over only.'],
    ['carry-over without a cross-over', { ...blocked, scenarios: [{ violation: 'carry-over' }] }, 'scenarios.0.violation: Carry-over needs a cross-over design.'],
    ['period-difference with three periods', { ...crossover, design: { ...crossover.design, crossover: { periods: 3 } }, truth: { effect: 0.5, sd: 1 } }, 'analyses: The t test on the period differences needs a two-period cross-over'],
    ['blockIcc without blocks', { ...binaryClusters, truth: { effect: 0.5, sd: 1, icc: 0.1, blockIcc: 0.1 }, analyses: ['ols'] }, 'truth.blockIcc: The intracluster correlation of the blocks needs blocks'],
    ['icc and blockIcc adding to 1', { ...blocked, truth: { ...blocked.truth, icc: 0.5, blockIcc: 0.5 } }, 'truth.blockIcc: The two intracluster correlations (clusters and blocks) together must stay below 1.'],
    ['a proportion-scale ICC for counts', { ...countClusters, truth: { effect: 0.3, family: 'count', icc: 0.1, iccScale: 'proportion' } }, 'truth.iccScale: An ICC on the proportion scale applies to yes/no outcomes only.'],
    ['a proportion-scale ICC with a second level', { ...binaryClusters, design: { ...binaryClusters.design, occasions: 3 }, truth: { ...binaryClusters.truth, occasionCorrelation: 0.3 } }, 'truth.iccScale: An ICC on the proportion scale takes one level of clusters'],
    ['clusterCv for a binary outcome', { ...binaryClusters, truth: { effect: 0.5, family: 'binary', clusterCv: 0.3 } }, 'truth.clusterCv: The variation between clusters (CV) applies to count outcomes only.'],
    ['clusterCv and icc', { ...countClusters, truth: { ...countClusters.truth, icc: 0.1 } }, 'truth.clusterCv: Describe the clusters by either the ICC or the variation between clusters (CV), not both.'],
    ['a marginal gaussian truth', { ...blocked, truth: { ...blocked.truth, marginal: true } }, 'truth.marginal: A population-average effect applies to yes/no and count outcomes only.'],
    ['glmm on a gaussian outcome', { ...blocked, analyses: ['glmm'] }, 'analyses: The logistic or Poisson mixed model needs a yes/no or count outcome'],
    ['glmm without anything to group', { ...binaryClusters, design: { arms: 2, unitsPerArm: 50 }, truth: { effect: 0.5, family: 'binary' } }, 'analyses: The logistic or Poisson mixed model needs clusters, occasions, blocks or a cross-over'],
    ['glm-nb on a binary outcome', { ...binaryClusters, analyses: ['glm-nb'] }, 'analyses: Negative-binomial regression needs a count outcome'],
    ['cluster slopes without occasions', { ...blocked, truth: { ...blocked.truth, clusterSlopeSd: 0.1 } }, 'truth.clusterSlopeSd: A spread of the slopes between clusters needs clusters measured at occasions'],
  ])('refuses %s, saying what to fix', (_case, input, message) => {
    expect(problems(input).some((p) => p.includes(message)), `${JSON.stringify(problems(input))} should contain "${message}"`).toBe(true);
  });
});

describe('truths the generator could not build are refused up front', () => {
  const binary = { design: { arms: 2, clustersPerArm: 10, clusterSize: 20 }, scenarios: [{ violation: 'none' }], analyses: ['glm'] };
  it('a marginal log odds ratio that pushes the second arm to 0 or 1', () => {
    expect(problems({ ...binary, truth: { effect: 40, family: 'binary', baseline: 0.3, marginal: true } })).toContain(
      'truth.effect: With a population-average effect the second arm’s proportion must stay between 0 and 1: enter a smaller log odds ratio (logit of the baseline plus the effect within ±30).',
    );
  });

  it('a proportion-scale ICC that no logit-normal spread reaches at this baseline', () => {
    const p = problems({ ...binary, truth: { effect: 0.5, family: 'binary', baseline: 1e-300, icc: 0.99, iccScale: 'proportion' } });
    expect(p.some((m) => m.startsWith('truth.icc: An ICC of 0.99 on the proportion scale cannot be reached')), JSON.stringify(p)).toBe(true);
  });
});
