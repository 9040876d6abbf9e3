/**
 * Each design shape the engine simulates runs through the API end to end: POST a compact
 * specification, a worker in this process (computing on this thread) takes its chunks from
 * pg-boss, and GET answers with every analysis's measures. The shapes: binary and count
 * outcomes in clusters (with glm, glm-nb and glmm), an AB/BA cross-over with carry-over, a
 * within-subject design of 8 occasions, and two levels of clustering with the treatment at the
 * lower one — 200 replicates each (100 per scenario where there are two).
 */
import { describe, expect, it } from 'vitest';
import { METRIC_NAMES } from '@/lib/sim/metrics';
import type { SimulationSpecInput } from '@/lib/sim/spec';
import * as runs from '@/app/api/v1/simulations/route';
import { ctx, makeUser, request } from '../support/fixtures';
import { useInlineWorker, waitUntilEnded } from '../support/sim-worker';

useInlineWorker();

const SHAPES: [string, SimulationSpecInput][] = [
  [
    'binary outcome in clusters (ICC on the proportion scale)',
    {
      design: { arms: 2, clustersPerArm: 8, clusterSize: 10 },
      truth: { effect: 0.6, family: 'binary', baseline: 0.3, icc: 0.05, iccScale: 'proportion' },
      scenarios: [{ violation: 'none' }],
      analyses: ['glm', 'glmm', 'cluster-means', 'cluster-robust'],
      replicates: 200,
    },
  ],
  [
    'count outcome in clusters (gamma cluster effects, negative-binomial rows)',
    {
      design: { arms: 2, clustersPerArm: 8, clusterSize: 10 },
      truth: { effect: 0.3, family: 'count', baseline: 2, clusterCv: 0.4, clusterDistribution: 'gamma', overdispersion: 2 },
      scenarios: [{ violation: 'none' }],
      analyses: ['glm', 'glm-nb', 'glmm', 'cluster-means'],
      replicates: 200,
    },
  ],
  [
    'AB/BA cross-over with carry-over',
    {
      design: { arms: 2, unitsPerArm: 10, crossover: { periods: 2 } },
      truth: { effect: 0.5, sd: 1, occasionCorrelation: 0.6, periodEffects: [0.2] },
      scenarios: [{ violation: 'none' }, { violation: 'carry-over' }],
      analyses: ['ols', 'mixed', 'period-difference'],
      replicates: 100,
    },
  ],
  [
    'within-subject design with 8 occasions, binary outcome',
    {
      design: { arms: 2, unitsPerArm: 6, crossover: { periods: 8 } },
      truth: { effect: 0.5, family: 'binary', occasionCorrelation: 0.3 },
      scenarios: [{ violation: 'none' }],
      analyses: ['glm', 'glmm', 'mixed', 'cluster-robust'],
      replicates: 200,
    },
  ],
  [
    'two levels of clustering, treatment at the lower one',
    {
      design: { arms: 2, blocks: 4, clustersPerArm: 2, clusterSize: 6 },
      truth: { effect: 0.4, sd: 1, icc: 0.1, blockIcc: 0.1 },
      scenarios: [{ violation: 'none' }],
      analyses: ['ols', 'cluster-robust', 'mixed'],
      replicates: 200,
    },
  ],
];

describe.each(SHAPES)('a run of a %s', (_name, spec) => {
  it('completes through the queue with every measure of every analysis', async () => {
    const me = await makeUser('shapes');
    const res = await runs.POST(request('POST', '/api/v1/simulations', { user: me, body: { spec } }), ctx({}));
    const created = await res.json();
    expect(res.status, JSON.stringify(created)).toBe(202);
    const done = await waitUntilEnded(me, created.id);
    expect(done.status, done.error ?? '').toBe('done');
    expect(done.progress.replicatesDone).toBe(spec.replicates! * spec.scenarios.length);
    for (const scenario of Object.keys(done.results)) {
      expect(Object.keys(done.results[scenario])).toEqual(spec.analyses);
      for (const analysis of spec.analyses) {
        const m = done.results[scenario][analysis];
        expect(Object.keys(m).sort()).toEqual([...METRIC_NAMES].sort());
        expect(m.typeIError.value, `${scenario} ${analysis}`).toBeGreaterThanOrEqual(0);
        expect(m.typeIError.value).toBeLessThanOrEqual(1);
      }
    }
  }, 120_000);
});
