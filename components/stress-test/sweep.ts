/**
 * The size sweep behind "Run at other sizes": the run's specification again at other numbers of
 * clusters (or units) per arm, for a power curve by simulation. Plain functions, usable on the
 * server (the page picks the run to show by its size) and in the browser.
 */
import type { SimulationSpec, SimulationSpecInput } from '@/lib/sim/spec';

/** Sizes tried besides the run's own: multiples of its clusters (or units) per arm. */
export const SWEEP_FACTORS = [0.5, 1.5, 2] as const;

/** The run's size per arm: clusters per arm, or units per arm (the first arm's when they differ). */
export function sizeOf(spec: SimulationSpec): number {
  const d = spec.design;
  if (d.clustersPerArm !== undefined) return d.clustersPerArm;
  return typeof d.unitsPerArm === 'number' ? d.unitsPerArm : (d.unitsPerArm?.[0] ?? 0);
}

/** The scenario a size sweep uses: "assumptions hold" when the run has it, else the run's first. */
export function sweepScenario(spec: SimulationSpec): SimulationSpec['scenarios'][number] {
  return spec.scenarios.find((s) => s.violation === 'none') ?? spec.scenarios[0]!;
}

/**
 * The specifications of the sweep: the run's with one scenario and the clusters (or units) per
 * arm multiplied by each factor, rounded, at least 2; sizes equal to the run's own are left out.
 */
export function sweepSpecs(spec: SimulationSpec): { size: number; spec: SimulationSpecInput }[] {
  const base = sizeOf(spec);
  const scenario = sweepScenario(spec);
  const seen = new Set([base]);
  const out: { size: number; spec: SimulationSpecInput }[] = [];
  for (const f of SWEEP_FACTORS) {
    const size = Math.max(2, Math.round(base * f));
    if (seen.has(size)) continue;
    seen.add(size);
    const d = spec.design;
    const design =
      d.clustersPerArm !== undefined
        ? { ...d, clustersPerArm: size }
        : { ...d, unitsPerArm: typeof d.unitsPerArm === 'number' || d.unitsPerArm === undefined ? size : ([Math.max(2, Math.round(d.unitsPerArm[0] * f)), Math.max(2, Math.round(d.unitsPerArm[1] * f))] as [number, number]) };
    out.push({ size, spec: { ...spec, design, scenarios: [scenario] } });
  }
  return out;
}
