'use client';

import { useMemo } from 'react';
import type { UseFormRegister } from 'react-hook-form';
import { z } from 'zod';
import { HAYES_BENNETT_1999 } from '@/lib/citations';
import { Options } from '../options';
import { SelectField, TextField } from '@/components/ui/field';
import { CERTAINTY_WORDS, PROPORTION_EFFECT_WORDS, SOURCE_KIND_WORDS } from '@/lib/design/fields';
import { designFacts } from '@/lib/design/facts';
import { clusterRandomised, iccLevels } from '@/lib/design/progress';
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
    controlProportion: keep(v.controlProportion),
    proportionEffect: keep(v.proportionEffect),
    baselineRate: keep(v.baselineRate),
    rateRatio: keep(v.rateRatio),
    followUpTime: keep(v.followUpTime),
    dispersion: keep(v.dispersion),
    betweenClusterCv: keep(v.betweenClusterCv),
    iccs: Array.isArray(v.iccs) ? v.iccs.filter((c) => keep(c)) : [],
  };
}

const formSchema = z.preprocess(clean, assumptionsSchema);

/** The outcome numbers entered as a value with a source. */
type OutcomeNumber = 'controlProportion' | 'baselineRate' | 'rateRatio' | 'followUpTime' | 'dispersion' | 'betweenClusterCv';

function SourceFields({ path, register, e }: { path: string; register: UseFormRegister<Assumptions>; e: Record<string, unknown> }) {
  return (
    <div className="grid gap-2 @md:grid-cols-2 @2xl:grid-cols-3">
      <SelectField label="Source" {...register(`${path}.source.kind` as never)}>
        <Options words={SOURCE_KIND_WORDS} />
      </SelectField>
      <TextField label="Citation or note" {...register(`${path}.source.citation` as never)} error={errorAt(e, `${path}.source.citation`)} />
      <SelectField label="How sure the team is" {...register(`${path}.source.certainty` as never)}>
        <Options words={CERTAINTY_WORDS} />
      </SelectField>
    </div>
  );
}

function withAllIccs(value: Assumptions, design: Design): Assumptions {
  const iccs = iccLevels(design).map(
    (l) => value.iccs.find((c) => c.levelId === l.id) ?? ({ levelId: l.id, value: undefined, source: { kind: 'none', certainty: 'low' } } as unknown as Assumptions['iccs'][number]),
  );
  // The effect's form starts as the second proportion until the team picks another.
  const proportionEffect = value.proportionEffect ?? ({ measure: 'p2', source: { kind: 'none', certainty: 'low' } } as unknown as Assumptions['proportionEffect']);
  return { ...value, iccs, proportionEffect };
}

export function AssumptionsStep({ value, design, onValid, onDraft, disabled }: StepProps<'assumptions'>) {
  const initial = useMemo(() => withAllIccs(value, design), [value, design]);
  const form = useStepForm(formSchema, initial, onValid, onDraft);
  const { register, formState } = form;
  const e = formState.errors as Record<string, unknown>;
  const unit = design.outcome.unit ? ` (${design.outcome.unit})` : '';
  const levels = iccLevels(design);
  const repeated = designFacts(design).measuredOverTime;
  const type = design.outcome.type;
  /** One number with its source. */
  const sourced = (path: OutcomeNumber, label: string, help: string, bounds: { min?: number; max?: number } = {}) => (
    <section key={path} className="space-y-2 rounded-md border border-line bg-white p-3">
      <TextField label={label} help={help} type="number" step="any" {...bounds} {...register(`${path}.value`, asNumber)} error={errorAt(e, `${path}.value`)} />
      <SourceFields path={path} register={register} e={e} />
    </section>
  );

  return (
    <fieldset disabled={disabled} className="space-y-5">
      <legend className="sr-only">Assumptions</legend>
      <p className="text-sm text-muted">Each number needs a source: a published study, pilot data or expert judgement. The checks flag numbers without one, and the Plan will show how much the answer depends on them.</p>
      {type === 'binary' ? (
        <>
          {sourced('controlProportion', 'Proportion expected without the intervention', 'The share with the outcome in the comparison arm, as a fraction (0.55 = 55%).', { min: 0, max: 1 })}
          <section className="space-y-2 rounded-md border border-line bg-white p-3">
            <div className="grid gap-2 @md:grid-cols-2">
              <SelectField label="State the effect worth detecting as" {...register('proportionEffect.measure')}>
                <Options words={PROPORTION_EFFECT_WORDS} />
              </SelectField>
              <TextField
                label="Effect worth detecting"
                help="The smallest effect that would matter in practice, in the form chosen: e.g. 0.7, a difference of 0.15, a risk ratio of 1.25 or an odds ratio of 1.9."
                type="number"
                step="any"
                {...register('proportionEffect.value', asNumber)}
                error={errorAt(e, 'proportionEffect.value')}
              />
            </div>
            <SourceFields path="proportionEffect" register={register} e={e} />
          </section>
        </>
      ) : type === 'count' ? (
        <>
          {sourced(
            'baselineRate',
            'Baseline rate (events per unit of follow-up time)',
            'Events expected per unit without the intervention, per unit of the time the follow-up is given in: e.g. 0.3 infections a person-year with follow-up in years.',
            { min: 0 },
          )}
          {sourced('rateRatio', 'Rate ratio worth detecting', 'The rate with the intervention divided by the baseline rate: 0.8 is a 20% reduction, 1.25 a 25% increase.', { min: 0 })}
          {sourced('followUpTime', 'Follow-up time per unit', 'How long each unit is followed, in the same time unit as the rate.', { min: 0 })}
          {sourced(
            'dispersion',
            'Overdispersion between units',
            'How much more units differ than chance alone makes them: 0 for plain (Poisson) counts; the variance of a count is its mean + dispersion × mean² (1 / k for a negative binomial k).',
            { min: 0 },
          )}
          {clusterRandomised(design) &&
            sourced(
              'betweenClusterCv',
              'Between-cluster coefficient of variation of the rate',
              `How much the true rates of the randomised clusters differ within an arm: the SD of the cluster rates divided by their mean (${HAYES_BENNETT_1999.short}).`,
              { min: 0 },
            )}
        </>
      ) : (
        <>
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
        </>
      )}
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
      <div className="grid gap-3 @md:grid-cols-2">
        <TextField label="Significance level (α)" type="number" step="any" {...register('alpha', asNumber)} error={errorAt(e, 'alpha')} />
        <TextField label="Target power" type="number" step="any" {...register('power', asNumber)} error={errorAt(e, 'power')} />
      </div>
    </fieldset>
  );
}
