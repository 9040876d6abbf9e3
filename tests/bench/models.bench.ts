/**
 * The estimators of lib/models on the stress test's reference design: two arms, 10 clusters per
 * arm × 20 pupils (400 rows), ICC 0.1. Target for the whole stress-test replicate (ols, ols-hc3,
 * cluster-robust, cluster-means and mixed) is 200 µs on this machine (10,000 replicates in 2 s);
 * the four fixed-effect analyses together aim at well under 50 µs. Each call takes the next of
 * 64 data sets drawn beforehand with a seeded generator, so no call sees data already in cache
 * from the previous one.
 */
import seedrandom from 'seedrandom';
import { fitClusterMeans } from '@/lib/models/cluster-means';
import { fitClusterRobust } from '@/lib/models/cr2';
import { fitGlm } from '@/lib/models/glm';
import { fitOlsHc3 } from '@/lib/models/hc3';
import { fitHuber } from '@/lib/models/huber';
import { fitLogOls } from '@/lib/models/log-ols';
import { fitOls } from '@/lib/models/ols';
import type { Dataset, EffectEstimate, FixedEffects } from '@/lib/models/types';
import type { Benchmark } from './run';

const CLUSTERS = 20;
const SIZE = 20;
const ICC = 0.1;
const SETS = 64;

function normal(rng: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
}

function referenceDesign(rng: () => number): Dataset {
  const n = CLUSTERS * SIZE;
  const y = new Float64Array(n);
  const treat = new Float64Array(n);
  const id = new Int32Array(n);
  const x = new Float64Array(n);
  for (let g = 0; g < CLUSTERS; g++) {
    const u = Math.sqrt(ICC) * normal(rng);
    for (let k = 0; k < SIZE; k++) {
      const i = g * SIZE + k;
      treat[i] = g < CLUSTERS / 2 ? 0 : 1;
      id[i] = g;
      x[i] = normal(rng);
      y[i] = 0.2 * treat[i]! + 0.5 * x[i]! + u + Math.sqrt(1 - ICC) * normal(rng);
    }
  }
  return { n, y, treat, covariates: { x }, groups: [{ name: 'classroom', id, count: CLUSTERS }] };
}

const rng = seedrandom('models.bench');
const DATA = Array.from({ length: SETS }, () => referenceDesign(rng));
const POSITIVE = DATA.map((d) => ({ ...d, y: d.y.map((v) => Math.exp(v)) }));
const BINARY = DATA.map((d) => ({ ...d, y: d.y.map((v) => (v > 0.1 ? 1 : 0)) }));

const TWO_ARM: FixedEffects = { covariates: [], includeTime: false, target: 'treat' };
const ADJUSTED: FixedEffects = { covariates: ['x'], includeTime: false, target: 'treat' };

function cycling(sets: Dataset[], fit: (d: Dataset) => EffectEstimate): () => EffectEstimate {
  let i = 0;
  return () => fit(sets[i++ % sets.length]!);
}

const bench = (name: string, fn: () => unknown, targetMeanUs?: number): Benchmark => ({
  name,
  fn,
  iterations: 20_000,
  ...(targetMeanUs !== undefined ? { targetMeanUs } : {}),
});

export const benchmarks: Benchmark[] = [
  bench('ols (two arms)', cycling(DATA, (d) => fitOls(d, TWO_ARM))),
  bench('ols-hc3 (two arms)', cycling(DATA, (d) => fitOlsHc3(d, TWO_ARM))),
  bench('cluster-robust (two arms)', cycling(DATA, (d) => fitClusterRobust(d, TWO_ARM))),
  bench('cluster-means (two arms)', cycling(DATA, (d) => fitClusterMeans(d, TWO_ARM))),
  bench(
    'the four together (two arms)',
    cycling(DATA, (d) => {
      fitOls(d, TWO_ARM);
      fitOlsHc3(d, TWO_ARM);
      fitClusterRobust(d, TWO_ARM);
      return fitClusterMeans(d, TWO_ARM);
    }),
    50,
  ),
  bench('ols (QR path)', cycling(DATA, (d) => fitOls(d, TWO_ARM, { general: true }))),
  bench('ols-hc3 (QR path)', cycling(DATA, (d) => fitOlsHc3(d, TWO_ARM, { general: true }))),
  bench('cluster-robust (QR path)', cycling(DATA, (d) => fitClusterRobust(d, TWO_ARM, { general: true }))),
  bench('cluster-means (general path)', cycling(DATA, (d) => fitClusterMeans(d, TWO_ARM, { general: true }))),
  bench('ols + covariate', cycling(DATA, (d) => fitOls(d, ADJUSTED))),
  bench('cluster-robust + covariate', cycling(DATA, (d) => fitClusterRobust(d, ADJUSTED))),
  bench('huber (two arms)', cycling(DATA, (d) => fitHuber(d, TWO_ARM))),
  bench('log-ols (two arms)', cycling(POSITIVE, (d) => fitLogOls(d, TWO_ARM))),
  bench('glm logistic (two arms)', cycling(BINARY, (d) => fitGlm(d, TWO_ARM))),
];
