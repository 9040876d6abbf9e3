/**
 * The axes and colours of the Plan tab's sensitivity views. Contrast ratios are checked against
 * the WCAG 2 definition and its published example values (white on black is 21:1; #767676 on
 * white is the well-known 4.54:1 grey — from memory, and recomputed here from the definition).
 */
import { describe, expect, it } from 'vitest';
import { clusterSizeAxis, contrast, costCurve, costCurveSizes, curveSizes, HEAT_COLOURS, heatStep, iccAxis, INK, niceTicks, textOn, WHITE } from './sensitivity';

describe('curveSizes', () => {
  it.each([
    [[35, 10]],
    [[2]],
    [[400, undefined]],
    [[undefined]],
  ])('starts at 2, is increasing, and includes the marked sizes %j', (marked) => {
    const s = curveSizes(marked);
    expect(s[0]).toBe(2);
    for (let i = 1; i < s.length; i++) expect(s[i]!).toBeGreaterThan(s[i - 1]!);
    for (const m of marked) if (m !== undefined) expect(s).toContain(m);
    expect(s.length).toBeLessThanOrEqual(45);
    expect(s.at(-1)!).toBeGreaterThanOrEqual(Math.max(10, ...marked.filter((x): x is number => x !== undefined)));
  });
});

describe('heat map axes', () => {
  it('adds the current ICC and cluster size to the ladders, sorted', () => {
    expect(iccAxis(0.15)).toEqual([0.01, 0.02, 0.05, 0.1, 0.15, 0.2, 0.3]);
    expect(iccAxis(0.07)).toEqual([0.01, 0.02, 0.05, 0.07, 0.1, 0.15, 0.2, 0.3]);
    expect(clusterSizeAxis(23)).toEqual([5, 10, 15, 20, 23, 25, 30, 40, 50]);
    expect(clusterSizeAxis(0)).toEqual([5, 10, 15, 20, 25, 30, 40, 50]);
  });
});

describe('colour scale', () => {
  it('computes WCAG contrast: white on black 21, ink on white above 7', () => {
    expect(contrast('#ffffff', '#000000')).toBeCloseTo(21, 10);
    expect(contrast('#767676', '#ffffff')).toBeCloseTo(4.54, 2);
    expect(contrast(INK, WHITE)).toBeGreaterThan(7);
  });
  it.each(HEAT_COLOURS.map((c) => [c]))('the number printed on %s has contrast of at least 4.5:1', (bg) => {
    const fg = textOn(bg);
    const c = contrast(fg, bg);
    expect(c, `text ${fg} on ${bg}: contrast ${c.toFixed(2)}, needs 4.5`).toBeGreaterThanOrEqual(4.5);
  });
  it('places values on a log scale between the grid’s smallest and largest', () => {
    expect(heatStep(5, 5, 500)).toBe(0);
    expect(heatStep(500, 5, 500)).toBe(HEAT_COLOURS.length - 1);
    expect(heatStep(50, 5, 500)).toBe(3);
    expect(heatStep(7, 7, 7)).toBe(0);
  });
});

describe('cost curve', () => {
  it('costs 2k(c_cluster + m c_unit) and keeps unreachable cells empty', () => {
    expect(costCurve([{ clusterSize: 10, clustersPerArm: 12 }, { clusterSize: 20, clustersPerArm: null }], 500, 20)).toEqual([
      { clusterSize: 10, clustersPerArm: 12, cost: 2 * 12 * (500 + 200) },
      { clusterSize: 20, clustersPerArm: null, cost: null },
    ]);
  });
  it('spans 1 to beyond the optimum, including it', () => {
    const s = costCurveSizes(12.4);
    expect(s[0]).toBe(1);
    expect(s).toContain(12);
    expect(s.at(-1)!).toBeGreaterThanOrEqual(37);
    expect(s.length).toBeLessThanOrEqual(42);
  });
});

describe('niceTicks', () => {
  it.each([
    [2, 58, [2, 10, 20, 30, 40, 50]],
    [2, 10, [2, 4, 6, 8, 10]],
    [1, 37, [1, 5, 10, 15, 20, 25, 30, 35]],
    [5, 5, [5]],
  ])('%d to %d → %j', (min, max, want) => expect(niceTicks(min, max)).toEqual(want));
});
