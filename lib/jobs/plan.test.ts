import { describe, expect, it } from 'vitest';
import { simulationSpecSchema, type SimulationSpecInput } from '@/lib/sim/spec';
import { MAX_CHUNKS_PER_SCENARIO, chooseChunkSize, planChunks, replicatesTotal, rowsPerDataset, secondsPerReplicate } from './plan';

const spec = (over: Partial<SimulationSpecInput> = {}) =>
  simulationSpecSchema.parse({
    design: { arms: 2, clustersPerArm: 10, clusterSize: 20 },
    truth: { effect: 0.5, sd: 1, icc: 0.1 },
    scenarios: [{ violation: 'none' }, { violation: 'skewed' }],
    analyses: ['ols', 'mixed'],
    replicates: 1000,
    ...over,
  });

describe('rowsPerDataset', () => {
  it.each([
    { design: { arms: 2, clustersPerArm: 10, clusterSize: 20 }, rows: 400 },
    { design: { arms: 2, unitsPerArm: [30, 20] }, rows: 50 },
    { design: { arms: 2, unitsPerArm: 25, occasions: 4 }, rows: 200 },
    { design: { arms: 2, clustersPerArm: 3, clusterSize: 5, occasions: 2 }, rows: 60 },
  ] as const)('$rows rows for $design', ({ design, rows }) => {
    const s = spec({ design: design as SimulationSpecInput['design'], truth: { effect: 1, sd: 1 }, scenarios: [{ violation: 'none' }] });
    expect(rowsPerDataset(s.design)).toBe(rows);
  });
});

describe('planChunks', () => {
  it.each([1, 3, 7, 1000, 5000])('tiles every scenario with chunks of at most %i, in replicate order', (size) => {
    const s = spec();
    const chunks = planChunks(s, Math.min(size, s.replicates));
    for (const scenarioIndex of [0, 1]) {
      const own = chunks.filter((c) => c.scenarioIndex === scenarioIndex);
      expect(own.map((c) => c.chunkIndex)).toEqual(own.map((_, i) => i));
      expect(own[0]!.from).toBe(0);
      own.forEach((c, i) => {
        expect(c.to - c.from).toBeGreaterThan(0);
        expect(c.to - c.from).toBeLessThanOrEqual(size);
        if (i > 0) expect(c.from).toBe(own[i - 1]!.to);
      });
      expect(own[own.length - 1]!.to).toBe(1000);
    }
    expect(chunks.reduce((n, c) => n + c.to - c.from, 0)).toBe(replicatesTotal(s));
  });

  it('refuses a chunk size below 1', () => {
    expect(() => planChunks(spec(), 0)).toThrow(/at least 1/);
  });
});

describe('chooseChunkSize', () => {
  it('gives bigger chunks to cheaper replicates, within 1 … replicates', () => {
    const cheap = spec({ analyses: ['ols'] });
    const dear = spec({ analyses: ['ols', 'cluster-robust', 'mixed', 'huber'] });
    expect(secondsPerReplicate(dear)).toBeGreaterThan(secondsPerReplicate(cheap));
    expect(chooseChunkSize(cheap, 0.3)).toBeGreaterThan(chooseChunkSize(dear, 0.3));
    expect(chooseChunkSize(dear, 1e-9)).toBe(2); // 1,000 replicates in at most 500 chunks
    expect(chooseChunkSize(spec({ replicates: 400 }), 1e-9)).toBe(1);
    expect(chooseChunkSize(cheap, 1e9)).toBe(1000);
  });

  it('keeps the number of chunks per scenario bounded', () => {
    const huge = spec({ replicates: 100_000, analyses: ['ols', 'cluster-robust', 'cluster-means', 'mixed', 'huber'] });
    const size = chooseChunkSize(huge, 1e-6);
    expect(Math.ceil(100_000 / size)).toBeLessThanOrEqual(MAX_CHUNKS_PER_SCENARIO);
  });
});
