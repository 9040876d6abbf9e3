/**
 * The Stress test tab's form takes its bounds and defaults from the engine's scenario schema
 * (lib/sim/spec.ts): each field of the form is compared, through the JSON Schema both generate,
 * with the engine's parameter of the same name, so a bound changed in one place only fails here.
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { formDefaults, MAX_TAB_REPLICATES, MIN_REPLICATES, runFormSchema } from '@/components/stress-test/run-form-schema';
import { scenarioSchema, simulationSpecSchema, type Violation } from '@/lib/sim/spec';

/** The form's fields that show an engine parameter on another scale. */
const SHOWN_AS: Record<string, { param: string; times: number }> = { percent: { param: 'fraction', times: 100 } };

type Bounds = { minimum?: number; exclusiveMinimum?: number; maximum?: number; exclusiveMaximum?: number; default?: unknown };

function bounds(schema: z.ZodType, times = 1): Bounds {
  const js = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as Bounds;
  const scale = (x: number | undefined) => (x === undefined ? undefined : x * times);
  return { minimum: scale(js.minimum), exclusiveMinimum: scale(js.exclusiveMinimum), maximum: scale(js.maximum), exclusiveMaximum: scale(js.exclusiveMaximum) };
}

const engineScenario = (v: string) => {
  const option = scenarioSchema.options.find((o) => o.shape.violation.value === v);
  if (!option) throw new Error(`the engine has no scenario ${v}`);
  return option.shape as Record<string, z.ZodType>;
};

const formScenarios = Object.entries(runFormSchema.shape.scenarios.shape) as [Violation, z.ZodObject][];
const fields = formScenarios.flatMap(([v, obj]) =>
  Object.entries(obj.shape as Record<string, z.ZodType>)
    .filter(([key]) => key !== 'on')
    .map(([key, field]) => ({ v, key, field, ...(SHOWN_AS[key] ?? { param: key, times: 1 }) })),
);

describe('the stress-test form and the engine agree', () => {
  it('finds the form’s parameter fields', () => {
    expect(fields.map((f) => `${f.v}.${f.key}`)).toEqual(expect.arrayContaining(['skewed.sigmaLog', 'heavy-tailed.df', 'outliers.percent', 'outliers.scale', 'unequal-variance.sdRatio', 'nonlinear.strength', 'serial.ar']));
  });

  it.each(fields.map((f) => [`${f.v}.${f.key}`, f] as const))('%s has the engine’s bounds', (_, f) => {
    const engine = engineScenario(f.v)[f.param];
    expect(engine, `${f.v}.${f.param} in lib/sim/spec.ts`).toBeDefined();
    expect(bounds(f.field)).toEqual(bounds(engine!, f.times));
  });

  it.each(fields.map((f) => [`${f.v}.${f.key}`, f] as const))('%s starts at the engine’s default', (_, f) => {
    const engineDefault = (scenarioSchema.parse({ violation: f.v }) as unknown as Record<string, number>)[f.param]!;
    const spec = simulationSpecSchema.parse({ design: { arms: 2, unitsPerArm: 20 }, truth: { effect: 0.5, sd: 1 }, scenarios: [{ violation: 'none' }], analyses: ['ols'] });
    const start = (formDefaults(spec).scenarios as unknown as Record<string, Record<string, number>>)[f.v]![f.key]!;
    expect(start).toBeCloseTo(engineDefault * f.times, 12);
  });

  it('keeps replicates and seed within the engine’s ranges', () => {
    const engine = { replicates: bounds(simulationSpecSchema.shape.replicates), seed: bounds(simulationSpecSchema.shape.seed) };
    expect(MIN_REPLICATES).toBeGreaterThanOrEqual(engine.replicates.minimum!);
    expect(MAX_TAB_REPLICATES).toBeLessThanOrEqual(engine.replicates.maximum!);
    expect(bounds(runFormSchema.shape.replicates)).toEqual({ ...engine.replicates, minimum: MIN_REPLICATES, maximum: MAX_TAB_REPLICATES });
    expect(bounds(runFormSchema.shape.seed)).toEqual(engine.seed);
  });
});
