import { describe, expect, it } from 'vitest';
import { calculationSchema } from './request';
import { CalculationInputError } from './errors';
import { calculate } from './index';
import { clustersGrid, powerCurve } from './sensitivity';
import { expectRelativelyClose } from './testing';

const parse = (input: Record<string, unknown>) => calculationSchema.parse(input);

describe('powerCurve', () => {
  it.each([
    [{ kind: 'two-group-means', delta: 0.5, sd: 1, power: 0.8 }, 'nPerGroup'],
    [{ kind: 'regression', f2: 0.1, power: 0.9, predictors: 3 }, 'n'],
    [{ kind: 'cluster-means', delta: 0.3, sd: 1, icc: 0.05, clusterSize: 20, power: 0.8 }, 'clustersPerArm'],
    [{ kind: 'repeated-measures', delta: 0.4, sd: 1, rho: 0.6, power: 0.9 }, 'nPerGroup'],
    [{ kind: 'longitudinal-slopes', slopeDifference: 0.2, sd: 1, rho: 0.5, times: [0, 1, 2, 3], power: 0.8 }, 'nPerGroup'],
    [{ kind: 'two-proportions', p1: 0.2, p2: 0.35, power: 0.8, icc: 0.02, clusterSize: 10 }, 'nPerGroup'],
  ])('%j passes through the solved size’s achieved power and rises', (input, sizeName) => {
    const request = parse(input);
    const solved = calculate(request);
    const n = solved.result[sizeName] as number;
    const sizes = Array.from({ length: 40 }, (_, i) => Math.max(n - 20, 6) + i);
    const curve = powerCurve(request, sizes);
    expect(curve).toHaveLength(40);
    const atN = curve.find((point) => point.size === n)!;
    expectRelativelyClose(`${input.kind} at ${n}`, atN.power, solved.result.power as number, 1e-14);
    curve.slice(1).forEach((point, i) => expect(point.power).toBeGreaterThanOrEqual(curve[i]!.power));
  });

  it('with the effect left out, solves it first: the curve reaches the target at the given size', () => {
    const curve = powerCurve(parse({ kind: 'two-group-means', sd: 1, nPerGroup: 50, power: 0.8 }), [50]);
    expectRelativelyClose('power at 50', curve[0]!.power, 0.8, 1e-9);
  });

  it('refuses sizes below the kind’s minimum and design effects', () => {
    expect(() => powerCurve(parse({ kind: 'regression', f2: 0.1, power: 0.9, predictors: 3 }), [4])).toThrow(CalculationInputError);
    expect(() => powerCurve(parse({ kind: 'design-effect', icc: 0.1, clusterSize: 10 }), [10])).toThrow(CalculationInputError);
  });
});

describe('clustersGrid', () => {
  const request = parse({ kind: 'cluster-means', delta: 0.3, sd: 1, icc: 0.05, clusterSize: 20, power: 0.8 });

  it('matches the calculation in every cell and needs more clusters as the ICC grows', () => {
    if (request.kind !== 'cluster-means') throw new Error('unreachable');
    const iccs = [0, 0.01, 0.05, 0.2];
    const sizes = [1, 5, 20, 100];
    const grid = clustersGrid(request, iccs, sizes);
    expect(grid).toHaveLength(16);
    for (const cell of grid) {
      const direct = calculate(parse({ kind: 'cluster-means', delta: 0.3, sd: 1, icc: cell.icc, clusterSize: cell.clusterSize, power: 0.8 }));
      expect(cell.clustersPerArm).toBe(direct.result.clustersPerArm);
    }
    for (const m of sizes) {
      const column = grid.filter((c) => c.clusterSize === m).map((c) => c.clustersPerArm!);
      column.slice(1).forEach((k, i) => expect(k).toBeGreaterThanOrEqual(column[i]!));
    }
  });

  it('gives null where no number of clusters up to the maximum reaches the power', () => {
    if (request.kind !== 'cluster-means') throw new Error('unreachable');
    const grid = clustersGrid({ ...request, delta: 1e-5 }, [0.9], [1000]);
    expect(grid[0]!.clustersPerArm).toBeNull();
  });
});
