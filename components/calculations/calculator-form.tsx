'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { useForm, type FieldValues, type Resolver } from 'react-hook-form';
import { asNumber, errorAt } from '@/components/design/step-form';
import { Alert } from '@/components/ui/alert';
import { SelectField, TextField } from '@/components/ui/field';
import { CALCULATION_EXAMPLES } from '@/lib/api/calculation-examples';
import { calculate } from '@/lib/stats/calculations';
import { CalculationInputError } from '@/lib/stats/calculations/errors';
import type { CalculationOutput } from '@/lib/stats/calculations/types';
import { calculationSchema, SOLVABLE, type CalculationKind, type CalculationRequest } from '@/lib/stats/calculations/request';
import { formatValue, labelOf } from './format';
import { fieldsShown, groupFields, kindInfo, modeShown, SOLVE_LABELS, type FieldSpec, type KindInfo } from './kinds';
import { headlineKeys } from './meaning';
import { ResultPanel } from './result-panel';
import { RadioChoice, SolveForChoice } from './solve-for-choice';

/** Delay after the last keystroke before the answer is worked out again. */
const DEBOUNCE_MS = 250;

type Values = Record<string, unknown>;

const schemaOf = (kind: CalculationKind) => calculationSchema.options.find((o) => o.shape.kind.value === kind)!;

/**
 * The request a form state stands for: the kind, every shown field that has a value, and
 * `solveFor`. The quantity solved for and the fields of the other mode are left out; a number
 * that is not one (NaN) stays in, so that the schema says what is wrong with it.
 */
function toRequest(info: KindInfo, values: Values, solveFor: string | null, mode: string | null): Values {
  const out: Values = { kind: info.kind };
  for (const field of visibleFields(info, solveFor, mode)) {
    const v = values[field.name];
    if (v === undefined || v === null || v === '') continue;
    out[field.name] = v;
  }
  if (solveFor) out.solveFor = solveFor;
  return out;
}

const visibleFields = fieldsShown;

/** Starting state of a kind: its demo example with the schema's defaults filled in. */
function initialState(kind: CalculationKind): { values: Values; solveFor: string | null; mode: string | null } {
  const example = CALCULATION_EXAMPLES[kind].request as Values;
  const values = schemaOf(kind).parse(example) as Values;
  const solveFor = SOLVABLE[kind].find((k) => !(k in example) && !(k === 'f2' && 'slope' in example)) ?? null;
  const info = kindInfo(kind)!;
  const mode = info.mode ? (info.mode.options.find(([m]) => info.fields.some((f) => f.modes?.includes(m) && f.name in example))?.[0] ?? info.mode.options[0]![0]) : null;
  return { values, solveFor, mode };
}

/** A solved value carried into its field when the user solves for something else. */
function asInput(field: FieldSpec | undefined, value: unknown): unknown {
  if (typeof value !== 'number' || !Number.isFinite(value)) return undefined;
  if (field?.input === 'whole') return Math.ceil(value);
  return Number(value.toPrecision(4));
}

const isEmpty = (v: unknown) => v === undefined || v === null || v === '' || (typeof v === 'number' && Number.isNaN(v));

const parseTimes = (v: unknown) => {
  if (Array.isArray(v)) return v;
  const text = String(v ?? '').trim();
  if (!text) return undefined;
  return text.split(/[\s,;]+/).filter(Boolean).map(Number);
};

type Status = { tone: 'error'; message: string } | null;

