/**
 * What the Plan tab's sensitivity views plot, chosen from the calculation being shown: the sizes
 * on the power curve, the ICC and cluster-size axes of the heat map, its colour scale (with a
 * text colour that keeps every printed number readable), and the cost curve of the budget view.
 * Pure; the power values themselves come from lib/stats/calculations/sensitivity.ts.
 */

/**
 * Whole sizes for a power curve from 2 up to beyond every marked size (the solved one, the
 * planned one): about `points` evenly spaced values, always including the marked ones.
 */
export function curveSizes(marked: readonly (number | undefined)[], points = 40): number[] {
  const given = marked.filter((x): x is number => x !== undefined && Number.isFinite(x) && x >= 2).map((x) => Math.round(x));
  const top = Math.max(10, ...given.map((x) => Math.ceil(x * 1.6)));
  const step = Math.max(1, Math.ceil((top - 2) / (points - 1)));
  const sizes = new Set<number>(given);
  for (let s = 2; s <= top; s += step) sizes.add(s);
  sizes.add(top);
  return [...sizes].sort((a, b) => a - b);
}

const ICC_STEPS = [0.01, 0.02, 0.05, 0.1, 0.15, 0.2, 0.3] as const;
const SIZE_STEPS = [5, 10, 15, 20, 25, 30, 40, 50] as const;

/** ICCs for the heat map: a fixed ladder over the range seen in practice, with the current one added. */
export function iccAxis(current: number): number[] {
  const set = new Set<number>(ICC_STEPS);
  if (current > 0 && current < 1) set.add(Number(current.toPrecision(6)));
  return [...set].sort((a, b) => a - b);
}

/** Cluster sizes for the heat map: a fixed ladder, with the current size added. */
export function clusterSizeAxis(current: number): number[] {
  const set = new Set<number>(SIZE_STEPS);
  if (Number.isInteger(current) && current >= 1) set.add(current);
  return [...set].sort((a, b) => a - b);
}

// ---------------------------------------------------------------- colour

/** Sequential blues, light to dark. */
export const HEAT_COLOURS = ['#eef4fa', '#cfe1f0', '#a6c8e3', '#6fa3cf', '#2f6f9f', '#1f5f8b', '#123a57'] as const;
export const INK = '#172033';
export const WHITE = '#ffffff';

function channel(c: number): number {
  const s = c / 255;
  return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
}

/** WCAG 2 relative luminance of a #rrggbb colour. */
export function luminance(hex: string): number {
  const n = Number.parseInt(hex.slice(1), 16);
  return 0.2126 * channel((n >> 16) & 255) + 0.7152 * channel((n >> 8) & 255) + 0.0722 * channel(n & 255);
}

/** WCAG 2 contrast ratio of two colours (1 to 21). */
export function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x) as [number, number];
  return (hi + 0.05) / (lo + 0.05);
}

/** The text colour (ink or white) with the higher contrast on `background`. */
export function textOn(background: string): string {
  return contrast(INK, background) >= contrast(WHITE, background) ? INK : WHITE;
}

/**
 * The colour step of a value on a log scale between the smallest and largest values of the
 * grid (clusters needed grow roughly multiplicatively with the ICC): 0 for the smallest.
 */
export function heatStep(value: number, min: number, max: number, steps = HEAT_COLOURS.length): number {
  if (!(max > min)) return 0;
  const t = (Math.log(value) - Math.log(min)) / (Math.log(max) - Math.log(min));
  return Math.min(steps - 1, Math.max(0, Math.floor(t * steps)));
}

// ---------------------------------------------------------------- budget

export interface CostPoint {
  clusterSize: number;
  clustersPerArm: number | null;
  /** 2 × clusters per arm × (cost per cluster + cluster size × cost per unit); null when unreachable. */
  cost: number | null;
}

/** Total cost of reaching the target at each cluster size, from the clusters each needs. */
export function costCurve(cells: readonly { clusterSize: number; clustersPerArm: number | null }[], costPerCluster: number, costPerUnit: number): CostPoint[] {
  return cells.map(({ clusterSize, clustersPerArm }) => ({
    clusterSize,
    clustersPerArm,
    cost: clustersPerArm === null ? null : 2 * clustersPerArm * (costPerCluster + clusterSize * costPerUnit),
  }));
}

/** Cluster sizes for the cost curve: 1 up to about three times the optimum (at least 30), at most `points` of them. */
export function costCurveSizes(optimum: number, points = 40): number[] {
  const top = Math.max(30, Math.ceil(optimum * 3));
  const step = Math.max(1, Math.ceil(top / points));
  const sizes = new Set<number>([1, Math.max(1, Math.round(optimum))]);
  for (let m = step; m <= top; m += step) sizes.add(m);
  return [...sizes].sort((a, b) => a - b);
}

/** Round axis ticks from `min` to `max`: steps of 1, 2 or 5 × 10^k, about `count` of them (fewer than count + 2 intervals), starting at `min`. */
export function niceTicks(min: number, max: number, count = 6): number[] {
  if (!(max > min)) return [min];
  const span = max - min;
  const power = 10 ** Math.floor(Math.log10(span / count));
  // The finest 1-2-5 step that gives fewer than count + 2 intervals.
  const step = [1, 2, 5, 10, 20].map((m) => m * power).find((s) => span / s < count + 2) ?? 20 * power;
  const ticks = [min];
  for (let t = Math.ceil(min / step) * step; t <= max; t += step) if (t > min) ticks.push(t);
  return ticks;
}
