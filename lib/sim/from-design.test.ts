import { describe, expect, it } from 'vitest';
import { CLASSROOM_DESIGN, GREENHOUSE_DESIGN, SLEEP_DESIGN } from '@/db/demo/designs';
import { designSchema, type DesignInput } from '@/lib/design/schema';
import { SHAPES } from '@/lib/design/test-shapes';
import { simulationSpecSchema } from './spec';
import { describeSimulation, plannedAnalysis, sizeWords, specFromDesign } from './from-design';

const parse = (d: DesignInput) => designSchema.parse(d);

describe.each([
  {
    name: 'classroom (cluster-randomised, one follow-up after a baseline)',
    design: CLASSROOM_DESIGN,
    spec: {
      // 25 pupils per classroom less the 8% lost by the follow-up: the 23 the Plan analyses.
      design: { arms: 2, clustersPerArm: 10, clusterSize: 23, clusterSizeCv: 0.25 },
      truth: { effect: 3, sd: 10, icc: 0.15 },
      scenarios: [{ violation: 'none' }],
      analyses: ['ols', 'cluster-robust', 'cluster-means', 'mixed'],
    },
  },
  {
    name: 'greenhouse (trays randomised, leaves of plants as sub-samples)',
    design: GREENHOUSE_DESIGN,
    spec: {
      // Leaf ICC share: 0.4 / (1 − 0.2) = 0.5 of the variance left after the trays.
      // 6 plants per tray less the 5% lost: the 5 the Plan analyses.
      design: { arms: 2, clustersPerArm: 6, clusterSize: 5, clusterSizeCv: 0, occasions: 4 },
      truth: { effect: 2, sd: 4.5, icc: 0.2, occasionCorrelation: 0.5 },
      scenarios: [{ violation: 'none' }, { violation: 'skewed' }, { violation: 'unequal-variance' }],
      // No log-ols although the outcome is right-skewed: the simulated outcome is normal and can
      // be 0 or negative, where a log is undefined (it failed all 2,000 fits of a run).
      analyses: ['ols', 'ols-hc3', 'cluster-robust', 'cluster-means', 'mixed'],
    },
  },
])('$name', ({ design, spec }) => {
  const out = specFromDesign(parse(design));

  it('gives the expected specification', () => {
    expect(out.ok, JSON.stringify(out)).toBe(true);
    if (!out.ok) return;
    expect(out.spec.design).toEqual(spec.design);
    expect(out.spec.truth.effect).toBe(spec.truth.effect);
    expect(out.spec.truth.sd).toBe(spec.truth.sd);
    expect(out.spec.truth.icc).toBe(spec.truth.icc);
    if ('occasionCorrelation' in spec.truth) expect(out.spec.truth.occasionCorrelation).toBeCloseTo(spec.truth.occasionCorrelation as number, 12);
    else expect(out.spec.truth.occasionCorrelation).toBeUndefined();
    expect(out.spec.scenarios).toEqual(spec.scenarios);
    expect(out.spec.analyses).toEqual(spec.analyses);
    expect(out.spec).toMatchObject({ replicates: 1000, seed: 1, alpha: 0.05 });
  });

  it('passes the specification schema', () => {
    if (!out.ok) throw new Error('not derived');
    const parsed = simulationSpecSchema.safeParse(out.spec);
    expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
  });
});

