/**
 * The design reader. Table-driven: every demo design and a set of design shapes, each written
 * with its counts per parent and again with its counts as study totals (`countIsTotal`), give the
 * same facts, the same checks, the same Plan and the same stress-test specification — the
 * consumers read the design only through the facts. Then the facts themselves for a few shapes.
 */
import { describe, expect, it } from 'vitest';
import { CLASSROOM_DESIGN, GREENHOUSE_DESIGN, SLEEP_DESIGN } from '@/db/demo/designs';
import { DEMO_STUDIES } from '@/db/demo/studies';
import { planFromDesign } from '@/lib/plan/from-design';
import { runChecks } from '@/lib/rules/registry';
import { specFromDesign } from '@/lib/sim/from-design';
import { designFacts, smallestArm, unitsByArm, unitsPerArm, type DesignFacts } from './facts';
import { iccLevels } from './progress';
import { designSchema, type Design, type DesignInput } from './schema';
import { shape, SHAPES, SRC as src } from './test-shapes';

const parse = (d: DesignInput): Design => designSchema.parse(d);

const DESIGNS: [string, DesignInput][] = [...DEMO_STUDIES.map((s): [string, DesignInput] => [`demo: ${s.title}`, s.design]), ...Object.entries(SHAPES)];

/**
 * The same design with the counts in `which` given as study totals: every level, or only the
 * bottom one (the top level's count is a study total either way; its flag changes nothing).
 */
function asTotals(input: DesignInput, which: 'all' | 'bottom'): DesignInput {
  const copy = structuredClone(input);
  const levels = copy.structure!.levels!;
  let parentTotal = 1;
  levels.forEach((l, i) => {
    const total = i === 0 ? l.count : l.count * parentTotal;
    if (which === 'all' || i === levels.length - 1) Object.assign(l, { count: total, countIsTotal: true });
    parentTotal = total;
  });
  return copy;
}

/** The facts without the design object, each level by its id (the counts as written differ by convention). */
function comparable(f: DesignFacts): unknown {
  return JSON.parse(JSON.stringify({ ...f, design: undefined }, (key, value) => (key === 'level' ? (value as { id: string }).id : value)));
}

function everything(d: Design) {
  const checks = runChecks(d, { onRuleError: (e) => { throw e; } });
  return { facts: comparable(designFacts(d)), findings: checks.findings, plan: planFromDesign(d, checks.recommendation), spec: specFromDesign(d) };
}

describe.each(DESIGNS)('%s in both count conventions', (_name, input) => {
  const perParent = everything(parse(input));

  it.each(['all', 'bottom'] as const)('counts of %s levels as study totals: the same facts, checks, plan request and simulation specification', (which) => {
    const totals = parse(asTotals(input, which));
    expect(totals.structure.levels.at(-1)!.countIsTotal).toBe(true);
    const got = everything(totals);
    expect(got.facts).toEqual(perParent.facts);
    expect(got.findings).toEqual(perParent.findings);
    expect(got.plan).toEqual(perParent.plan);
    expect(got.plan.request).toEqual(perParent.plan.request);
    expect(got.spec).toEqual(perParent.spec);
  });
});

describe('the classroom demo with its pupils given as a study total (500)', () => {
  const total = parse(asTotals(CLASSROOM_DESIGN, 'all'));

  it('reads 25 pupils per classroom, and 500 in all', () => {
    const f = designFacts(total);
    expect(f.levels.map((l) => [l.level.id, l.perParent, l.total])).toEqual([
      ['classroom', 20, 20],
      ['pupil', 25, 500],
    ]);
  });

  it('simulates the 23 pupils per classroom that the Plan analyses (25 planned, 8% lost by the end)', () => {
    const spec = specFromDesign(total);
    if (!spec.ok) throw new Error([...spec.missing, ...spec.unsupported].join('; '));
    expect(spec.spec.design).toEqual({ arms: 2, clustersPerArm: 10, clusterSize: 23, clusterSizeCv: 0.25 });
    const plan = planFromDesign(total, runChecks(total).recommendation);
    expect(plan.inputs).toMatchObject({ clusterSize: 23, icc: 0.15 });
    expect(plan.assumptions.find((a) => a.name === 'Pupils per classroom (planned)')?.value).toBe(25);
  });
});

describe('a total that does not split evenly between the parents', () => {
  const d = parse(
    shape(
      [
        { id: 'classroom', name: 'Classroom', kind: 'grouping', count: 21 },
        { id: 'pupil', name: 'Pupil', kind: 'independent', count: 500, countIsTotal: true },
      ],
      'classroom',
      { assumptions: { outcomeSd: { value: 10, source: src }, effect: { value: 3, source: src }, iccs: [{ levelId: 'classroom', value: 0.1, source: src }] } },
    ),
  );

  it('gives the average per parent; the stress test and the Plan both use its whole part, and the Plan says so', () => {
    expect(designFacts(d).levels[1]!.perParent).toBeCloseTo(500 / 21, 12);
    const spec = specFromDesign(d);
    if (!spec.ok) throw new Error([...spec.missing, ...spec.unsupported].join('; '));
    expect(spec.spec.design).toMatchObject({ clustersPerArm: 10, clusterSize: 23 });
    const plan = planFromDesign(d);
    expect(plan.inputs.clusterSize).toBe(23);
    expect(plan.notes.join(' ')).toMatch(/23\.8 pupils per classroom on average; the calculation uses 23/);
  });

  it('refuses a number of occasions that is not whole, naming the Structure step', () => {
    const nights = parse(
      shape(
        [
          { id: 'volunteer', name: 'Volunteer', kind: 'independent', count: 24 },
          { id: 'night', name: 'Night', kind: 'repeated', count: 100, countIsTotal: true },
        ],
        'volunteer',
        { assumptions: { outcomeSd: { value: 10, source: src }, effect: { value: 3, source: src }, iccs: [{ levelId: 'volunteer', value: 0.5, source: src }] } },
      ),
    );
    const spec = specFromDesign(nights);
    expect(spec.ok).toBe(false);
    if (!spec.ok) expect(spec.missing).toEqual(['a whole number of nights per volunteer (the structure gives 4.167 on average; Structure step)']);
  });
});

