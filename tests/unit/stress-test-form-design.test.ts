/**
 * The Stress test tab's form on designs of each outcome and shape: it offers only the scenarios
 * the engine simulates for the data (carry-over for a cross-over; only "assumptions hold" for
 * counts and yes-or-no outcomes, where the other scenarios change normal errors), keeps the
 * design's scenarios, and sends a specification the engine accepts — with the spread of the
 * units' slopes for a design whose effect is a difference in slopes.
 */
import { describe, expect, it } from 'vitest';
import { SLEEP_DESIGN } from '@/db/demo/designs';
import { designSchema, type DesignInput } from '@/lib/design/schema';
import { SHAPES } from '@/lib/design/test-shapes';
import { specFromDesign } from '@/lib/sim/from-design';
import { simulationSpecSchema, type SimulationSpec } from '@/lib/sim/spec';
import { formDefaults, offeredViolations, runFormSchema, toSpec } from '@/components/stress-test/run-form-schema';

function base(design: DesignInput): SimulationSpec {
  const out = specFromDesign(designSchema.parse(design));
  if (!out.ok) throw new Error([...out.missing, ...out.unsupported].join('; '));
  return simulationSpecSchema.parse(out.spec);
}

describe('the run form from the design', () => {
  it('sleep timing: carry-over offered and on (the design says it is possible), no serial correlation in a cross-over', () => {
    const spec = base(SLEEP_DESIGN);
    expect(offeredViolations(spec)).toEqual(['none', 'skewed', 'heavy-tailed', 'outliers', 'unequal-variance', 'nonlinear', 'carry-over']);
    const values = formDefaults(spec);
    expect(values.scenarios['carry-over']).toEqual({ on: true, percent: 50 });
    values.scenarios['carry-over'].percent = 25;
    const sent = simulationSpecSchema.parse(toSpec(spec, runFormSchema.parse(values)));
    expect(sent.scenarios.map((s) => s.violation)).toEqual(['none', 'skewed', 'outliers', 'carry-over']);
    expect(sent.scenarios.at(-1)).toEqual({ violation: 'carry-over', fraction: 0.25 });
  });

  it.each(['count outcome, clustered', 'binary outcome, clustered'] as const)('%s: only the scenario where assumptions hold, whatever the form holds', (name) => {
    const spec = base(SHAPES[name]);
    expect(offeredViolations(spec)).toEqual(['none']);
    const values = formDefaults(spec);
    values.scenarios.skewed.on = true;
    const sent = simulationSpecSchema.safeParse(toSpec(spec, runFormSchema.parse(values)));
    expect(sent.success, JSON.stringify(sent.error?.issues)).toBe(true);
    expect(sent.data?.scenarios).toEqual([{ violation: 'none' }]);
  });

  it('a difference in slopes: the SD of the units’ slopes goes into the truth', () => {
    const spec = base(SHAPES['longitudinal, trajectory of interest with random slopes planned']);
    const values = formDefaults(spec);
    expect(values.slopeSd).toBe(0);
    values.slopeSd = 0.3;
    const sent = simulationSpecSchema.parse(toSpec(spec, runFormSchema.parse(values)));
    expect(sent.truth.randomSlopeSd).toBe(0.3);
    expect(sent.design.target).toBe('treat:time');
  });
});