describe('designs the stress test cannot simulate say why', () => {
  it.each([
    { name: 'no effect or SD', design: { ...CLASSROOM_DESIGN, assumptions: { iccs: CLASSROOM_DESIGN.assumptions!.iccs } }, reason: /effect worth detecting \(Assumptions step\).*outcome SD \(Assumptions step\)/ },
    {
      name: 'no ICC for the clusters',
      design: { ...CLASSROOM_DESIGN, assumptions: { ...CLASSROOM_DESIGN.assumptions, iccs: [] } },
      reason: /ICC of Classroom \(Assumptions step\)/,
    },
    { name: 'no level of assignment', design: { ...CLASSROOM_DESIGN, assignment: { ...CLASSROOM_DESIGN.assignment, levelId: undefined } }, reason: /level the treatment is assigned at \(Assignment step\)/ },
    { name: 'an empty design', design: {}, reason: /levels of the structure.*\(Structure step\)/ },
  ])('missing, with the step that supplies it: $name', ({ design, reason }) => {
    const out = specFromDesign(parse(design as DesignInput));
    expect(out.ok).toBe(false);
    if (out.ok) return;
    expect(out.unsupported).toEqual([]);
    expect(out.missing.join('; ')).toMatch(reason);
  });

  it.each([
    {
      name: 'three arms',
      design: { ...CLASSROOM_DESIGN, assignment: { ...CLASSROOM_DESIGN.assignment, arms: [{ name: 'A', allocation: 1 }, { name: 'B', allocation: 1 }, { name: 'C', allocation: 1 }] } },
      reason: /^The design has 3 arms: the stress test compares two, so stress-test the main comparison in a copy of the study that keeps only those two arms\.$/,
    },
    {
      name: 'a bounded score',
      design: { ...CLASSROOM_DESIGN, outcome: { ...CLASSROOM_DESIGN.outcome, type: 'bounded-score' as const } },
      reason: /^The outcome is a score with a floor and a ceiling: the stress test cannot yet simulate values piling up at a bound; the Plan tab sizes it with a normal approximation\.$/,
    },
    {
      name: 'a cross-over of whole classrooms',
      design: { ...CLASSROOM_DESIGN, assignment: { ...CLASSROOM_DESIGN.assignment, crossover: { enabled: true, periods: 2 } } },
      reason: /^Each classroom receives both arms in turn with several pupils measured in each period: the stress test simulates a cross-over with one observation per classroom and period/,
    },
    {
      name: 'classrooms within schools within districts',
      design: {
        ...CLASSROOM_DESIGN,
        structure: {
          levels: [
            { id: 'district', name: 'District', kind: 'grouping' as const, count: 4 },
            { id: 'school', name: 'School', kind: 'grouping' as const, count: 3 },
            ...CLASSROOM_DESIGN.structure!.levels!.map((l) => ({ ...l, count: l.id === 'classroom' ? 4 : l.count })),
          ],
        },
      },
      reason: /^The treatment is assigned to classrooms within schools within districts: the stress test simulates one level above the level of assignment, so stress-test a copy of the study without the districts\.$/,
    },
    {
      name: 'two classrooms per school with the treatment within schools',
      design: {
        ...CLASSROOM_DESIGN,
        structure: { levels: [{ id: 'school', name: 'School', kind: 'grouping' as const, count: 10 }, ...CLASSROOM_DESIGN.structure!.levels!.map((l) => ({ ...l, count: l.id === 'classroom' ? 2 : l.count }))] },
      },
      reason: /^Each school holds 2 classrooms: the stress test compares the arms within schools with at least 2 classrooms of each arm in every school/,
    },
  ])('not simulated, in one sentence in the user’s words without a link to a step: $name', ({ design, reason }) => {
    const out = specFromDesign(parse(design as DesignInput));
    expect(out.ok).toBe(false);
    if (out.ok) return;
    expect(out.unsupported).toHaveLength(1);
    expect(out.unsupported[0]).toMatch(reason);
    expect(out.unsupported[0]).not.toMatch(/specification|family|gaussian|step\)/);
  });
});

describe('independent units', () => {
  const base: DesignInput = {
    outcome: { type: 'continuous', shape: 'symmetric', outliersExpected: true },
    structure: { levels: [{ id: 'patient', name: 'Patient', kind: 'independent', count: 40 }] },
    assignment: { kind: 'randomised', levelId: 'patient', arms: [{ name: 'New', allocation: 2 }, { name: 'Usual', allocation: 1 }] },
    assumptions: { outcomeSd: { value: 8 }, effect: { value: 4 } },
  };

  it('splits the study total by an unequal allocation, and adds outliers and huber', () => {
    const out = specFromDesign(parse(base));
    if (!out.ok) throw new Error(out.missing.join('; '));
    // The top level's count is the total in the study: 40 patients in the ratio 2 : 1 → 27 and 13.
    expect(out.spec.design).toEqual({ arms: 2, unitsPerArm: [27, 13] });
    expect(out.spec.scenarios).toEqual([{ violation: 'none' }, { violation: 'outliers' }]);
    expect(out.spec.analyses).toEqual(['ols', 'huber']);
    expect(simulationSpecSchema.safeParse(out.spec).success).toBe(true);
  });

  it('turns repeated measures with serial correlation into occasions with their times', () => {
    const design = parse({
      ...base,
      outcome: { type: 'continuous' },
      structure: {
        levels: [
          { id: 'patient', name: 'Patient', kind: 'independent', count: 30 },
          { id: 'visit', name: 'Visit', kind: 'repeated', count: 3, spatialOrSerial: true },
        ],
      },
      assignment: { kind: 'randomised', levelId: 'patient', arms: [{ name: 'New', allocation: 1 }, { name: 'Usual', allocation: 1 }] },
      occasions: { list: [0, 4, 12].map((t) => ({ label: `Week ${t}`, time: t })) },
      assumptions: { outcomeSd: { value: 8 }, effect: { value: 4 }, iccs: [{ levelId: 'patient', value: 0.6 }] },
    });
    const out = specFromDesign(design);
    if (!out.ok) throw new Error(out.missing.join('; '));
    expect(out.spec.design).toEqual({ arms: 2, unitsPerArm: 15, occasions: 3, times: [0, 4, 12] });
    expect(out.spec.truth).toEqual({ effect: 4, sd: 8, icc: 0, occasionCorrelation: 0.6 });
    expect(out.spec.scenarios).toEqual([{ violation: 'none' }, { violation: 'serial' }]);
    expect(out.spec.analyses).toEqual(['ols', 'cluster-robust', 'cluster-means', 'mixed']);
    expect(simulationSpecSchema.safeParse(out.spec).success).toBe(true);
  });
});

