import { SOLVE_LABELS } from './kinds';

export interface RadioChoiceProps {
  legend: string;
  /** The radio group's name, unique on the page. */
  name: string;
  options: readonly (readonly [value: string, label: string])[];
  value: string | null;
  onChange: (next: string) => void;
}

/** A labelled group of radio buttons in one row. */
export function RadioChoice({ legend, name, options, value, onChange }: RadioChoiceProps) {
  return (
    <fieldset className="space-y-2">
      <legend className="text-sm font-semibold">{legend}</legend>
      <div className="flex flex-wrap gap-x-5 gap-y-2">
        {options.map(([option, label]) => (
          <label key={option} className="flex items-center gap-2 text-sm">
            <input type="radio" name={name} value={option} checked={value === option} onChange={() => onChange(option)} />
            {label}
          </label>
        ))}
      </div>
    </fieldset>
  );
}

export interface SolveForChoiceProps extends Omit<RadioChoiceProps, 'legend' | 'options'> {
  /** The quantities that can be solved for, in the order shown. */
  solvable: readonly string[];
  /** Words for a quantity; SOLVE_LABELS unless given. */
  labelOf?: (quantity: string) => string;
}

/** "Solve for: sample size | power | smallest detectable effect"; nothing when the kind solves nothing. */
export function SolveForChoice({ solvable, labelOf = (q) => SOLVE_LABELS[q] ?? q, ...rest }: SolveForChoiceProps) {
  if (solvable.length === 0) return null;
  return <RadioChoice legend="Solve for" options={solvable.map((q) => [q, labelOf(q)] as const)} {...rest} />;
}
