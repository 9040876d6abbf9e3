'use client';

import { useState } from 'react';
import { DF_METHOD_WORDS, GLM_FAMILY_WORDS, optionsOf, STANDARD_ERROR_WORDS } from '../analysis-words';
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
        <option value="t-test">t-test comparing the arms</option>
        <option value="paired-t-test">Paired t-test (differences within pairs or units)</option>
        <option value="per-occasion-tests">A separate test or ANOVA at each occasion</option>
        <option value="linear-regression">Linear regression (ordinary least squares)</option>
        <option value="ancova">ANCOVA adjusting for baseline</option>
        <option value="mixed-model">Linear mixed model (random effects)</option>
        <option value="gee">GEE</option>
        <option value="cluster-means">Analysis of cluster or unit means</option>
        <option value="glm">Generalised linear model (GLM)</option>
        <option value="glmm">Generalised linear mixed model (GLMM)</option>
        <option value="robust-regression">Robust regression</option>
        <option value="other">Other</option>
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
          <option value="fixed">As a fixed effect</option>
          <option value="random">As a random effect</option>
        </SelectField>
      )}
      <div className="grid gap-3 @md:grid-cols-2">
        <SelectField label="Family (for a GLM or GLMM)" {...register('glmFamily', asOptional)}>
          <option value="">Not applicable</option>
          {optionsOf(GLM_FAMILY_WORDS).map(([value, words]) => (
            <option key={value} value={value}>
              {words}
            </option>
          ))}
        </SelectField>
        <SelectField label="Standard errors" {...register('standardErrors')}>
          {optionsOf(STANDARD_ERROR_WORDS).map(([value, words]) => (
            <option key={value} value={value}>
              {words}
            </option>
          ))}
        </SelectField>
        <SelectField label="Degrees of freedom" {...register('dfMethod')}>
          {optionsOf(DF_METHOD_WORDS).map(([value, words]) => (
            <option key={value} value={value}>
              {words}
            </option>
          ))}
        </SelectField>
        <SelectField label="Scale of the outcome" {...register('transformation')}>
          <option value="none">As measured</option>
          <option value="log">Log scale</option>
          <option value="other">Other transformation</option>
        </SelectField>
        <SelectField label="Time in the model" {...register('timeModel')}>
          <option value="not-applicable">Not applicable</option>
          <option value="categorical">Each occasion separately</option>
          <option value="linear">Linear trend</option>
          <option value="polynomial">Polynomial</option>
          <option value="spline">Spline</option>
        </SelectField>
        <SelectField label="Correlation between occasions in the model" {...register('covarianceStructure')}>
          <option value="not-applicable">Not applicable</option>
          <option value="independence">Independence</option>
          <option value="exchangeable">Exchangeable</option>
          <option value="ar1">AR(1)</option>
          <option value="unstructured">Unstructured</option>
        </SelectField>
        <SelectField label="Missing data" {...register('missingData')}>
          <option value="not-planned">Not planned yet</option>
          <option value="complete-case">Complete cases only</option>
          <option value="mixed-model-mar">All data, mixed model (missing at random)</option>
          <option value="multiple-imputation">Multiple imputation</option>
        </SelectField>
        <SelectField label="Several primary outcomes" {...register('multiplicity')}>
          <option value="none">No adjustment</option>
          <option value="bonferroni">Bonferroni</option>
          <option value="holm">Holm</option>
          <option value="hierarchical">Fixed order (hierarchical testing)</option>
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