/** The specification of a shape, checked against the engine's schema. */
function specOf(design: DesignInput) {
  const out = specFromDesign(parse(design));
  if (!out.ok) throw new Error([...out.missing, ...out.unsupported].join('; '));
  const parsed = simulationSpecSchema.safeParse(out.spec);
  expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
  return out;
}

describe('every shape the wizard accepts, with the numbers the Plan reads', () => {
  it('sleep timing: 8 nights of each volunteer, two periods of four nights, as a cross-over of 8 periods with carry-over as a scenario', () => {
    const { spec, offered } = specOf(SLEEP_DESIGN);
    expect(spec.design).toEqual({ arms: 2, unitsPerArm: 12, crossover: { periods: 8, sequences: ['AAAABBBB', 'BBBBAAAA'] } });
    // The volunteer's ICC, as the Plan's cross-over calculation reads ρ.
    expect(spec.truth).toEqual({ effect: 20, sd: 45, icc: 0, occasionCorrelation: 0.5 });
    expect(spec.scenarios).toEqual([{ violation: 'none' }, { violation: 'skewed' }, { violation: 'outliers' }, { violation: 'carry-over' }]);
    expect(spec.analyses).toEqual(['ols', 'cluster-robust', 'mixed', 'huber']);
    expect(offered).not.toContain('cluster-means');
  });

  it('count outcome in clusters: baseline rate × follow-up time, log rate ratio, k = 1 / dispersion, between-cluster CV', () => {
    const { spec } = specOf(SHAPES['count outcome, clustered']);
    expect(spec.design).toEqual({ arms: 2, clustersPerArm: 8, clusterSize: 10, clusterSizeCv: 0.3 });
    expect(spec.truth).toEqual({ family: 'count', baseline: 1, effect: Math.log(0.75), overdispersion: 2, clusterCv: 0.3, icc: 0 });
    expect(spec.analyses).toEqual(['cluster-robust', 'cluster-means', 'glm', 'glm-nb', 'glmm']);
  });

  it('count outcome of independent units: no clusters, Poisson counts when the dispersion is 0', () => {
    const { spec } = specOf(SHAPES['count outcome, individually randomised']);
    expect(spec.design).toEqual({ arms: 2, unitsPerArm: 30 });
    expect(spec.truth).toMatchObject({ family: 'count', baseline: 1, effect: Math.log(0.75), overdispersion: 2 });
    expect(spec.analyses).toEqual(['glm', 'glm-nb']);
    const poisson = structuredClone(SHAPES['count outcome, individually randomised']);
    poisson.assumptions!.dispersion = { value: 0 };
    const p = specOf(poisson).spec;
    expect(p.truth.overdispersion).toBeUndefined();
    expect(p.analyses).toEqual(['glm']);
  });

  it('binary outcome in clusters: control proportion, log odds ratio from the difference, ICC on the proportion scale', () => {
    const { spec } = specOf(SHAPES['binary outcome, clustered']);
    expect(spec.design).toEqual({ arms: 2, clustersPerArm: 8, clusterSize: 12, clusterSizeCv: 0 });
    const logit = (p: number) => Math.log(p / (1 - p));
    expect(spec.truth).toMatchObject({ family: 'binary', baseline: 0.3, icc: 0.05, iccScale: 'proportion' });
    expect(spec.truth.effect).toBeCloseTo(logit(0.2) - logit(0.3), 12);
    expect(spec.analyses).toEqual(['cluster-robust', 'cluster-means', 'glm', 'glmm']);
  });

  it.each([
    ['difference', -0.1, Math.log(0.2 / 0.8) - Math.log(0.3 / 0.7)],
    ['riskRatio', 0.5, Math.log(0.15 / 0.85) - Math.log(0.3 / 0.7)],
    ['oddsRatio', 2, Math.log(2)],
    ['p2', 0.4, Math.log(0.4 / 0.6) - Math.log(0.3 / 0.7)],
  ] as const)('binary outcome of independent units: the effect given as %s %s is the log odds ratio', (measure, value, logOr) => {
    const d = structuredClone(SHAPES['binary outcome, individually randomised']);
    d.assumptions!.controlProportion = { value: 0.3 };
    d.assumptions!.proportionEffect = { measure, value };
    const { spec } = specOf(d);
    expect(spec.design).toEqual({ arms: 2, unitsPerArm: 100 });
    expect(spec.truth.icc).toBe(0);
    expect(spec.truth.iccScale).toBeUndefined();
    expect(spec.truth.effect).toBeCloseTo(logOr, 12);
    expect(spec.analyses).toEqual(['glm']);
  });

  it('binary outcome with an effect that puts the second proportion beyond 1: says so, naming the step', () => {
    const d = structuredClone(SHAPES['binary outcome, individually randomised']);
    d.assumptions!.proportionEffect = { measure: 'riskRatio', value: 6 };
    const out = specFromDesign(parse(d));
    expect(out).toEqual({ ok: false, missing: ['an effect that keeps the proportion with the intervention between 0 and 1 (the effect given puts it at 1.2; Assumptions step)'], unsupported: [] });
  });

  it('AB/BA cross-over: two periods, the patient ICC as the correlation, the period-difference analysis', () => {
    const { spec } = specOf(SHAPES['AB/BA cross-over']);
    expect(spec.design).toEqual({ arms: 2, unitsPerArm: 15, crossover: { periods: 2 } });
    expect(spec.truth).toEqual({ effect: 5, sd: 12, icc: 0, occasionCorrelation: 0.6 });
    expect(spec.scenarios).toEqual([{ violation: 'none' }]);
    expect(spec.analyses).toEqual(['ols', 'cluster-robust', 'mixed', 'period-difference']);
  });

  it('three-period cross-over: ABB/BAA, the occasion correlation, carry-over when it is possible', () => {
    const { spec } = specOf(SHAPES['three-period cross-over']);
    expect(spec.design).toEqual({ arms: 2, unitsPerArm: 9, crossover: { periods: 3 } });
    expect(spec.truth).toEqual({ effect: 5, sd: 12, icc: 0, occasionCorrelation: 0.5 });
    expect(spec.scenarios).toEqual([{ violation: 'none' }, { violation: 'carry-over' }]);
    expect(spec.analyses).toEqual(['ols', 'cluster-robust', 'mixed']);
  });

  it('within-subject comparison over 8 occasions, no order given: the balanced sequences ABBAABBA and BAABBAAB', () => {
    const { spec } = specOf(SHAPES['within-subject comparison over 8 occasions']);
    expect(spec.design).toEqual({ arms: 2, unitsPerArm: 10, crossover: { periods: 8 } });
    expect(spec.truth).toEqual({ effect: 10, sd: 30, icc: 0, occasionCorrelation: 0.5 });
  });

  it('a cross-over whose periods are given only as occasions: one observation per occasion, the AB/BA spec', () => {
    const base = SHAPES['three-period cross-over'];
    const d: DesignInput = {
      ...base,
      structure: { ...base.structure, levels: [{ id: 'patient', name: 'Patient', kind: 'independent', count: 24 }] },
      assignment: { ...base.assignment, crossover: { enabled: true, periods: 2, carryoverPossible: false } },
      occasions: { ...base.occasions, list: [1, 2].map((t) => ({ label: `Period ${t}`, time: t })) },
    };
    const { spec } = specOf(d);
    expect(spec.design).toEqual({ arms: 2, unitsPerArm: 12, crossover: { periods: 2 } });
  });

  it('occasions that do not split evenly over the periods: missing, naming the steps', () => {
    const d = structuredClone(SHAPES['three-period cross-over']);
    d.structure!.levels![1]!.count = 4;
    const out = specFromDesign(parse(d));
    expect(out).toEqual({ ok: false, missing: ['a number of periods per patient that splits evenly into the 3 periods of the cross-over (4 now; Structure or Assignment step)'], unsupported: [] });
  });

  it('three levels, treatment at the top: schools as clusters, classrooms as units, pupils as sub-samples', () => {
    const { spec } = specOf(SHAPES['three levels, treatment at the top']);
    expect(spec.design).toEqual({ arms: 2, clustersPerArm: 6, clusterSize: 3, clusterSizeCv: 0.2, occasions: 20 });
    // The classroom's share of the variance left after the schools: 0.1 / (1 − 0.05).
    expect(spec.truth.icc).toBe(0.05);
    expect(spec.truth.occasionCorrelation).toBeCloseTo(0.1 / 0.95, 12);
    expect(spec.scenarios).toEqual([{ violation: 'none' }]);
  });

  it('three levels, treatment at the middle: schools as blocks holding both arms, 2 classrooms of each arm in each', () => {
    const { spec } = specOf(SHAPES['three levels, treatment at the middle']);
    expect(spec.design).toEqual({ arms: 2, blocks: 6, clustersPerArm: 2, clusterSize: 25, clusterSizeCv: 0 });
    expect(spec.truth).toEqual({ effect: 3, sd: 10, icc: 0.12, blockIcc: 0.05 });
    expect(spec.analyses).toEqual(['ols', 'cluster-robust', 'cluster-means', 'mixed']);
  });

  it('longitudinal with a trajectory of interest: the difference in slopes, effect / time span as the Plan reads it', () => {
    const { spec } = specOf(SHAPES['longitudinal, trajectory of interest with random slopes planned']);
    expect(spec.design).toEqual({ arms: 2, unitsPerArm: 20, occasions: 4, times: [0, 2, 4, 8], target: 'treat:time' });
    expect(spec.truth).toEqual({ effect: 0.5, sd: 10, icc: 0, occasionCorrelation: 0.6 });
    expect(spec.scenarios).toEqual([{ violation: 'none' }, { violation: 'serial' }]);
    expect(spec.analyses).toEqual(['ols', 'cluster-robust', 'cluster-means', 'mixed']);
  });

  it.each(Object.entries(SHAPES))('%s: a specification the engine accepts', (_name, design) => {
    specOf(design);
  });
});

