/**
 * The `mixed` analysis (REML) per replicate, on the stress test's reference designs. Target for
 * the cluster design: about 100 µs per fit, so that five analyses of 10,000 replicates fit in
 * 2 s on two cores (reported, not asserted).
 *
 * - cluster: two arms × 10 clusters × 20 pupils, ICC 0.1 (400 rows): the one-level fast path;
 * - greenhouse: two arms × 4 trays × 5 plants × 4 leaves, tray and plant random intercepts;
 * - sleep: two arms × 10 volunteers × 8 nights, random intercept and slope, target treat:time.
 *
 * Each benchmark cycles through 64 data sets drawn before timing from a fixed seed (lib/sim's
 * generator), so the optimiser meets varied data.
 */
import { fitMixed } from '@/lib/models/mixed';
import type { Dataset, FixedEffects } from '@/lib/models/types';
import { Rng } from '@/lib/sim/rng';
import type { Benchmark } from './run';

const POOL = 64;

/** Rows in nested order: levels[k] units per parent, the first level split between two arms. */
function nestedDataset(rng: Rng, counts: number[], sds: number[], residualSd: number, effect: number): Dataset {
  const n = counts.reduce((a, b) => a * b, 1);
  const y = new Float64Array(n);
  const treat = new Float64Array(n);
  const ids = counts.slice(0, -1).map(() => new Int32Array(n));
  const effects = sds.map(() => 0);
  const perUnit = counts.map((_, k) => counts.slice(k + 1).reduce((a, b) => a * b, 1));
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < counts.length - 1; k++) {
      const id = Math.floor(i / perUnit[k]!);
      ids[k]![i] = id;
      if (i % perUnit[k]! === 0) effects[k] = sds[k]! * rng.normal();
    }
    treat[i] = ids[0]![i]! < counts[0]! / 2 ? 0 : 1;
    y[i] = effect * treat[i]! + effects.reduce((a, b) => a + b, 0) + residualSd * rng.normal();
  }
  const groups = ids.map((id, k) => ({ name: `level${k}`, id, count: n / perUnit[k]! }));
  return { n, y, treat, groups };
}

function sleepDataset(rng: Rng): Dataset {
  const volunteers = 20;
  const nights = 8;
  const n = volunteers * nights;
  const y = new Float64Array(n);
  const treat = new Float64Array(n);
  const time = new Float64Array(n);
  const id = new Int32Array(n);
  for (let v = 0; v < volunteers; v++) {
    const b0 = 20 * rng.normal();
    const b1 = 4 * rng.normal();
    for (let t = 0; t < nights; t++) {
      const i = v * nights + t;
      id[i] = v;
      treat[i] = v < volunteers / 2 ? 0 : 1;
      time[i] = t;
      y[i] = 250 + b0 + (10 + b1 - 3 * treat[i]!) * t + 25 * rng.normal();
    }
  }
  return { n, y, treat, time, groups: [{ name: 'volunteer', id, count: volunteers }] };
}

function pool(make: (rng: Rng) => Dataset, key: string): Dataset[] {
  const rng = Rng.fromKey(`mixed.bench/${key}`);
  return Array.from({ length: POOL }, () => make(rng));
}

function cycling(name: string, data: Dataset[], fixed: FixedEffects, options: Parameters<typeof fitMixed>[2], iterations: number, targetMeanUs?: number): Benchmark {
  let i = 0;
  return {
    name,
    fn: () => fitMixed(data[i++ % data.length]!, fixed, options),
    iterations,
    ...(targetMeanUs !== undefined ? { targetMeanUs } : {}),
  };
}

const TREAT: FixedEffects = { covariates: [], includeTime: false, target: 'treat' };
const SLOPES: FixedEffects = { covariates: [], includeTime: true, target: 'treat:time' };

// ICC 0.1 with total variance 1: σ_u² = 0.1, σ² = 0.9.
const cluster = pool((rng) => nestedDataset(rng, [20, 20], [Math.sqrt(0.1)], Math.sqrt(0.9), 0.3), 'cluster');
const greenhouse = pool((rng) => nestedDataset(rng, [8, 5, 4], [0.5, 0.7], 1, 0.5), 'greenhouse');
const sleep = pool(sleepDataset, 'sleep');

export const benchmarks: Benchmark[] = [
  cycling('mixed cluster 20×20, Satterthwaite', cluster, TREAT, {}, 10000, 100),
  cycling('mixed cluster 20×20, between-within', cluster, TREAT, { df: 'between-within' }, 10000, 100),
  cycling('mixed greenhouse 8×5×4, Satterthwaite', greenhouse, TREAT, {}, 1000),
  cycling('mixed sleep 20×8 slope, Satterthwaite', sleep, SLOPES, {}, 1000),
];
