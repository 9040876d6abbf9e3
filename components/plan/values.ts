/**
 * The Plan tab's form state ↔ a calculation request. Field values are kept as typed (strings,
 * and booleans for checkboxes); the request is what the schema accepts, or the messages per
 * field when it does not.
 */
import { fieldsShown, kindInfo, type FieldSpec } from '@/components/calculations/kinds';
import type { PlanDraft } from '@/lib/plan/from-design';
import { calculationSchema, requestDefaults, type CalculationKind, type CalculationRequest } from '@/lib/stats/calculations/request';
import type { InputValues } from './plan-inputs';

/**
 * Regression is shown with a slope when the design gave one (or its SDs), else with f²; the
 * proportion kinds with the form of the effect the plan filled in (p2 when none).
 */
export function modeOf(kind: CalculationKind, inputs: PlanDraft['inputs']): string | null {
  if (kind === 'regression') return 'slope' in inputs || 'sdX' in inputs || 'residualSd' in inputs ? 'slope' : 'f2';
  if (kind === 'two-proportions' || kind === 'cluster-proportions') return (['difference', 'riskRatio', 'oddsRatio'] as const).find((name) => name in inputs) ?? 'p2';
  return null;
}

export function visibleFields(kind: CalculationKind, solveFor: string | null, mode: string | null): FieldSpec[] {
  const info = kindInfo(kind);
  return info ? fieldsShown(info, solveFor, mode) : [];
}

/** Each shown field starts with the plan's value, else the value the calculation would use (its schema's default). */
export function initialValues(kind: CalculationKind, inputs: PlanDraft['inputs']): InputValues {
  const out: InputValues = {};
  const defaults = requestDefaults(kind);
  for (const f of kindInfo(kind)?.fields ?? []) {
    const v = inputs[f.name] ?? defaults[f.name];
    if (v === undefined) out[f.name] = f.input === 'checkbox' ? false : '';
    else if (Array.isArray(v)) out[f.name] = v.join(', ');
    else if (typeof v === 'boolean') out[f.name] = v;
    else out[f.name] = String(v);
  }
  return out;
}

function convert(field: FieldSpec, raw: string | boolean): unknown {
  if (field.input === 'checkbox') return raw === true;
  const text = String(raw).trim();
  if (text === '') return undefined;
  if (field.input === 'times') return text.split(/[\s,;]+/).filter(Boolean).map(Number);
  if (field.input === 'select') return field.name === 'sides' ? Number(text) : text;
  return Number(text);
}

export type RequestState = { ok: true; request: CalculationRequest } | { ok: false; errors: Record<string, string>; message: string };

/** The request the form stands for, or the schema's messages by field. */
export function toPlanRequest(kind: CalculationKind, fields: FieldSpec[], values: InputValues, solveFor: string | null): RequestState {
  const body: Record<string, unknown> = { kind };
  for (const f of fields) {
    const v = convert(f, values[f.name] ?? '');
    if (v !== undefined) body[f.name] = v;
  }
  if (solveFor) body.solveFor = solveFor;
  const parsed = calculationSchema.safeParse(body);
  if (parsed.success) return { ok: true, request: parsed.data };
  const errors: Record<string, string> = {};
  for (const issue of parsed.error.issues) {
    const key = String(issue.path[0] ?? '_');
    errors[key] ??= issue.message;
  }
  const first = parsed.error.issues[0];
  return { ok: false, errors, message: first ? first.message : 'Check the inputs.' };
}
