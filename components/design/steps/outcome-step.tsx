'use client';

import { useFieldArray } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Options } from '../options';
import { SelectField, TextField } from '@/components/ui/field';
import { OUTCOME_SHAPE_WORDS, OUTCOME_TYPE_WORDS, VARIABLE_KIND_WORDS, VARIABLE_ROLE_WORDS } from '@/lib/design/fields';
import { outcomeSchema } from '@/lib/design/schema';
import { asNumber, asOptional, errorAt, makeId, useStepForm } from '../step-form';
import type { StepProps } from './types';

export function OutcomeStep({ value, onValid, onDraft, disabled }: StepProps<'outcome'>) {
  const form = useStepForm(outcomeSchema, value, onValid, onDraft);
  const { register, formState, control } = form;
  const e = formState.errors as Record<string, unknown>;
  const vars = useFieldArray({ control, name: 'explanatoryVariables', keyName: '_key' as 'id' });
  return (
    <fieldset disabled={disabled} className="space-y-4">
      <legend className="sr-only">Outcome</legend>
      <div className="grid gap-4 @md:grid-cols-2">
        <TextField label="Primary outcome" help="What is measured to answer the question, e.g. reading score." {...register('name')} error={errorAt(e, 'name')} />
        <TextField label="Unit" help="e.g. points, ms, µg/cm²." {...register('unit')} error={errorAt(e, 'unit')} />
      </div>
      <SelectField label="Type of outcome" help="It decides the model family: a binary or count outcome needs a GLM, not a linear model." {...register('type', asOptional)} error={errorAt(e, 'type')}>
        <option value="">Choose…</option>
        <Options words={OUTCOME_TYPE_WORDS} />
      </SelectField>
      <SelectField label="Expected shape" help="Positive measurements such as times or concentrations are often right-skewed." {...register('shape', asOptional)} error={errorAt(e, 'shape')}>
        <option value="">Not known yet</option>
        <Options words={OUTCOME_SHAPE_WORDS} />
      </SelectField>
      <div className="flex flex-wrap gap-6 text-sm">
        <label className="flex items-center gap-2">
          <input type="checkbox" {...register('positiveOnly')} /> Only positive values are possible
        </label>
        <label className="flex items-center gap-2">
          <input type="checkbox" {...register('unequalVarianceExpected')} /> Spread may differ between arms or grow with the mean
        </label>
        <label className="flex items-center gap-2">
          <input type="checkbox" {...register('outliersExpected')} /> Outliers are plausible
        </label>
      </div>
      <TextField
        label="Number of primary outcomes"
        type="number"
        min={1}
        help="Each primary outcome tested for the main claim adds to the chance of a false positive."
        {...register('primaryOutcomes', asNumber)}
        error={errorAt(e, 'primaryOutcomes')}
      />
      <div className="space-y-2">
        <h3 className="text-sm font-semibold">Explanatory variables</h3>
        <p className="text-sm text-muted">The treatment or exposure, and covariates. For a continuous variable give the range it will cover and the range you want conclusions about.</p>
        {vars.fields.map((f, i) => (
          <div key={(f as unknown as { _key: string })._key} className="grid gap-2 rounded-md border border-line p-3 @md:grid-cols-2 @2xl:grid-cols-4">
            <TextField label="Name" {...register(`explanatoryVariables.${i}.name`)} error={errorAt(e, `explanatoryVariables.${i}.name`)} />
            <SelectField label="Role" {...register(`explanatoryVariables.${i}.role`)}>
              <Options words={VARIABLE_ROLE_WORDS} />
            </SelectField>
            <SelectField label="Kind" {...register(`explanatoryVariables.${i}.kind`)}>
              <Options words={VARIABLE_KIND_WORDS} />
            </SelectField>
            <div className="flex items-end">
              <Button variant="ghost" onClick={() => vars.remove(i)}>
                Remove<span className="sr-only"> variable {i + 1}</span>
              </Button>
            </div>
            <TextField label="Observed from" type="number" step="any" {...register(`explanatoryVariables.${i}.observedMin`, asNumber)} />
            <TextField label="Observed to" type="number" step="any" {...register(`explanatoryVariables.${i}.observedMax`, asNumber)} error={errorAt(e, `explanatoryVariables.${i}.observedMax`)} />
            <TextField label="Conclusions from" type="number" step="any" {...register(`explanatoryVariables.${i}.targetMin`, asNumber)} />
            <TextField label="Conclusions to" type="number" step="any" {...register(`explanatoryVariables.${i}.targetMax`, asNumber)} error={errorAt(e, `explanatoryVariables.${i}.targetMax`)} />
          </div>
        ))}
        <Button
          variant="secondary"
          onClick={() =>
            vars.append({ id: makeId(`var-${vars.fields.length + 1}`, (form.getValues('explanatoryVariables') ?? []).map((v) => v.id)), name: '', role: 'covariate', kind: 'continuous' })
          }
        >
          Add a variable
        </Button>
      </div>
    </fieldset>
  );
}
