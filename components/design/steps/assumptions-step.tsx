'use client';

import { useMemo } from 'react';
import type { UseFormRegister } from 'react-hook-form';
import { z } from 'zod';
import { SelectField, TextField } from '@/components/ui/field';
import { designFacts } from '@/lib/design/facts';
import { iccLevels } from '@/lib/design/progress';
import { assumptionsSchema, type Assumptions, type Design } from '@/lib/design/schema';
import { asNumber, errorAt, useStepForm } from '../step-form';
import type { StepProps } from './types';

type Sourced = { value?: number; source?: { kind?: string; citation?: string; certainty?: string } };

/** Blank numbers mean "not given yet": drop them before validation instead of failing. */
function clean(raw: unknown): unknown {
  const v = (raw ?? {}) as Record<string, unknown>;
  const keep = (s: unknown) => (s && typeof (s as Sourced).value === 'number' && !Number.isNaN((s as Sourced).value) ? s : undefined);
  return {
    ...v,
    outcomeSd: keep(v.outcomeSd),
    effect: keep(v.effect),
    occasionCorrelation: keep(v.occasionCorrelation),
    iccs: Array.isArray(v.iccs) ? v.iccs.filter((c) => keep(c)) : [],
  };
}

const formSchema = z.preprocess(clean, assumptionsSchema);

function SourceFields({ path, register, e }: { path: string; register: UseFormRegister<Assumptions>; e: Record<string, unknown> }) {
  return (
    <div className="grid gap-2 sm:grid-cols-3">
      <SelectField label="Source" {...register(`${path}.source.kind` as never)}>
        <option value="none">No source yet</option>
        <option value="published">A published study</option>
        <option value="pilot">Pilot data</option>
        <option value="expert">Expert judgement</option>
      </SelectField>
      <TextField label="Citation or note" {...register(`${path}.source.citation` as never)} error={errorAt(e, `${path}.source.citation`)} />
      <SelectField label="How sure the team is" {...register(`${path}.source.certainty` as never)}>
        <option value="low">Not sure</option>
        <option value="medium">Fairly sure</option>
        <option value="high">Sure</option>
      </SelectField>
    </div>
  );
}

function withAllIccs(value: Assumptions, design: Design): Assumptions {
  const iccs = iccLevels(design).map(
    (l) => value.iccs.find((c) => c.levelId === l.id) ?? ({ levelId: l.id, value: undefined, source: { kind: 'none', certainty: 'low' } } as unknown as Assumptions['iccs'][number]),
  );
  return { ...value, iccs };
}

export function AssumptionsStep({ value, design, onValid, onDraft, disabled }: StepProps<'assumptions'>) {
  const initial = useMemo(() => withAllIccs(value, design), [value, design]);
  const form = useStepForm(formSchema, initial, onValid, onDraft);
  const { register, formState } = form;
  const e = formState.errors as Record<string, unknown>;
  const unit = design.outcome.unit ? ` (${design.outcome.unit})` : '';
  const levels = iccLevels(design);
  const repeated = designFacts(design).measuredOverTime;

  return (
    <fieldset disabled={disabled} className="space-y-5">
      <legend className="sr-only">Assumptions</legend>
      <p className="text-sm text-muted">Each number needs a source: a published study, pilot data or expert judgement. The checks flag numbers without one, and the Plan will show how much the answer depends on them.</p>
      <section className="space-y-2 rounded-md border border-line bg-white p-3">
        <TextField label={`Standard deviation of the outcome${unit}`} type="number" step="any" min={0} {...register('outcomeSd.value', asNumber)} error={errorAt(e, 'outcomeSd.value')} />
        <SourceFields path="outcomeSd" register={register} e={e} />
      </section>
      <section className="space-y-2 rounded-md border border-line bg-white p-3">
        <TextField
          label={`Smallest important difference${unit}`}
          help="The smallest difference between arms that would matter in practice; the study is sized to detect it."
          type="number"
          step="any"
          min={0}
          {...register('effect.value', asNumber)}
          error={errorAt(e, 'effect.value')}
        />
        <SourceFields path="effect" register={register} e={e} />
      </section>
      {levels.map((l, i) => (
        <section key={l.id} className="space-y-2 rounded-md border border-line bg-white p-3">
          <input type="hidden" {...register(`iccs.${i}.levelId`)} />
          <TextField
            label={`Intracluster correlation (ICC) for ${l.name}`}
            help={`The share of the outcome's variance that lies between ${l.name.toLowerCase()} units: 0 means units within one ${l.name.toLowerCase()} are no more alike than any two; typical values in education are 0.05–0.25.`}
            type="number"
            step="any"
            min={0}
            max={1}
            {...register(`iccs.${i}.value`, asNumber)}
            error={errorAt(e, `iccs.${i}.value`)}
          />
          <SourceFields path={`iccs.${i}`} register={register} e={e} />
        </section>
      ))}
      {repeated && (
        <section className="space-y-2 rounded-md border border-line bg-white p-3">
          <TextField
            label="Correlation between occasions"
            help="How alike two measurements of the same unit are (between −1 and 1); it decides how much a baseline helps."
            type="number"
            step="any"
            min={-1}
            max={1}
            {...register('occasionCorrelation.value', asNumber)}
            error={errorAt(e, 'occasionCorrelation.value')}
          />
          <SourceFields path="occasionCorrelation" register={register} e={e} />
        </section>
      )}
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Significance level (α)" type="number" step="any" {...register('alpha', asNumber)} error={errorAt(e, 'alpha')} />
        <TextField label="Target power" type="number" step="any" {...register('power', asNumber)} error={errorAt(e, 'power')} />
      </div>
    </fieldset>
  );
}
