import { describe, expect, it } from 'vitest';
import { classroom, empty, greenhouse, simple, variant } from '@/lib/rules/__fixtures__/designs';
import { describeChanges, fieldLabel, fieldStep, fieldValue, formatFieldValue, isFieldPath, listFields, withFieldValue } from './fields';
import { designSchema, type Design } from './schema';

const paths = (d: Design) => listFields(d).map((f) => f.path);

describe('listFields: every field of a design by a stable path, in the wizard’s words', () => {
  it('names items of a list by their id, ICCs by their level, arms and occasions by position', () => {
    const p = paths(classroom);
    expect(p).toEqual(
      expect.arrayContaining([
        'outcome.name',
        'outcome.explanatoryVariables[programme].role',
        'structure.levels[classroom].count',
        'structure.levels[pupil].countCv',
        'assignment.arms[0].name',
        'assignment.arms[1].allocation',
        'occasions.list[1].attrition',
        'assumptions.iccs[classroom].value',
        'assumptions.iccs[classroom].source.citation',
        'assumptions.outcomeSd.value',
        'assumptions.effect.source.kind',
        'analysis.method',
      ]),
    );
    expect(new Set(p).size).toBe(p.length);
  });

  it('lists the steps in the wizard’s order', () => {
    const steps = listFields(classroom).map((f) => f.step);
    const firsts = [...new Set(steps)];
    expect(firsts).toEqual(['outcome', 'structure', 'assignment', 'occasions', 'assumptions', 'analysis']);
  });

  it('uses the labels the wizard shows, with the item they belong to', () => {
    expect(fieldLabel(classroom, 'outcome.name')).toBe('Primary outcome');
    expect(fieldLabel(classroom, 'structure.levels[classroom].count')).toBe('Level “Classroom” — Number in the study');
    expect(fieldLabel(classroom, 'structure.levels[pupil].count')).toBe('Level “Pupil” — Number per Classroom');
    expect(fieldLabel(classroom, 'assumptions.iccs[classroom].value')).toBe('Intracluster correlation (ICC) for Classroom');
    expect(fieldLabel(classroom, 'assumptions.iccs[classroom].source.certainty')).toBe('Intracluster correlation (ICC) for Classroom — How sure the team is');
    expect(fieldLabel(classroom, 'assumptions.outcomeSd.value')).toBe('Standard deviation of the outcome (points)');
    expect(fieldLabel(classroom, 'assignment.arms[0].name')).toBe('Arm 1 “Programme” — Name');
    expect(fieldLabel(classroom, 'occasions.list[1].attrition')).toBe('Occasion 2 “End of year” — Dropped out by then');
    expect(fieldLabel(classroom, 'analysis.unitOfAnalysisLevelId')).toBe('Unit counted as n');
  });

  it('shows the Assumptions step’s numbers of the outcome’s family, and an ICC not given yet for a level that needs one', () => {
    const binary = variant(simple, (d) => {
      d.outcome.type = 'binary';
      delete d.assumptions.outcomeSd;
      delete d.assumptions.effect;
    });
    expect(paths(binary)).toContain('assumptions.controlProportion.value');
    expect(paths(binary)).not.toContain('assumptions.outcomeSd.value');
    const noIcc = variant(classroom, (d) => void (d.assumptions.iccs = []));
    expect(paths(noIcc)).toContain('assumptions.iccs[classroom].value');
    expect(fieldValue(noIcc, 'assumptions.iccs[classroom].value')).toBeUndefined();
  });

  it('an empty design still has its fields', () => {
    expect(paths(empty)).toContain('outcome.name');
    expect(paths(empty)).toContain('analysis.notes');
  });
});

