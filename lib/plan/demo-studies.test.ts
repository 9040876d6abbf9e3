/**
 * Every demo study (db/demo/studies.ts) shows a full Plan: from its design, through the checks'
 * recommendation and the Plan's request builder, to a calculated result with nothing missing, and
 * every number it takes from the Assumptions step has a source. The falls-prevention study is
 * also checked against Hayes & Bennett's formula worked by hand (lib/stats/calculations/
 * cluster-rates.ts states it; rates-proportions.test.ts checks the engine against R).
 */
import { describe, expect, it } from 'vitest';
import { DEMO_STUDIES } from '@/db/demo/studies';
import { designSchema } from '@/lib/design/schema';
import { runChecks } from '@/lib/rules/registry';
import { calculate } from '@/lib/stats/calculations';
import { expectRelativelyClose } from './expect-close';
import { planFromDesign } from './from-design';

const DESIGN_SOURCES = new Set(['published', 'pilot', 'expert', 'none']);

function plan(title: string) {
  const study = DEMO_STUDIES.find((s) => s.title === title)!;
  const design = designSchema.parse(study.design);
  return planFromDesign(design, runChecks(design, { onRuleError: (id, e) => { throw new Error(`${id}: ${String(e)}`); } }).recommendation);
}

describe.each(DEMO_STUDIES.map((s) => [s.title]))('%s', (title) => {
  const draft = plan(title);

  it('has a calculation with no missing input', () => {
    expect(draft.missing).toEqual([]);
    expect(draft.kind).not.toBeNull();
    expect(draft.request).not.toBeNull();
    expect(draft.planned?.value).toBeGreaterThan(0);
  });

  it('calculates a result for what it solves for, and reaches the target power', () => {
    const out = calculate(draft.request!);
    expect(out.solvedFor).toBe(draft.solveFor);
    const value = out.result[draft.solveFor!];
    expect(typeof value === 'number' && Number.isFinite(value) && value > 0, `${draft.solveFor} = ${String(value)}`).toBe(true);
    expect(out.result.power as number).toBeGreaterThanOrEqual((draft.inputs.power as number) - 1e-9);
  });

  it('gives a source, other than none, for every number from the Assumptions step', () => {
    const fromAssumptions = draft.assumptions.filter((a) => DESIGN_SOURCES.has(a.source.kind));
    expect(fromAssumptions.length).toBeGreaterThan(0);
    for (const a of fromAssumptions) expect(a.source.kind, a.name).not.toBe('none');
  });
});

describe('the falls-prevention study', () => {
  const draft = plan('Falls-prevention programme, randomised by care home');

  it('plans care homes per arm from the rate-ratio inputs of its Assumptions step', () => {
    expect(draft.kind).toBe('cluster-rates');
    expect(draft.solveFor).toBe('clustersPerArm');
    expect(draft.labels).toEqual({ size: 'care homes per arm', member: 'residents per care home' });
    // 30 residents per home, 25% leave before the end: 22 analysed.
    expect(draft.inputs).toEqual({ alpha: 0.05, power: 0.8, dropout: 0.25, baselineRate: 1.8, exposure: 1, dispersion: 0.8, betweenClusterCv: 0.3, clusterSize: 22, rateRatio: 0.7 });
    expect(draft.planned).toEqual({ input: 'clustersPerArm', value: 20 });
  });

  it('needs 22 care homes per arm, two more than the 20 planned (Hayes & Bennett 1999, worked by hand)', () => {
    // λ0 = 1.8, λ1 = 1.26, y = 22 resident-years per home, κ = 0.8, k = 0.3:
    // V = 3.06/22 + 0.8 × (1.8² + 1.26²)/22 + 0.3² × (1.8² + 1.26²) = 0.749124;
    // c = 1 + (1.959964 + 0.841621)² × V / 0.54² = 21.16 → 22; power at 22 = Φ(0.54·√(21/V) − 1.959964) = 0.8157.
    const out = calculate(draft.request!);
    expect(out.result.clustersPerArm).toBe(22);
    expectRelativelyClose('power with 22 care homes per arm', out.result.power as number, 0.8157, 1e-3);
    // With the 20 planned: Φ(0.54·√(19/V) − 1.959964) = 0.776.
    const planned = calculate({ ...draft.request!, clustersPerArm: 20, solveFor: 'power' } as typeof draft.request & object);
    expectRelativelyClose('power with the 20 planned', planned.result.power as number, 0.776, 2e-3);
  });
});
