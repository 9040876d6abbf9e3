'use client';

import { useMutation, useQueryClient } from '@tanstack/react-query';
import dynamic from 'next/dynamic';
import { useDeferredValue, useMemo, useState } from 'react';
import { formatPercent, formatValue, labelOf } from '@/components/calculations/format';
import type { InputOrigin } from '@/components/calculations/provenance';
import { ResultPanel } from '@/components/calculations/result-panel';
import { Alert, FormStatus } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { apiFetch, ApiError } from '@/lib/api/client';
import type { PlanDraft } from '@/lib/plan/from-design';
import { clusterSizeAxis, curveSizes, iccAxis } from '@/lib/plan/sensitivity';
import { calculate } from '@/lib/stats/calculations';
import { CalculationInputError } from '@/lib/stats/calculations/errors';
import { clustersGrid, CURVE_SIZE, powerCurve } from '@/lib/stats/calculations/sensitivity';
import type { CalculationOutput } from '@/lib/stats/calculations/types';
import { SOLVABLE, type CalculationKind, type CalculationRequest } from '@/lib/stats/calculations/request';
import { ClusterHeatmap, type HeatCell } from './cluster-heatmap';
import { PlanInputs, type InputValues } from './plan-inputs';
import type { PlanResultDto } from '@/lib/api/dto';
import { savedResultsKey, SavedResults } from './saved-results';
import { initialValues, modeOf, toPlanRequest, visibleFields } from './values';
import { formatCount } from '@/lib/format';

// recharts draws in the browser only: the charts load on the client.
const chartLoading = () => <p className="text-sm text-muted">Drawing the chart…</p>;
const PowerCurve = dynamic(() => import('./power-curve'), { ssr: false, loading: chartLoading });
const BudgetView = dynamic(() => import('./budget-view'), { ssr: false, loading: chartLoading });

type ClusterRequest = Extract<CalculationRequest, { kind: 'cluster-means' }>;

export interface PlanWorkbenchProps {
  studyId: string;
  revision: number;
  draft: PlanDraft & { kind: CalculationKind };
  canSave: boolean;
  saved: PlanResultDto[];
}

/**
 * Where each input came from: the source the design gives its assumption (a pilot, the
 * literature, a judgement, no source), the design itself for what its structure fixes or what is
 * computed from it, and "entered here" for a value changed on this tab.
 */
function originsOf(draft: PlanDraft, initial: InputValues, values: InputValues): Partial<Record<string, InputOrigin>> {
  const origins: Partial<Record<string, InputOrigin>> = {};
  for (const a of draft.assumptions) {
    if (!a.input) continue;
    const k = a.source.kind;
    origins[a.input] = k === 'design' || k === 'derived' ? 'design' : k;
  }
  for (const name of Object.keys(values)) if (values[name] !== initial[name]) origins[name] = 'entered';
  if (origins.power && !origins.targetPower) origins.targetPower = origins.power;
  return origins;
}

const capital = (s: string) => (s ? s[0]!.toUpperCase() + s.slice(1) : s);

/** Labels naming this design's units, for the inputs the draft filled. */
function inputLabels(draft: PlanDraft): Record<string, string> {
  const labels: Record<string, string> = {};
  for (const a of draft.assumptions) if (a.input && a.source.kind === 'derived') labels[a.input] = a.name;
  if (draft.labels.ratio) labels.ratio = draft.labels.ratio;
  const sizeInput = draft.planned?.input ?? draft.solveFor;
  if (draft.labels.size && sizeInput && sizeInput !== 'delta') labels[sizeInput] = capital(draft.labels.size);
  if (draft.kind === 'cluster-means') {
    if (draft.labels.size) labels.clustersPerArm = capital(draft.labels.size);
    if (draft.labels.member) labels.clusterSize = `${capital(draft.labels.member)} (analysed)`;
  }
  return labels;
}

type Computed =
  | { ok: true; request: CalculationRequest; output: CalculationOutput }
  | { ok: false; errors: Record<string, string>; message: string };

