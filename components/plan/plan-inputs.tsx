'use client';

import { SelectField, TextField } from '@/components/ui/field';
import { SOLVE_LABELS, type FieldSpec } from '@/components/calculations/kinds';
import { SolveForChoice } from '@/components/calculations/solve-for-choice';

export type InputValues = Record<string, string | boolean>;

export interface PlanInputsProps {
  fields: FieldSpec[];
  values: InputValues;
  errors: Record<string, string | undefined>;
  solvable: readonly string[];
  solveFor: string | null;
  /** Labels that name this design's units, by input name (e.g. clustersPerArm → 'Classrooms per arm'). */
  labels: Record<string, string>;
  onChange: (name: string, value: string | boolean) => void;
  onSolveFor: (name: string) => void;
}

/** The Plan tab's editable inputs: what to solve for, then one labelled field per input. */
export function PlanInputs({ fields, values, errors, solvable, solveFor, labels, onChange, onSolveFor }: PlanInputsProps) {
  return (
    <form noValidate onSubmit={(e) => e.preventDefault()} aria-labelledby="plan-inputs-heading" className="space-y-5 rounded-lg border border-line bg-white p-5">
      <div>
        <h3 id="plan-inputs-heading" className="text-base font-bold">
          Inputs
        </h3>
        <p className="mt-1 text-sm text-muted">Filled in from the design. Change any value to see the answer and the charts update; the design itself is not changed.</p>
      </div>
      <SolveForChoice
        name="plan-solve-for"
        solvable={solvable}
        value={solveFor}
        onChange={onSolveFor}
        labelOf={(name) => labels[name]?.toLowerCase() ?? SOLVE_LABELS[name] ?? name}
      />
      <div className="grid gap-4 sm:grid-cols-2">
        {fields.map((field) => {
          const label = labels[field.name] ?? field.label;
          const value = values[field.name];
          const error = errors[field.name];
          if (field.input === 'select') {
            return (
              <SelectField key={field.name} label={label} help={field.help} error={error} value={String(value ?? '')} onChange={(e) => onChange(field.name, e.target.value)}>
                {field.options!.map(([v, l]) => (
                  <option key={v} value={v}>
                    {l}
                  </option>
                ))}
              </SelectField>
            );
          }
          if (field.input === 'checkbox') {
            return (
              <div key={field.name} className="space-y-1">
                <label className="flex items-center gap-2 text-sm font-semibold">
                  <input type="checkbox" aria-describedby={`plan-${field.name}-help`} checked={value === true} onChange={(e) => onChange(field.name, e.target.checked)} /> {label}
                </label>
                <p id={`plan-${field.name}-help`} className="text-sm text-muted">
                  {field.help}
                </p>
              </div>
            );
          }
          return (
            <TextField
              key={field.name}
              name={field.name}
              label={label}
              help={field.help}
              error={error}
              type={field.input === 'times' ? 'text' : 'number'}
              step={field.input === 'whole' ? 1 : 'any'}
              inputMode={field.input === 'whole' ? 'numeric' : 'decimal'}
              value={String(value ?? '')}
              onChange={(e) => onChange(field.name, e.target.value)}
            />
          );
        })}
      </div>
    </form>
  );
}
