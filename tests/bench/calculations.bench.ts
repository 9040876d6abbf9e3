/**
 * The Plan tab recomputes on every keystroke: one calculation, a 40-point power curve and the
 * ICC × cluster-size grid. Targets (reported, not asserted): a calculation under 2 ms, the curve
 * under 10 ms, the 8 × 9 grid under 50 ms — together well inside one animation-frame budget
 * per debounced edit. Inputs are the invented classroom demo's.
 */
import { calculate } from '@/lib/stats/calculations';
import { clustersGrid, powerCurve } from '@/lib/stats/calculations/sensitivity';
import { calculationSchema, type CalculationRequest } from '@/lib/stats/calculations/request';
import type { Benchmark } from './run';

const solveClusters = calculationSchema.parse({ kind: 'cluster-means', delta: 3, sd: 10, icc: 0.15, clusterSize: 23, cv: 0.25, power: 0.8, dropout: 0.08 });
const solveN = calculationSchema.parse({ kind: 'two-group-means', delta: 3, sd: 10, power: 0.8 });
const regression = calculationSchema.parse({ kind: 'regression', f2: 0.02, testedPredictors: 2, predictors: 5, power: 0.9 });
const clusterPower = { ...solveClusters, clustersPerArm: 10, power: undefined } as CalculationRequest;
const sizes = Array.from({ length: 40 }, (_, i) => 2 + 2 * i);
const iccs = [0.01, 0.02, 0.05, 0.1, 0.15, 0.2, 0.3, 0.5];
const clusterSizes = [5, 10, 15, 20, 23, 25, 30, 40, 50];

export const benchmarks: Benchmark[] = [
  { name: 'calculate: cluster means, solve clusters per arm', fn: () => calculate(solveClusters), iterations: 500, targetMeanUs: 2000 },
  { name: 'calculate: two-group means, solve n per group', fn: () => calculate(solveN), iterations: 500, targetMeanUs: 2000 },
  { name: 'calculate: regression (noncentral F), solve n', fn: () => calculate(regression), iterations: 500, targetMeanUs: 2000 },
  { name: 'powerCurve: cluster means, 40 sizes', fn: () => powerCurve(clusterPower, sizes), iterations: 100, targetMeanUs: 10_000 },
  {
    name: 'clustersGrid: 8 ICCs × 9 cluster sizes',
    fn: () => clustersGrid(solveClusters as Extract<CalculationRequest, { kind: 'cluster-means' }>, iccs, clusterSizes),
    iterations: 30,
    targetMeanUs: 50_000,
  },
];