describe('what the tab says is simulated, in the design’s words', () => {
  const words = (design: DesignInput) => {
    const d = parse(design);
    const { spec } = specOf(design);
    return { size: sizeWords(d, spec), text: describeSimulation(d, spec) };
  };

  it('the sleep demo: the two orders of the schedules over the 8 nights', () => {
    expect(words(SLEEP_DESIGN)).toEqual({
      size: 'volunteers per sequence',
      text: [
        'Simulated from the design: 12 volunteers in each of two orders, each measured on 8 nights — Early schedule on nights 1–4, then Late schedule on nights 5–8; or Late schedule on nights 1–4, then Early schedule on nights 5–8. Every analysis adjusts for the night.',
      ],
    });
  });

  it('classrooms within schools, and a binary outcome with its scale', () => {
    expect(words(SHAPES['three levels, treatment at the middle'])).toEqual({
      size: 'classrooms per arm in each school',
      text: ['Simulated from the design: 2 classrooms per arm in each of 6 schools, 25 pupils each.'],
    });
    expect(words(SHAPES['binary outcome, clustered']).text).toEqual([
      'Simulated from the design: 8 clinics per arm, 12 patients each.',
      'The effect is a log odds ratio of −0.539 (a proportion of 0.3 without the intervention and 0.2 with it); bias and CI width are on the log-odds scale.',
    ]);
    expect(words(SHAPES['count outcome, individually randomised']).text[1]).toBe(
      'The effect is a log rate ratio of −0.2877 (rate ratio 0.75; a mean count of 1 per patient over the follow-up without the intervention); bias and CI width are on the log scale.',
    );
  });
});

