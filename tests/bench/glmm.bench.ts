/**
 * Per-fit time of the GLM-family analyses and per-replicate time of the data generators of the
 * design shapes added with them (lib/sim/generate.ts), on data drawn by lib/sim itself. Each
 * fit benchmark cycles through 64 data sets generated beforehand from a fixed seed, so the
 * optimisers meet varied data; each generator benchmark draws a fresh replicate per call.
 * Reported, never asserted (no targets: the figures feed the chunk cost model in
 * lib/jobs/plan.ts).
 *
 * Designs:
 * - binary clusters: 2 arms × 20 clusters × 15 (600 rows), ICC 0.05 on the proportion scale;
 * - count clusters: 2 arms × 15 clusters × 20 (600 rows), gamma cluster effects (CV 0.4),
 *   negative-binomial rows (k = 2);
 * - counts, independent: 2 × 100 units, k = 1.5;
 * - binary cross-over: ABBA/BAAB, 2 × 25 units × 4 periods (200 rows), period effects;
 * - AB/BA: 2 × 12 units × 2 periods; within-subject: 2 × 10 units × 8 periods;
 * - blocks: 8 schools × 2 classes per arm × 10 pupils (320 rows).
 *
 *   npm run bench -- glmm
 */
import { analyse, type AnalysisOptions } from '@/lib/models';
import type { AnalysisName, Dataset } from '@/lib/models/types';
import { createSimulation, generate, type Simulation } from '@/lib/sim/generate';
import { Rng } from '@/lib/sim/rng';
import { simulationSpecSchema, type SimulationSpecInput } from '@/lib/sim/spec';
import type { Benchmark } from './run';

const POOL = 64;

function simulationOf(input: Pick<SimulationSpecInput, 'design' | 'truth'> & Partial<SimulationSpecInput>): Simulation {
  return createSimulation(simulationSpecSchema.parse({ scenarios: [{ violation: 'none' }], analyses: ['ols'], replicates: 100, seed: 1, ...input }), 0);
}

const SHAPES = {
  binaryClusters: simulationOf({
    design: { arms: 2, clustersPerArm: 20, clusterSize: 15 },
    truth: { effect: 0.5, family: 'binary', baseline: 0.25, icc: 0.05, iccScale: 'proportion' },
  }),
  countClusters: simulationOf({
    design: { arms: 2, clustersPerArm: 15, clusterSize: 20 },
    truth: { effect: 0.3, family: 'count', baseline: 2, clusterCv: 0.4, clusterDistribution: 'gamma', overdispersion: 2 },
  }),
  countIndependent: simulationOf({ design: { arms: 2, unitsPerArm: 100 }, truth: { effect: 0.3, family: 'count', baseline: 3, overdispersion: 1.5 } }),
  binaryCrossover: simulationOf({
    design: { arms: 2, unitsPerArm: 25, crossover: { periods: 4 } },
    truth: { effect: 0.6, family: 'binary', baseline: 0.4, occasionCorrelation: 0.4, periodEffects: [0.2, 0, -0.2] },
  }),
  abba: simulationOf({ design: { arms: 2, unitsPerArm: 12, crossover: { periods: 2 } }, truth: { effect: 0.5, sd: 1, occasionCorrelation: 0.6, periodEffects: [0.3] } }),
  withinEight: simulationOf({ design: { arms: 2, unitsPerArm: 10, crossover: { periods: 8 } }, truth: { effect: 0.3, sd: 1, occasionCorrelation: 0.5 } }),
  blocks: simulationOf({ design: { arms: 2, blocks: 8, clustersPerArm: 2, clusterSize: 10 }, truth: { effect: 0.3, sd: 1, icc: 0.1, blockIcc: 0.1 } }),
};

/** 64 replicates of a shape, copied out of the simulation's reusable data set. */
function pool(sim: Simulation, key: string): Dataset[] {
  return Array.from({ length: POOL }, (_, r) => {
    const d = generate(sim, Rng.forReplicate(2026, `glmm.bench/${key}`, 'alternative', r), sim.spec.truth.effect);
    return { ...d, y: Float64Array.from(d.y) };
  });
}

function fit(name: string, analysis: AnalysisName, sim: Simulation, data: Dataset[], iterations: number, options?: AnalysisOptions): Benchmark {
  let i = 0;
  const opts = options ?? sim.analysisOptions[analysis];
  return { name, fn: () => analyse(analysis, data[i++ % data.length]!, sim.fixed, opts), iterations };
}

function generator(name: string, sim: Simulation, iterations: number): Benchmark {
  let r = 0;
  return { name, fn: () => generate(sim, Rng.forReplicate(2026, 'glmm.bench/generate', 'null', r++), 0), iterations };
}

const binary = pool(SHAPES.binaryClusters, 'binary');
const counts = pool(SHAPES.countClusters, 'counts');
const independent = pool(SHAPES.countIndependent, 'independent');
const crossover = pool(SHAPES.binaryCrossover, 'crossover');

export const benchmarks: Benchmark[] = [
  fit('glm logistic, binary clusters 2×20×15', 'glm', SHAPES.binaryClusters, binary, 5000),
  fit('glmm Laplace, binary clusters 2×20×15', 'glmm', SHAPES.binaryClusters, binary, 2000),
  fit('glmm AGQ 9, binary clusters 2×20×15', 'glmm', SHAPES.binaryClusters, binary, 1000, { level: 0, quadraturePoints: 9 }),
  fit('glm Poisson, count clusters 2×15×20', 'glm', SHAPES.countClusters, counts, 5000),
  fit('glm-nb, count clusters 2×15×20', 'glm-nb', SHAPES.countClusters, counts, 2000),
  fit('glmm Laplace, count clusters 2×15×20', 'glmm', SHAPES.countClusters, counts, 2000),
  fit('glm-nb, independent counts 2×100', 'glm-nb', SHAPES.countIndependent, independent, 2000),
  fit('glm logistic + periods, cross-over 2×25×4', 'glm', SHAPES.binaryCrossover, crossover, 2000),
  fit('glmm Laplace + periods, cross-over 2×25×4', 'glmm', SHAPES.binaryCrossover, crossover, 300),
  fit('glmm AGQ 9 + periods, cross-over 2×25×4', 'glmm', SHAPES.binaryCrossover, crossover, 200, { level: 0, quadraturePoints: 9 }),
  generator('generate: binary clusters 2×20×15', SHAPES.binaryClusters, 5000),
  generator('generate: count clusters, gamma + NB', SHAPES.countClusters, 5000),
  generator('generate: binary cross-over 2×25×4', SHAPES.binaryCrossover, 5000),
  generator('generate: AB/BA 2×12×2', SHAPES.abba, 20000),
  generator('generate: within-subject 2×10×8', SHAPES.withinEight, 20000),
  generator('generate: blocks 8×2×2×10', SHAPES.blocks, 10000),
];
