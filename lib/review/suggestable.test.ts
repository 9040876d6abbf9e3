import { describe, expect, it } from 'vitest';
import { CLASSROOM_DESIGN } from '@/db/demo/designs';
import { designSchema } from '@/lib/design/schema';
import { suggestableFields } from './suggestable';

describe('fields a suggestion can change from the form', () => {
  const fields = suggestableFields(designSchema.parse(CLASSROOM_DESIGN));
  const byPath = new Map(fields.map((f) => [f.path, f]));

  it('offers numbers, yes/no and free text with their current words', () => {
    expect(byPath.get('assumptions.iccs[classroom].value')).toMatchObject({ kind: 'number', stepLabel: 'Assumptions', currentText: '0.15' });
    expect(byPath.get('outcome.name')).toMatchObject({ kind: 'text', currentText: 'Reading score' });
    expect(byPath.get('analysis.adjustsForBaseline')).toMatchObject({ kind: 'yesno', currentText: 'No' });
  });

  it('leaves out choices from a list and references to a level', () => {
    expect(byPath.has('outcome.type')).toBe(false);
    expect(byPath.has('analysis.unitOfAnalysisLevelId')).toBe(false);
    expect(byPath.has('outcome.secondaryOutcomes')).toBe(false);
  });
});