describe('plannedAnalysis: the design\'s planned analysis in the stress test\'s names', () => {
  const specOfDesign = (d: DesignInput) => {
    const out = specFromDesign(parse(d));
    if (!out.ok) throw new Error('not simulated');
    return out.spec;
  };
  it.each([
    ['a t test of pupils in randomised classrooms', CLASSROOM_DESIGN, {}, 'ols'],
    ['the same as a mixed model', CLASSROOM_DESIGN, { method: 'mixed-model' }, 'mixed'],
    ['with CR2 standard errors', CLASSROOM_DESIGN, { standardErrors: 'cr2' }, 'cluster-robust'],
    ['as cluster means', CLASSROOM_DESIGN, { method: 'cluster-means' }, 'cluster-means'],
    ['robust regression', CLASSROOM_DESIGN, { method: 'robust-regression' }, 'huber'],
    ['no method named', CLASSROOM_DESIGN, { method: 'other' }, null],
    ['the sleep cross-over of 8 nights, t test', SLEEP_DESIGN, {}, 'ols'],
  ] as const)('%s', (_name, design, analysis, want) => {
    const d = { ...design, analysis: { ...design.analysis, ...analysis } } as DesignInput;
    expect(plannedAnalysis(parse(d), specOfDesign(d))).toBe(want);
  });
});
