'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useForm, useWatch } from 'react-hook-form';
import type { AnalysisName } from '@/lib/models/types';
import { formatBound, SCENARIO_RANGES, type SimulationSpec, type SimulationSpecInput, type Violation } from '@/lib/sim/spec';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { formDefaults, MAX_TAB_REPLICATES, MIN_REPLICATES, offeredViolations, runFormSchema, scenarioFromForm, toSpec, type RunFormValues } from './run-form-schema';
import { ANALYSIS_TITLES, describeScenario, formatRate, rateMcse, VIOLATION_TITLES } from './words';
import { formatCount } from '@/lib/format';

export interface RunFormProps {
  /** The specification from the design (lib/sim/from-design.ts), with defaults applied. */
  base: SimulationSpec;
  /** The analyses that apply to the simulated data, as lib/sim/analyses.ts decides them. */
  analyses: AnalysisName[];
  pending: boolean;
  onRun: (spec: SimulationSpecInput) => void;
}

const numberField = { valueAsNumber: true } as const;

/** Scenarios, analyses, replicates and seed of a new run, with the Monte Carlo SE the replicates give. */
export function RunForm({ base, analyses, pending, onRun }: RunFormProps) {
  const form = useForm<RunFormValues>({ resolver: zodResolver(runFormSchema), defaultValues: formDefaults(base), mode: 'onChange' });
  const { register, handleSubmit, control, formState } = form;
  const errors = formState.errors;
  const values = useWatch({ control }) as RunFormValues;
  const hasOccasions = base.design.occasions !== undefined;
  const replicates = Number(values.replicates);
  const mcse = Number.isFinite(replicates) && replicates > 0 ? rateMcse(0.05, replicates) : null;

  /** The scenario as the engine will read it, in plain words with the parameters as they stand. */
  const preview = (v: Violation) => {
    if (!values.scenarios) return VIOLATION_TITLES[v];
    const s = scenarioFromForm(v, values.scenarios, hasOccasions);
    return Object.values(s).every((x) => typeof x !== 'number' || Number.isFinite(x)) ? describeScenario(s) : VIOLATION_TITLES[v];
  };

  const scenarioError = errors.scenarios?.none?.on?.message ?? errors.scenarios?.root?.message ?? errors.scenarios?.message;

  return (
    <form aria-labelledby="run-heading" noValidate onSubmit={handleSubmit((v) => onRun(toSpec(base, v)))} className="space-y-5 rounded-lg border border-line bg-white p-5">
      <h2 id="run-heading" className="text-lg font-bold">
        New stress test
      </h2>

      <fieldset className="space-y-3" aria-describedby={scenarioError ? 'scenario-error' : undefined}>
        <legend className="text-sm font-bold">Scenarios: which assumption the simulated data break</legend>
        {offeredViolations(base).map((v) => (
          <div key={v} className="rounded-md border border-line/70 p-3">
            <label className="flex items-start gap-2 text-sm">
              <input type="checkbox" className="mt-1" {...register(`scenarios.${v}.on`)} />
              <span data-testid={`scenario-${v}`}>{preview(v)}</span>
            </label>
            {values.scenarios?.[v]?.on && v !== 'none' && (
              <div className="mt-2 grid gap-3 pl-6 sm:grid-cols-2">
                {v === 'skewed' && (
                  <TextField label={`σ of the log (${formatBound(SCENARIO_RANGES.skewed.sigmaLog.min)}–${formatBound(SCENARIO_RANGES.skewed.sigmaLog.max)})`} type="number" step="0.1" error={errors.scenarios?.skewed?.sigmaLog?.message} {...register('scenarios.skewed.sigmaLog', numberField)} />
                )}
                {v === 'heavy-tailed' && (
                  <TextField label={`Degrees of freedom of the t (above ${formatBound(SCENARIO_RANGES['heavy-tailed'].df.min)})`} type="number" step="1" error={errors.scenarios?.['heavy-tailed']?.df?.message} {...register('scenarios.heavy-tailed.df', numberField)} />
                )}
                {v === 'outliers' && (
                  <>
                    <TextField label="Share of outlying errors (%)" type="number" step="1" error={errors.scenarios?.outliers?.percent?.message} {...register('scenarios.outliers.percent', numberField)} />
                    <TextField label="Outlying errors multiplied by" type="number" step="1" error={errors.scenarios?.outliers?.scale?.message} {...register('scenarios.outliers.scale', numberField)} />
                  </>
                )}
                {v === 'unequal-variance' && (
                  <TextField
                    label="SD in arm 2 over SD in arm 1"
                    type="number"
                    step="0.1"
                    error={errors.scenarios?.['unequal-variance']?.sdRatio?.message}
                    {...register('scenarios.unequal-variance.sdRatio', numberField)}
                  />
                )}
                {v === 'nonlinear' && (
                  <TextField
                    label="Rise of the quadratic curve (outcome SDs)"
                    type="number"
                    step="0.5"
                    help={hasOccasions ? 'Curved in time; the analyses fit a straight line.' : 'Curved in a covariate; the analyses fit a straight line.'}
                    error={errors.scenarios?.nonlinear?.strength?.message}
                    {...register('scenarios.nonlinear.strength', numberField)}
                  />
                )}
                {v === 'serial' && (
                  <TextField label="AR(1) correlation of neighbouring occasions (ρ)" type="number" step="0.1" error={errors.scenarios?.serial?.ar?.message} {...register('scenarios.serial.ar', numberField)} />
                )}
                {v === 'carry-over' && (
                  <TextField
                    label="Share of the effect carried into the next period (%)"
                    type="number"
                    step="10"
                    help="After a period of the second arm, this share of its effect is still present in the next period; the analyses adjust for period but not for carry-over."
                    error={errors.scenarios?.['carry-over']?.percent?.message}
                    {...register('scenarios.carry-over.percent', numberField)}
                  />
                )}
              </div>
            )}
          </div>
        ))}
        {scenarioError && (
          <p id="scenario-error" className="text-sm font-medium text-danger">
            {scenarioError}
          </p>
        )}
      </fieldset>

      <fieldset className="space-y-2" aria-describedby={errors.analyses ? 'analysis-error' : undefined}>
        <legend className="text-sm font-bold">Analyses to compare</legend>
        {analyses.map((a) => (
          <label key={a} className="flex items-start gap-2 text-sm">
            <input type="checkbox" value={a} className="mt-1" {...register('analyses')} />
            <span>{ANALYSIS_TITLES[a]}</span>
          </label>
        ))}
        {errors.analyses && (
          <p id="analysis-error" className="text-sm font-medium text-danger">
            {errors.analyses.message}
          </p>
        )}
      </fieldset>

      {base.design.target === 'treat:time' && (
        <TextField
          label="SD of the units' slopes over time"
          type="number"
          min={0}
          step="any"
          help="How much each unit's own trend differs from its arm's, in outcome units per time unit. The design does not give it; 0 (the Plan's assumption) means parallel trends within an arm."
          error={errors.slopeSd?.message}
          {...register('slopeSd', numberField)}
        />
      )}

      <div className="grid gap-4 sm:grid-cols-2">
        <TextField
          label="Replicates per scenario"
          type="number"
          min={MIN_REPLICATES}
          max={MAX_TAB_REPLICATES}
          step={100}
          help={
            mcse !== null
              ? `A 5% rate is then estimated with a Monte Carlo SE of ${formatRate(mcse).replace('%', '')} percentage points (√(0.05 × 0.95 / ${formatCount(replicates)})).`
              : `Between ${MIN_REPLICATES} and ${formatCount(MAX_TAB_REPLICATES)}.`
          }
          error={errors.replicates?.message}
          {...register('replicates', numberField)}
        />
        <TextField
          label="Seed"
          type="number"
          min={0}
          step={1}
          help="The same seed gives the same results, whatever the number of workers."
          error={errors.seed?.message}
          {...register('seed', numberField)}
        />
      </div>

      <Button type="submit" disabled={pending}>
        {pending ? 'Starting…' : 'Run the stress test'}
      </Button>
    </form>
  );
}
