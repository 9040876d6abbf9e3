/**
 * runChecks on each demo design. Target: under 5 ms per run (reported, not asserted). Each call
 * gets a fresh copy of the design, so the per-design caches in lib/rules start empty, as they do
 * when a revision is saved.
 */
import { CLASSROOM_DESIGN, FALLS_DESIGN, GREENHOUSE_DESIGN, SLEEP_DESIGN } from '@/db/demo/designs';
import { designSchema, type Design } from '@/lib/design/schema';
import { runChecks } from '@/lib/rules/registry';
import type { Benchmark } from './run';

const DESIGNS: [string, Design][] = [
  ['classroom', designSchema.parse(CLASSROOM_DESIGN)],
  ['greenhouse', designSchema.parse(GREENHOUSE_DESIGN)],
  ['sleep', designSchema.parse(SLEEP_DESIGN)],
  ['falls', designSchema.parse(FALLS_DESIGN)],
];

export const benchmarks: Benchmark[] = DESIGNS.map(([name, design]) => ({
  name: `runChecks(${name})`,
  fn: () => runChecks(structuredClone(design)),
  iterations: 5000,
  targetMeanUs: 5000,
}));
