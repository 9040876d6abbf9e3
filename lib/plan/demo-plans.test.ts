/**
 * The demo designs from design to answer: the inputs the Plan tab fills in, solved by the
 * calculation engine, against R's noncentral t (`fixtures/generate_demo_plans.R` →
 * `fixtures/demo_plans.json`, R version in the file). Power to 1e-6 relative, sizes exact.
 */
import { describe, expect, it } from 'vitest';
import { classroom, greenhouse, sleep } from '@/lib/rules/__fixtures__/designs';
import type { Design } from '@/lib/design/schema';
import { runChecks } from '@/lib/rules/registry';
import { calculate } from '@/lib/stats/calculations';
import { expectRelativelyClose } from './expect-close';
import { planFromDesign } from './from-design';
import fixture from './fixtures/demo_plans.json';


const DESIGNS: Record<keyof typeof fixture.plans, Design> = { classroom, greenhouse, sleep };

describe.each(Object.entries(fixture.plans))('%s demo', (name, ref) => {
  const design = DESIGNS[name as keyof typeof DESIGNS];
  const draft = planFromDesign(design, runChecks(design, { onRuleError: () => {} }).recommendation);

  it('fills the inputs R was given', () => {
    for (const [k, v] of Object.entries(ref.inputs)) expectRelativelyClose(`${name} input ${k}`, (draft.request as Record<string, unknown>)[k] as number, v, 1e-9);
    expect(draft.solveFor).toBe(ref.solvedFor);
  });

  it('solves to R’s size and power', () => {
    const out = calculate(draft.request!);
    expect(out.solvedFor).toBe(ref.solvedFor);
    expect(out.result[ref.solvedFor], `${name}: ${ref.solvedFor}`).toBe(ref.value);
    expectRelativelyClose(`${name} achieved power`, out.result.power as number, ref.power, 1e-6);
  });

  it('gives R’s power at the planned size', () => {
    expect(draft.planned).toEqual({ input: ref.solvedFor, value: ref.planned });
    const out = calculate({ ...draft.request!, [ref.solvedFor]: ref.planned, solveFor: 'power' } as typeof draft.request & object);
    expectRelativelyClose(`${name} power with the planned ${ref.planned}`, out.result.power as number, ref.plannedPower, 1e-6);
  });
});
