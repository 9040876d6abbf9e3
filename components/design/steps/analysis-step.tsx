'use client';

import { useState } from 'react';
import {
  BLOCK_EFFECT_WORDS,
  COVARIANCE_WORDS,
  DF_METHOD_WORDS,
  GLM_FAMILY_WORDS,
  METHOD_WORDS,
  MISSING_DATA_WORDS,
  MULTIPLICITY_WORDS,
  STANDARD_ERROR_WORDS,
  TIME_MODEL_WORDS,
  TRANSFORMATION_WORDS,
} from '@/lib/design/fields';
import { Options } from '../options';
import { SelectField, TextAreaField } from '@/components/ui/field';
import { analysisSchema } from '@/lib/design/schema';
import { asOptional, errorAt, useStepForm } from '../step-form';
import type { StepProps } from './types';

export function AnalysisStep({ value, design, onValid, onDraft, disabled }: StepProps<'analysis'>) {
  const form = useStepForm(analysisSchema, value, onValid, onDraft);
  const { register, formState, watch, setValue } = form;
  const e = formState.errors as Record<string, unknown>;
  const method = watch('method');
  const levels = design.structure.levels;
  const random = levels.filter((l) => l.kind !== 'replicate');
  // Levels that can take a fixed effect: those that group units below them (not the bottom level).
  const groupingLevels = levels.slice(0, -1).filter((l) => l.kind !== 'replicate');
  const fixedLevels: string[] = watch('fixedEffectLevels') ?? [];
  const [fixedOpenAtStart] = useState(fixedLevels.length > 0);
  const toggleFixed = (id: string, on: boolean) =>
    setValue('fixedEffectLevels', on ? [...fixedLevels.filter((x) => x !== id), id] : fixedLevels.filter((x) => x !== id), { shouldDirty: true, shouldValidate: true });
  const blocking = design.assignment.blocking;
  const modelMethod = method !== undefined && !['t-test', 'paired-t-test', 'per-occasion-tests', 'cluster-means', 'gee', 'other'].includes(method);
  return (
    <fieldset disabled={disabled} className="space-y-4">
      <legend className="sr-only">Analysis plan</legend>
      <p className="text-sm text-muted">What the team intends to run. The checks compare it with the design and say what the design calls for.</p>
      <SelectField label="Planned analysis" {...register('method', asOptional)} error={errorAt(e, 'method')}>
        <option value="">Choose…</option>
        <Options words={METHOD_WORDS} />
      </SelectField>
      <SelectField
        label="Unit counted as n"
        help="Which units the analysis treats as independent observations: every row of data, or the means of a higher level."
        {...register('unitOfAnalysisLevelId', asOptional)}
        error={errorAt(e, 'unitOfAnalysisLevelId')}
      >
        <option value="">Choose…</option>
        {levels.map((l) => (
          <option key={l.id} value={l.id}>
            {l.name}
          </option>
        ))}
      </SelectField>
      {(method === 'mixed-model' || method === 'glmm') && (
        <fieldset className="space-y-1">
          <legend className="text-sm font-semibold">Random intercepts for</legend>
          {random.map((l) => (
            <label key={l.id} className="flex items-center gap-2 text-sm">
              <input type="checkbox" value={l.id} {...register('randomIntercepts')} /> {l.name}
            </label>
          ))}
          <label className="mt-2 flex items-center gap-2 text-sm">
            <input type="checkbox" {...register('randomSlopeForTime')} /> A random slope for time (units change at different rates)
          </label>
        </fieldset>
      )}
      {modelMethod && groupingLevels.length > 0 && (
        // Folded away unless used: an option for levels with few units, which most plans do not need.
        <details open={fixedOpenAtStart} className="text-sm">
          <summary className="cursor-pointer font-semibold">Levels with few units as fixed effects</summary>
          <fieldset className="mt-2 space-y-1">
            <legend className="text-muted">A level with few units (fewer than about 5–6 sites, donors, litters or batches) as a fixed effect instead of a random intercept.</legend>
            {groupingLevels.map((l) => (
              <label key={l.id} className="flex items-center gap-2">
                <input type="checkbox" checked={fixedLevels.includes(l.id)} onChange={(ev) => toggleFixed(l.id, ev.target.checked)} /> {l.name}
              </label>
            ))}
          </fieldset>
        </details>
      )}
      {blocking.kind !== 'none' && (
        <SelectField
          label={`The blocking factor${blocking.factor ? ` (${blocking.factor})` : ''} in the model`}
          help="How the planned model carries the factor the randomisation was blocked, stratified or matched by."
          {...register('blockEffect', asOptional)}
        >
          <option value="">Not in the model</option>
          <Options words={BLOCK_EFFECT_WORDS} />
        </SelectField>
      )}
      <div className="grid gap-3 @md:grid-cols-2">
        <SelectField label="Family (for a GLM or GLMM)" {...register('glmFamily', asOptional)}>
          <option value="">Not applicable</option>
          <Options words={GLM_FAMILY_WORDS} />
        </SelectField>
        <SelectField label="Standard errors" {...register('standardErrors')}>
          <Options words={STANDARD_ERROR_WORDS} />
        </SelectField>
        <SelectField label="Degrees of freedom" {...register('dfMethod')}>
          <Options words={DF_METHOD_WORDS} />
        </SelectField>
        <SelectField label="Scale of the outcome" {...register('transformation')}>
          <Options words={TRANSFORMATION_WORDS} />
        </SelectField>
        <SelectField label="Time in the model" {...register('timeModel')}>
          <Options words={TIME_MODEL_WORDS} />
        </SelectField>
        <SelectField label="Correlation between occasions in the model" {...register('covarianceStructure')}>
          <Options words={COVARIANCE_WORDS} />
        </SelectField>
        <SelectField label="Missing data" {...register('missingData')}>
          <Options words={MISSING_DATA_WORDS} />
        </SelectField>
        <SelectField label="Several primary outcomes" {...register('multiplicity')}>
          <Options words={MULTIPLICITY_WORDS} />
        </SelectField>
      </div>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" {...register('adjustsForBaseline')} /> Adjusts for the baseline measurement
      </label>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" {...register('modelVariance')} /> Models a different variance per arm
      </label>
      <TextAreaField label="Plan for outliers" rows={2} {...register('outlierPlan')} error={errorAt(e, 'outlierPlan')} />
      <TextAreaField label="Notes" rows={3} {...register('notes')} error={errorAt(e, 'notes')} />
    </fieldset>
  );
}
