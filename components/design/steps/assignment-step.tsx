'use client';

import { useFieldArray } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Options } from '../options';
import { SelectField, TextField } from '@/components/ui/field';
import { ASSIGNMENT_KIND_WORDS, BLOCKING_WORDS } from '@/lib/design/fields';
import { assignmentSchema } from '@/lib/design/schema';
import { asNumber, asOptional, errorAt, useStepForm } from '../step-form';
import type { StepProps } from './types';

export function AssignmentStep({ value, design, onValid, onDraft, disabled }: StepProps<'assignment'>) {
  const form = useStepForm(assignmentSchema, value, onValid, onDraft);
  const { register, formState, control, watch } = form;
  const e = formState.errors as Record<string, unknown>;
  const arms = useFieldArray({ control, name: 'arms' });
  const kind = watch('kind');
  const crossover = watch('crossover.enabled');
  const levels = design.structure.levels;
  return (
    <fieldset disabled={disabled} className="space-y-4">
      <legend className="sr-only">Assignment</legend>
      <SelectField label="What varies" {...register('kind', asOptional)} error={errorAt(e, 'kind')}>
        <option value="">Choose…</option>
        <Options words={ASSIGNMENT_KIND_WORDS} />
      </SelectField>
      <TextField label="Name of the treatment or variable" {...register('variableName')} error={errorAt(e, 'variableName')} />
      <SelectField
        label="Level at which it is assigned"
        help="The units of this level are the experimental units: what gets the treatment. If whole classrooms get the programme, choose classroom, even though pupils are measured."
        {...register('levelId', asOptional)}
        error={errorAt(e, 'levelId')}
      >
        <option value="">{levels.length ? 'Choose…' : 'Add levels in Structure first'}</option>
        {levels.map((l) => (
          <option key={l.id} value={l.id}>
            {l.name}
          </option>
        ))}
      </SelectField>
      {kind !== 'continuous' && (
        <div className="space-y-2">
          <h3 className="text-sm font-semibold">Arms and allocation</h3>
          {arms.fields.map((f, i) => (
            <div key={f.id} className="grid gap-2 @md:grid-cols-[1fr_10rem_auto]">
              <TextField label={`Arm ${i + 1} name`} {...register(`arms.${i}.name`)} error={errorAt(e, `arms.${i}.name`)} />
              <TextField label="Share" type="number" step="any" help="e.g. 1 and 1 for equal arms, 2 and 1 for 2:1" {...register(`arms.${i}.allocation`, asNumber)} error={errorAt(e, `arms.${i}.allocation`)} />
              <div className="flex items-end">
                <Button variant="ghost" onClick={() => arms.remove(i)}>
                  Remove<span className="sr-only"> arm {i + 1}</span>
                </Button>
              </div>
            </div>
          ))}
          {typeof errorAt(e, 'arms') === 'string' && <p className="text-sm text-danger">{errorAt(e, 'arms')}</p>}
          <Button variant="secondary" onClick={() => arms.append({ name: arms.fields.length === 0 ? 'Treatment' : arms.fields.length === 1 ? 'Control' : `Arm ${arms.fields.length + 1}`, allocation: 1 })}>
            Add an arm
          </Button>
        </div>
      )}
      <div className="grid gap-3 @md:grid-cols-2">
        <SelectField label="Blocking, stratification or matching" {...register('blocking.kind')}>
          <Options words={BLOCKING_WORDS} />
        </SelectField>
        <TextField label="Blocking factor" help="e.g. school, bench, litter" {...register('blocking.factor')} />
      </div>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" {...register('blocking.inAnalysis')} /> The blocking factor is in the planned analysis
      </label>
      <div className="space-y-2 border-t border-line pt-4">
        <label className="flex items-center gap-2 text-sm font-semibold">
          <input type="checkbox" {...register('crossover.enabled')} /> Cross-over: each unit receives every arm in turn
        </label>
        {crossover && (
          <div className="grid gap-3 @md:grid-cols-2">
            <TextField label="Periods" type="number" min={2} {...register('crossover.periods', asNumber)} error={errorAt(e, 'crossover.periods')} />
            <TextField label="Washout between periods" help="e.g. 7 days, none" {...register('crossover.washout')} />
            <label className="flex items-center gap-2 text-sm">
              <input type="checkbox" {...register('crossover.carryoverPossible')} /> An effect may carry over into the next period
            </label>
          </div>
        )}
      </div>
    </fieldset>
  );
}