export function CalculatorForm({ kind }: { kind: CalculationKind }) {
  const info = kindInfo(kind)!;
  const start = useMemo(() => initialState(kind), [kind]);
  const [solveFor, setSolveFor] = useState<string | null>(start.solveFor);
  const [mode, setMode] = useState<string | null>(start.mode);
  const [output, setOutput] = useState<CalculationOutput | null>(null);
  const [request, setRequest] = useState<CalculationRequest | undefined>(undefined);
  const [status, setStatus] = useState<Status>(null);
  const choice = useRef({ solveFor, mode });
  choice.current = { solveFor, mode };

  const schema = schemaOf(kind);
  const resolver = useCallback<Resolver<FieldValues>>(
    (values, context, options) => zodResolver(schema as never)(toRequest(info, values, choice.current.solveFor, choice.current.mode) as never, context, options as never) as never,
    [info, schema],
  );
  const form = useForm<FieldValues>({ resolver, defaultValues: start.values, mode: 'onChange' });

  const compute = useCallback(() => {
    const request = toRequest(info, form.getValues(), choice.current.solveFor, choice.current.mode);
    const parsed = calculationSchema.safeParse(request);
    if (!parsed.success) {
      void form.trigger();
      const first = parsed.error.issues[0];
      setOutput(null);
      setStatus({ tone: 'error', message: `Check the highlighted values. ${first?.message ?? ''}`.trim() });
      return;
    }
    form.clearErrors();
    try {
      setOutput(calculate(parsed.data));
      setRequest(parsed.data);
      setStatus(null);
    } catch (err) {
      setOutput(null);
      if (err instanceof CalculationInputError) {
        for (const [name, messages] of Object.entries(err.fields)) form.setError(name, { type: 'calculation', message: messages[0] });
        setStatus({ tone: 'error', message: err.message });
      } else {
        console.error(err);
        setStatus({ tone: 'error', message: 'This combination of values could not be worked out. Change a value and try again.' });
      }
    }
  }, [form, info]);

  const timer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);
  const schedule = useCallback(() => {
    clearTimeout(timer.current);
    timer.current = setTimeout(compute, DEBOUNCE_MS);
  }, [compute]);

  useEffect(() => {
    const sub = form.watch(() => schedule());
    return () => {
      sub.unsubscribe();
      clearTimeout(timer.current);
    };
  }, [form, schedule]);

  // Work the answer out at once on arrival and whenever the unknown or the mode changes.
  useEffect(() => {
    compute();
  }, [compute, solveFor, mode]);

  function chooseUnknown(next: string) {
    if (next === solveFor) return;
    // The value just solved for becomes an input. It keeps what the user typed there before;
    // only a field that was never filled starts from the answer (never overwrite an input).
    if (solveFor && output && isEmpty(form.getValues(solveFor))) {
      const value = asInput(info.fields.find((f) => f.name === solveFor), output.result[solveFor]);
      if (value !== undefined) form.setValue(solveFor, value);
    }
    setSolveFor(next);
  }

  function chooseMode(next: string) {
    // An effect worked out in one form starts the other (regression: f² from the slope and back).
    for (const field of info.fields) {
      if (!field.modes?.includes(next) || field.modes.includes(mode ?? '')) continue;
      const current = form.getValues(field.name);
      const value = asInput(field, output?.result[field.name]);
      if ((current === undefined || current === '') && value !== undefined) form.setValue(field.name, value);
    }
    setMode(next);
  }

  const errors = form.formState.errors as Record<string, unknown>;
  const fields = visibleFields(info, solveFor, mode);
  const solvable = [...SOLVABLE[kind]].sort((a, b) => solveOrder(a) - solveOrder(b));
  const headline = output ? headlineKeys(output) : [];

  return (
    <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,5fr)_minmax(0,7fr)]">
      <form noValidate onSubmit={(e) => e.preventDefault()} aria-labelledby="inputs-heading" className="space-y-5 rounded-lg border border-line bg-white p-5">
        <h2 id="inputs-heading" className="text-lg font-bold">
          Inputs
        </h2>
        <SolveForChoice name="solveFor" solvable={solvable} value={solveFor} onChange={chooseUnknown} labelOf={(q) => solveLabel(kind, q)} />
        {info.mode && modeShown(info, solveFor) && <RadioChoice legend={info.mode.legend} name="mode" options={info.mode.options} value={mode} onChange={chooseMode} />}
        {groupFields(fields).map((group) => {
          const grid = (
            <div className="grid gap-4 sm:grid-cols-2">
              {group.fields.map((field) => (
                <Field key={field.name} field={field} form={form} error={fieldError(errors, field.name)} />
              ))}
            </div>
          );
          return group.legend === null ? (
            <div key="(ungrouped)">{grid}</div>
          ) : (
            <fieldset key={group.legend} className="space-y-3 border-t border-line pt-4">
              <legend className="pr-2 text-sm font-bold">{group.legend}</legend>
              {grid}
            </fieldset>
          );
        })}
      </form>
      <div className="space-y-4">
        <div aria-live="polite" aria-atomic="true" className="space-y-2">
          {status && (
            <Alert live tone="error">
              {status.message}
            </Alert>
          )}
          {output && (
            <p className="sr-only">
              {headline.map((k) => `${labelOf(k)}: ${formatValue(k, output.result[k])}`).join('; ')}
            </p>
          )}
        </div>
        {output ? (
          <ResultPanel output={output} request={request} />
        ) : (
          !status && <p className="text-sm text-muted">Working out the answer…</p>
        )}
      </div>
    </div>
  );
}

/** Sizes first, then power, then the effect: "Solve for: sample size | power | smallest detectable effect". */
function solveOrder(name: string): number {
  if (name === 'power') return 1;
  return ['nPerGroup', 'n', 'clustersPerArm', 'clusterSize'].includes(name) ? 0 : 2;
}

function solveLabel(kind: CalculationKind, name: string): string {
  if (kind === 'cluster-means' && name === 'clusterSize') return 'units per cluster';
  return SOLVE_LABELS[name] ?? labelOf(name).toLowerCase();
}

/** A field's own message, or the first message nested under it (an entry of times). */
function fieldError(errors: Record<string, unknown>, name: string): string | undefined {
  const own = errorAt(errors, name);
  if (own) return own;
  const nested = errors[name];
  if (nested && typeof nested === 'object') {
    for (const value of Object.values(nested)) {
      const message = (value as { message?: string } | undefined)?.message;
      if (message) return message;
    }
  }
  return undefined;
}

function Field({ field, form, error }: { field: FieldSpec; form: ReturnType<typeof useForm<FieldValues>>; error: string | undefined }) {
  const { register } = form;
  switch (field.input) {
    case 'select':
      return (
        <SelectField label={field.label} help={field.help} error={error} {...register(field.name, field.name === 'sides' ? { setValueAs: (v) => Number(v) } : {})}>
          {field.options!.map(([value, label]) => (
            <option key={value} value={value}>
              {label}
            </option>
          ))}
        </SelectField>
      );
    case 'checkbox':
      return (
        <div className="space-y-1">
          <label className="flex items-center gap-2 text-sm font-semibold">
            <input type="checkbox" aria-describedby={`${field.name}-help`} {...register(field.name)} /> {field.label}
          </label>
          <p id={`${field.name}-help`} className="text-sm text-muted">
            {field.help}
          </p>
        </div>
      );
    case 'times':
      return <TextField label={field.label} help={field.help} error={error} inputMode="decimal" {...register(field.name, { setValueAs: parseTimes })} />;
    default:
      return (
        <TextField
          label={field.label}
          help={field.help}
          error={error}
          type="number"
          step={field.input === 'whole' ? 1 : 'any'}
          inputMode={field.input === 'whole' ? 'numeric' : 'decimal'}
          {...register(field.name, asNumber)}
        />
      );
  }
}
