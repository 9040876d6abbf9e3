import { describe, expect, it } from 'vitest';
import { CLASSROOM_DESIGN, GREENHOUSE_DESIGN, SLEEP_DESIGN } from '@/db/demo/designs';
import { designSchema, type DesignInput } from '@/lib/design/schema';
import { simulationSpecSchema } from './spec';
import { specFromDesign } from './from-design';

const parse = (d: DesignInput) => designSchema.parse(d);

describe.each([
  {
    name: 'classroom (cluster-randomised, one follow-up after a baseline)',
    design: CLASSROOM_DESIGN,
    spec: {
      design: { arms: 2, clustersPerArm: 10, clusterSize: 25, clusterSizeCv: 0.25 },
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
      design: { arms: 2, clustersPerArm: 6, clusterSize: 6, clusterSizeCv: 0, occasions: 4 },
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
    { name: 'sleep timing (cross-over: the schedule changes within volunteers)', design: SLEEP_DESIGN, reason: /^Each volunteer receives both arms in turn \(a 2-period cross-over\): .*; the Plan tab sizes the two-period cross-over\.$/ },
    { name: 'three arms', design: { ...CLASSROOM_DESIGN, assignment: { ...CLASSROOM_DESIGN.assignment, arms: [{ name: 'A', allocation: 1 }, { name: 'B', allocation: 1 }, { name: 'C', allocation: 1 }] } }, reason: /^The design has 3 arms: the stress test compares two/ },
    { name: 'a binary outcome', design: { ...CLASSROOM_DESIGN, outcome: { ...CLASSROOM_DESIGN.outcome, type: 'binary' as const } }, reason: /^The outcome is binary \(yes or no\): the stress test simulates only continuous outcomes/ },
    {
      name: 'pupils randomised within classrooms',
      design: { ...CLASSROOM_DESIGN, assignment: { ...CLASSROOM_DESIGN.assignment, levelId: 'pupil' } },
      reason: /^The treatment is assigned to pupils within classrooms: /,
    },
    {
      name: 'classrooms in schools',
      design: {
        ...CLASSROOM_DESIGN,
        structure: { levels: [{ id: 'school', name: 'School', kind: 'grouping' as const, count: 10 }, ...CLASSROOM_DESIGN.structure!.levels!.map((l) => ({ ...l, count: l.id === 'classroom' ? 2 : l.count }))] },
        assignment: { ...CLASSROOM_DESIGN.assignment, levelId: 'school' },
      },
      reason: /^Pupils are grouped in classrooms, and those in schools: the stress test simulates one level of clustering so far/,
    },
  ])('not simulated yet, in one sentence without a link to the design: $name', ({ design, reason }) => {
    const out = specFromDesign(parse(design as DesignInput));
    expect(out.ok).toBe(false);
    if (out.ok) return;
    expect(out.unsupported).toHaveLength(1);
    expect(out.unsupported[0]).toMatch(reason);
    expect(out.unsupported[0]).not.toMatch(/specification|family|step\)/);
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