describe('the facts of each shape', () => {
  const facts = (name: string) => designFacts(parse((SHAPES as Record<string, DesignInput>)[name] ?? (name === 'greenhouse' ? GREENHOUSE_DESIGN : name === 'sleep' ? SLEEP_DESIGN : CLASSROOM_DESIGN)));

  it.each([
    ['classroom', 'classroom', 'classroom', false, undefined, ['classroom']],
    ['greenhouse', 'tray', 'tray', false, undefined, ['tray', 'plant']],
    ['sleep', 'night', 'volunteer', true, 'volunteer', ['volunteer']],
    ['two-level cluster trial', 'practice', 'practice', false, undefined, ['practice']],
    ['three levels, treatment at the top', 'school', 'school', false, undefined, ['school', 'classroom']],
    ['three levels, treatment at the middle', 'classroom', 'classroom', false, undefined, ['school', 'classroom']],
    ['AB/BA cross-over', 'period', 'patient', true, 'patient', ['patient']],
    ['within-subject comparison over 8 occasions', 'session', 'volunteer', true, 'volunteer', ['volunteer']],
    ['individually randomised, baseline and follow-up', 'patient', 'patient', false, undefined, []],
    ['count outcome, clustered', 'village', 'village', false, undefined, ['village']],
  ])('%s: assigned to %s, experimental unit %s, within units %s, subject %s, ICCs needed for %j', (name, assigned, eu, within, subject, iccLevels) => {
    const f = facts(name);
    expect(f.assignment?.level.id).toBe(assigned);
    expect(f.eu?.level.id).toBe(eu);
    expect(f.withinUnit).toBe(within);
    expect(f.subject?.level.id).toBe(subject);
    expect(f.iccLevels.map((l) => l.level.id)).toEqual(iccLevels);
  });

  it('the Assumptions step asks for the ICC of every level the Plan needs one for (the greenhouse plants too)', () => {
    expect(iccLevels(parse(GREENHOUSE_DESIGN)).map((l) => l.id)).toEqual(['tray', 'plant']);
    expect(planFromDesign(parse({ ...GREENHOUSE_DESIGN, assumptions: { ...GREENHOUSE_DESIGN.assumptions, iccs: [GREENHOUSE_DESIGN.assumptions!.iccs![0]!] } })).missing).toEqual([
      expect.objectContaining({ input: 'icc:plant', step: 'assumptions' }),
    ]);
  });

  it('reads the outcome family and its parameters', () => {
    expect(facts('count outcome, clustered').outcome).toMatchObject({
      type: 'count',
      family: 'count',
      baselineRate: { value: 0.5 },
      rateRatio: { value: 0.75 },
      followUpTime: { value: 2 },
      dispersion: { value: 0.5 },
      betweenClusterCv: { value: 0.3 },
    });
    expect(facts('binary outcome, clustered').outcome).toMatchObject({ type: 'binary', family: 'binary', controlProportion: { value: 0.3 }, proportionEffect: { measure: 'difference', value: -0.1 } });
    expect(designFacts(parse({})).outcome).toEqual({ family: 'continuous' });
  });

  it('reads the occasions in time order, with the largest attrition', () => {
    const f = facts('individually randomised, baseline and follow-up');
    expect(f.baselines.map((o) => o.label)).toEqual(['Baseline']);
    expect(f.followUps.map((o) => o.label)).toEqual(['Week 12']);
    expect(f.maxAttrition).toBe(0.1);
    expect(f.measuredOverTime).toBe(true);
    expect(f.occasionCorrelation?.value).toBe(0.6);
    expect(facts('AB/BA cross-over').crossover).toEqual({ periods: 2, carryoverPossible: false });
  });

  it('splits units between the arms in whole numbers that add up to the total', () => {
    const d = parse(shape([{ id: 'p', name: 'Patient', kind: 'independent', count: 50 }], 'p', { assignment: { kind: 'randomised', levelId: 'p', arms: [{ name: 'A', allocation: 2 }, { name: 'B', allocation: 1 }] } }));
    const f = designFacts(d);
    expect(unitsByArm(f, f.eu!)).toEqual([33, 17]);
    expect(smallestArm(f, f.eu!)).toBe(17);
    expect(unitsPerArm(f)).toBe(17);
    const odd = designFacts(parse(shape([{ id: 'p', name: 'Patient', kind: 'independent', count: 41 }], 'p')));
    expect(unitsByArm(odd, odd.eu!)).toEqual([21, 20]);
    const three = designFacts(parse(shape([{ id: 'p', name: 'Patient', kind: 'independent', count: 10 }], 'p', { assignment: { kind: 'randomised', levelId: 'p', arms: [{ name: 'A', allocation: 1 }, { name: 'B', allocation: 1 }, { name: 'C', allocation: 1 }] } })));
    expect(unitsByArm(three, three.eu!)).toEqual([4, 3, 3]);
  });

  it('tolerates a half-filled design', () => {
    const f = designFacts(parse({}));
    expect(f).toMatchObject({ levels: [], totalObs: 0, armShares: [], withinUnit: false, iccLevels: [], maxAttrition: 0, measuredOverTime: false });
    expect(f.eu).toBeUndefined();
  });
});
