'use client';

import { useFieldArray } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Options } from '../options';
import { SelectField, TextField } from '@/components/ui/field';
import { CORRELATION_STRUCTURE_WORDS } from '@/lib/design/fields';
import { occasionsSchema } from '@/lib/design/schema';
import { asNumber, errorAt, useStepForm } from '../step-form';
import type { StepProps } from './types';

export function OccasionsStep({ value, onValid, onDraft, disabled }: StepProps<'occasions'>) {
  const form = useStepForm(occasionsSchema, value, onValid, onDraft);
  const { register, formState, control, watch } = form;
  const e = formState.errors as Record<string, unknown>;
  const list = useFieldArray({ control, name: 'list' });
  const unit = watch('timeUnit');
  return (
    <fieldset disabled={disabled} className="space-y-4">
      <legend className="sr-only">Occasions</legend>
      <p className="text-sm text-muted">When the outcome is measured: baselines before the treatment and follow-ups after it. Spacing may be unequal. Give the share of units expected to have dropped out by each occasion.</p>
      <TextField label="Time unit" {...register('timeUnit')} error={errorAt(e, 'timeUnit')} />
      <ol className="space-y-2">
        {list.fields.map((f, i) => (
          // The card sits in the wizard's middle column, whose width is that of the card and not of the
          // window: its layout follows its own width (a container query), one row only when all fits.
          <li key={f.id} className="@container rounded-md border border-line bg-white p-3">
            <div className="grid grid-cols-2 gap-2 @2xl:grid-cols-[minmax(10rem,1fr)_8rem_9rem_auto]">
              <div className="col-span-2 @2xl:col-span-1">
                <TextField label="Label" {...register(`list.${i}.label`)} error={errorAt(e, `list.${i}.label`)} />
              </div>
              <TextField label={`Time (${unit || 'units'})`} type="number" step="any" {...register(`list.${i}.time`, asNumber)} error={errorAt(e, `list.${i}.time`)} />
              <TextField label="Dropped out by then" type="number" step="any" min={0} max={1} help="A share, e.g. 0.1" {...register(`list.${i}.attrition`, asNumber)} error={errorAt(e, `list.${i}.attrition`)} />
              <div className="col-span-2 flex items-end justify-between gap-2 @2xl:col-span-1">
                <label className="flex items-center gap-2 pb-2 text-sm">
                  <input type="checkbox" {...register(`list.${i}.baseline`)} /> Baseline
                </label>
                <Button variant="ghost" onClick={() => list.remove(i)}>
                  Remove<span className="sr-only"> occasion {i + 1}</span>
                </Button>
              </div>
            </div>
          </li>
        ))}
      </ol>
      <Button
        variant="secondary"
        onClick={() => list.append({ label: list.fields.length === 0 ? 'Baseline' : `Follow-up ${list.fields.length}`, time: list.fields.length, baseline: list.fields.length === 0, attrition: 0 })}
      >
        Add an occasion
      </Button>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" {...register('trajectoryOfInterest')} /> The change over time itself is of interest (rates of change, not only the end point)
      </label>
      <SelectField
        label="Expected correlation between occasions"
        help="Exchangeable: any two occasions of a unit are equally alike. AR(1): occasions close in time are more alike than distant ones."
        {...register('correlationStructure')}
      >
        <Options words={CORRELATION_STRUCTURE_WORDS} />
      </SelectField>
    </fieldset>
  );
}
