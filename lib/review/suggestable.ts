/**
 * The fields a suggestion can change from the Review tab's form: those of the design that hold one
 * value the form can take as typed — a number, yes or no, or free text. Choices from a list and
 * references to a level are left out (their stored value is not what the wizard shows); comment
 * on such a field instead. The API takes any field with one value.
 */
import { fieldValue, formatFieldValue, listFields } from '@/lib/design/fields';
import { DESIGN_STEPS, type Design } from '@/lib/design/schema';

export interface SuggestableField {
  path: string;
  label: string;
  stepLabel: string;
  kind: 'text' | 'number' | 'yesno';
  currentText: string;
}

const STEP_LABEL = Object.fromEntries(DESIGN_STEPS.map((s) => [s.part, s.label]));

export function suggestableFields(design: Design): SuggestableField[] {
  const out: SuggestableField[] = [];
  for (const f of listFields(design)) {
    const v = fieldValue(design, f.path);
    const currentText = formatFieldValue(design, f.path, v);
    const kind = typeof v === 'number' ? 'number' : typeof v === 'boolean' ? 'yesno' : typeof v === 'string' && currentText === v ? 'text' : null;
    if (kind) out.push({ path: f.path, label: f.label, stepLabel: STEP_LABEL[f.step] ?? f.step, kind, currentText });
  }
  return out;
}