function run(state: ReturnType<typeof toPlanRequest>): Computed {
  if (!state.ok) return state;
  try {
    return { ok: true, request: state.request, output: calculate(state.request) };
  } catch (e) {
    if (e instanceof CalculationInputError) {
      return { ok: false, errors: Object.fromEntries(Object.entries(e.fields).map(([k, v]) => [k, v[0] ?? e.message])), message: e.message };
    }
    console.error(e);
    return { ok: false, errors: {}, message: 'This combination of values could not be worked out. Change a value and try again.' };
  }
}

/**
 * The Plan tab's live part: the inputs filled from the design (editable), the answer with its
 * method, formula, references and warnings, the comparison with the size the design plans, the
 * sensitivity views and saving. Everything is computed in the browser; a save is recomputed on
 * the server.
 */
export function PlanWorkbench({ studyId, revision, draft, canSave, saved }: PlanWorkbenchProps) {
  const kind = draft.kind;
  const mode = modeOf(kind, draft.inputs);
  const initial = useMemo(() => initialValues(kind, draft.inputs), [kind, draft.inputs]);
  const [values, setValues] = useState<InputValues>(initial);
  const [solveFor, setSolveFor] = useState<string | null>(draft.solveFor);
  const [note, setNote] = useState('');
  const labels = useMemo(() => inputLabels(draft), [draft]);
  const fields = useMemo(() => visibleFields(kind, solveFor, mode), [kind, solveFor, mode]);
  const computed = useMemo(() => run(toPlanRequest(kind, fields, values, solveFor)), [kind, fields, values, solveFor]);
  const charts = useDeferredValue(computed);

  const designPower = typeof draft.inputs.power === 'number' ? draft.inputs.power : 0.8;
  const sizeName = CURVE_SIZE[kind];
  const planned = draft.planned;

  const plannedOutput = useMemo(() => {
    if (!computed.ok || !planned || solveFor !== planned.input) return null;
    try {
      return calculate({ ...computed.request, [planned.input]: planned.value, solveFor: 'power' } as CalculationRequest);
    } catch {
      return null;
    }
  }, [computed, planned, solveFor]);

  const curve = useMemo(() => {
    if (!charts.ok || !sizeName) return null;
    const chosen = Number(charts.output.result[sizeName]);
    const plannedSize = planned?.input === sizeName ? planned.value : undefined;
    try {
      const points = powerCurve(charts.request, curveSizes([chosen, plannedSize]));
      const target = charts.output.result.targetPower;
      return { points, chosen: Number.isFinite(chosen) ? chosen : undefined, planned: plannedSize, target: typeof target === 'number' ? target : charts.output.solvedFor === 'power' ? null : designPower };
    } catch {
      return null;
    }
  }, [charts, sizeName, planned, designPower]);

  const cluster = useMemo(() => {
    if (!charts.ok || charts.request.kind !== 'cluster-means') return null;
    const r = charts.output.result;
    const req: ClusterRequest = { ...charts.request, delta: Number(r.delta), power: typeof r.targetPower === 'number' ? r.targetPower : designPower, clusterSize: Number(r.clusterSize) };
    const iccs = iccAxis(req.icc);
    const sizes = clusterSizeAxis(req.clusterSize!);
    try {
      const cells: HeatCell[] = clustersGrid(req, iccs, sizes);
      return { req, iccs, sizes, cells };
    } catch {
      return null;
    }
  }, [charts, designPower]);

  const queryClient = useQueryClient();
  const save = useMutation({
    mutationFn: (request: CalculationRequest) => apiFetch<PlanResultDto>(`/api/v1/studies/${studyId}/plans`, { method: 'POST', json: { request, revision, ...(note.trim() ? { note: note.trim() } : {}) } }),
    onSuccess: async () => {
      setNote('');
      await queryClient.invalidateQueries({ queryKey: savedResultsKey(studyId) });
    },
  });

  function change(name: string, value: string | boolean) {
    save.reset();
    setValues((v) => ({ ...v, [name]: value }));
  }

  function chooseUnknown(next: string) {
    if (next === solveFor) return;
    save.reset();
    // The quantity just solved for becomes an input again: it keeps what the user typed there;
    // only an empty field starts from the answer (solving never rewrites an input).
    if (solveFor && computed.ok && String(values[solveFor] ?? '').trim() === '') {
      const v = computed.output.result[solveFor];
      if (typeof v === 'number' && Number.isFinite(v)) setValues((x) => ({ ...x, [solveFor]: String(Number.isInteger(v) ? v : Number(v.toPrecision(4))) }));
    }
    setSolveFor(next);
  }

  const clusterWord = (draft.labels.size ?? 'clusters per arm').replace(/ per arm$/, '');
  const memberWord = draft.labels.member ?? 'units per cluster';
  const sizeWords = draft.labels.size ?? labelOf(sizeName ?? 'size').toLowerCase();
  const status = save.isSuccess
    ? { status: 'success', message: `Saved with design revision ${save.data.revision}.` }
    : save.isError
      ? { status: 'error', message: save.error instanceof ApiError ? save.error.message : 'The result could not be saved. Try again.' }
      : null;

  return (
    <div className="space-y-6">
      <div className="grid items-start gap-6 xl:grid-cols-[minmax(0,5fr)_minmax(0,7fr)]">
        <PlanInputs
          fields={fields}
          values={values}
          errors={computed.ok ? {} : computed.errors}
          solvable={SOLVABLE[kind]}
          solveFor={solveFor}
          labels={labels}
          onChange={change}
          onSolveFor={chooseUnknown}
        />
        <div className="space-y-4">
          <div aria-live="polite" aria-atomic="true" className="space-y-2">
            {!computed.ok && (
              <Alert live tone="error">
                Check the highlighted values. {computed.message}
              </Alert>
            )}
            {computed.ok && computed.output.solvedFor && (
              <p className="sr-only">
                {labels[computed.output.solvedFor] ?? labelOf(computed.output.solvedFor)}: {formatValue(computed.output.solvedFor, computed.output.result[computed.output.solvedFor])}
              </p>
            )}
          </div>
          {computed.ok && (
            <ResultPanel
              output={computed.output}
              title="Answer for this design"
              headingLevel={3}
              origins={originsOf(draft, initial, values)}
              request={computed.request}
              plannedAnalysis={draft.inputs.analysis === 'post' || draft.inputs.analysis === 'change' || draft.inputs.analysis === 'ancova' ? draft.inputs.analysis : undefined}
              actions={
                canSave ? (
                  <div className="w-full space-y-2">
                    <div className="flex flex-wrap items-end gap-3">
                      <div className="min-w-[16rem] flex-1">
                        <TextField label="Note with the saved result (optional)" value={note} maxLength={2000} onChange={(e) => setNote(e.target.value)} />
                      </div>
                      <Button onClick={() => save.mutate(computed.request)} disabled={save.isPending}>
                        {save.isPending ? 'Saving…' : 'Save this result'}
                      </Button>
                    </div>
                    <FormStatus state={status} />
                  </div>
                ) : undefined
              }
            />
          )}
          {plannedOutput && planned && (
            <p className="rounded-md border border-line bg-white p-4 text-sm" data-testid="planned-comparison">
              The design plans <strong>{formatCount(planned.value)}</strong> {sizeWords}. With that number the power is{' '}
              <strong>{formatPercent(Number(plannedOutput.result.power))}</strong>
              {computed.ok && typeof computed.output.result.targetPower === 'number' ? ` against the target of ${formatPercent(computed.output.result.targetPower)}` : ''}.
            </p>
          )}
        </div>
      </div>

      <section aria-labelledby="sensitivity-heading" className="space-y-4">
        <h2 id="sensitivity-heading" className="text-xl font-bold">
          Sensitivity
        </h2>
        {!charts.ok && <p className="text-sm text-muted">The charts appear when the inputs can be worked out.</p>}
        {curve && <PowerCurve points={curve.points} sizeLabel={sizeWords} targetPower={curve.target} chosen={curve.chosen} planned={curve.planned} />}
        {cluster && (
          <ClusterHeatmap
            cells={cluster.cells}
            iccs={cluster.iccs}
            clusterSizes={cluster.sizes}
            current={{ icc: Number(cluster.req.icc.toPrecision(6)), clusterSize: cluster.req.clusterSize! }}
            clusterWord={clusterWord}
            memberWord={memberWord}
            targetPower={cluster.req.power!}
          />
        )}
        {cluster && cluster.req.icc > 0 && cluster.req.icc < 1 && <BudgetView request={cluster.req} clusterWord={clusterWord} memberWord={memberWord} />}
      </section>

      <SavedResults studyId={studyId} initial={saved} currentRevision={revision} />
    </div>
  );
}