describe('fieldValue, formatFieldValue, withFieldValue', () => {
  it('reads a value by path', () => {
    expect(fieldValue(classroom, 'structure.levels[pupil].count')).toBe(25);
    expect(fieldValue(classroom, 'assumptions.iccs[classroom].value')).toBe(0.15);
    expect(fieldValue(classroom, 'assignment.arms[1].name')).toBe('Usual teaching');
    expect(fieldValue(classroom, 'structure.levels[nowhere].count')).toBeUndefined();
    expect(fieldValue(classroom, 'not.a.field')).toBeUndefined();
  });

  it('formats values in the wizard’s words', () => {
    expect(formatFieldValue(classroom, 'analysis.method', 'mixed-model')).toBe('Linear mixed model (random effects)');
    expect(formatFieldValue(classroom, 'analysis.unitOfAnalysisLevelId', 'classroom')).toBe('Classroom');
    expect(formatFieldValue(classroom, 'analysis.randomIntercepts', ['classroom', 'pupil'])).toBe('Classroom, Pupil');
    expect(formatFieldValue(classroom, 'structure.levels[classroom].sharedEnvironment', true)).toBe('Yes');
    expect(formatFieldValue(classroom, 'structure.levels[classroom].count', 1500)).toBe('1,500');
    expect(formatFieldValue(classroom, 'outcome.unit', undefined)).toBe('not given');
  });

  it('sets a value without touching the design it was given, and the result validates', () => {
    const next = withFieldValue(classroom, 'structure.levels[classroom].count', 24);
    expect(fieldValue(next, 'structure.levels[classroom].count')).toBe(24);
    expect(fieldValue(classroom, 'structure.levels[classroom].count')).toBe(20);
    expect(designSchema.safeParse(next).success).toBe(true);
  });

  it('creates an ICC not given yet, and a sourced number not given yet', () => {
    const noIcc = variant(classroom, (d) => void (d.assumptions.iccs = []));
    const withIcc = designSchema.parse(withFieldValue(noIcc, 'assumptions.iccs[classroom].value', 0.05));
    expect(withIcc.assumptions.iccs).toEqual([{ levelId: 'classroom', value: 0.05, source: { kind: 'none', certainty: 'low' } }]);
    const sd = designSchema.parse(withFieldValue(empty, 'assumptions.outcomeSd.value', 12));
    expect(sd.assumptions.outcomeSd).toEqual({ value: 12, source: { kind: 'none', certainty: 'low' } });
  });

  it('removes a value set to undefined, and refuses a path to an item that is not there', () => {
    expect(fieldValue(withFieldValue(classroom, 'outcome.unit', undefined), 'outcome.unit')).toBeUndefined();
    expect(() => withFieldValue(classroom, 'structure.levels[nowhere].count', 3)).toThrow();
    expect(() => withFieldValue(classroom, 'outcome.nothing', 3)).toThrow();
  });

  it('knows which paths are fields and which step they belong to', () => {
    expect(isFieldPath('structure.levels[any-id].count')).toBe(true);
    expect(isFieldPath('assignment.arms[3].allocation')).toBe(true);
    expect(isFieldPath('structure.levels.count')).toBe(false);
    expect(isFieldPath('outcome.name[0]')).toBe(false);
    expect(fieldStep('analysis.notes')).toBe('analysis');
    expect(fieldLabel(classroom, 'bogus')).toBe('bogus');
  });
});

describe('describeChanges: what differs between two designs, in the wizard’s words', () => {
  it('is empty for the same design', () => {
    expect(describeChanges(classroom, structuredClone(classroom))).toEqual([]);
  });

  it('lists changed fields old → new, in the wizard’s order', () => {
    const b = variant(classroom, (d) => {
      d.analysis.method = 'mixed-model';
      d.analysis.randomIntercepts = ['classroom'];
      d.structure.levels[0]!.count = 24;
      d.assumptions.iccs[0]!.value = 0.2;
    });
    expect(describeChanges(classroom, b)).toEqual([
      { path: 'structure.levels[classroom].count', label: 'Level “Classroom” — Number in the study', step: 'structure', before: '20', after: '24' },
      { path: 'assumptions.iccs[classroom].value', label: 'Intracluster correlation (ICC) for Classroom', step: 'assumptions', before: '0.15', after: '0.2' },
      { path: 'analysis.method', label: 'Planned analysis', step: 'analysis', before: 't-test comparing the arms', after: 'Linear mixed model (random effects)' },
      { path: 'analysis.randomIntercepts', label: 'Random intercepts for', step: 'analysis', before: 'none', after: 'Classroom' },
    ]);
  });

  it('an added or removed item is one change', () => {
    const b = variant(greenhouse, (d) => {
      d.structure.levels.splice(2, 1);
      d.analysis.unitOfAnalysisLevelId = 'plant';
      d.assignment.arms.push({ name: 'Peat-free', allocation: 1 });
    });
    const changes = describeChanges(greenhouse, b);
    expect(changes).toContainEqual({ path: 'structure.levels[leaf]', label: 'Level “Leaf”', step: 'structure', before: 'Leaf (Technical replicates or sub-samples, 4)', after: 'none' });
    const arm = `assignment.arms[${greenhouse.assignment.arms.length}]`;
    expect(changes).toContainEqual({ path: arm, label: `Arm ${greenhouse.assignment.arms.length + 1} “Peat-free”`, step: 'assignment', before: 'none', after: 'Peat-free (share 1)' });
    expect(changes.filter((c) => c.path.startsWith('structure.levels[leaf]'))).toHaveLength(1);
  });

  it('says when only the order of the levels changed', () => {
    const b = variant(classroom, (d) => {
      d.structure.levels.reverse();
    });
    expect(describeChanges(classroom, b)).toContainEqual({ path: 'structure.levels', label: 'Order of the levels', step: 'structure', before: 'Classroom → Pupil', after: 'Pupil → Classroom' });
  });

  it('names the value the other design lost, by that design’s level names', () => {
    const b = variant(classroom, (d) => void (d.analysis.unitOfAnalysisLevelId = 'classroom'));
    expect(describeChanges(classroom, b)).toEqual([{ path: 'analysis.unitOfAnalysisLevelId', label: 'Unit counted as n', step: 'analysis', before: 'Pupil', after: 'Classroom' }]);
  });
});
