'use client';

import type { SimulationDto } from '@/lib/api/simulations';
import { scenarioKey, type SimulationSpec } from '@/lib/sim/spec';
import { ResultsTable, type ResultRow } from './results-table';
import { VerdictGrid } from './verdict-grid';
import { describeScenario, VIOLATION_TITLES, type MetricValue } from './words';

export type RunWithSpec = SimulationDto & { spec: SimulationSpec };

/** The rows of the results table: scenario × analysis in the specification's order. */
export function rowsOf(run: RunWithSpec): ResultRow[] {
  const rows: ResultRow[] = [];
  for (const s of run.spec.scenarios) {
    const byAnalysis = run.results?.[scenarioKey(s)];
    if (!byAnalysis) continue;
    for (const [analysis, metrics] of Object.entries(byAnalysis)) {
      rows.push({ scenario: scenarioKey(s), scenarioLabel: describeScenario(s), shortLabel: s.name ?? VIOLATION_TITLES[s.violation], analysis, metrics: metrics as Record<string, MetricValue> });
    }
  }
  return rows;
}

/**
 * A finished run's results, picture first: the verdict grid with the planned analysis leading and
 * the best alternative, then — collapsed — the summary sentences and the table of every figure.
 */
export function RunResults({
  run,
  planned,
  targetPower,
  onMoreReplicates,
  starting,
}: {
  run: RunWithSpec;
  planned: string | null;
  targetPower: number;
  /** Runs this run's specification again with more replicates (the grid offers it where cells are undecided). */
  onMoreReplicates?: (replicates: number) => void;
  starting?: boolean;
}) {
  const rows = rowsOf(run);
  const alpha = run.spec.alpha ?? 0.05;
  const scenarios = run.spec.scenarios.map((s) => ({ key: scenarioKey(s), short: s.name ?? VIOLATION_TITLES[s.violation], full: describeScenario(s) }));
  const analyses = [...new Set(rows.map((r) => r.analysis))];
  return (
    <div className="space-y-4">
      <VerdictGrid
        rows={rows}
        scenarios={scenarios}
        analyses={analyses}
        planned={planned !== null && analyses.includes(planned) ? planned : null}
        alpha={alpha}
        targetPower={targetPower}
        replicates={run.spec.replicates}
        onMoreReplicates={onMoreReplicates}
        starting={starting}
      />
      <details className="rounded-md border border-line px-4 py-3 text-sm" data-testid="run-details">
        <summary className="cursor-pointer font-semibold text-brand">Every figure of this run</summary>
        <div className="mt-3 space-y-4">
          <div aria-labelledby={`summary-heading-${run.id}`} role="region">
            <h3 id={`summary-heading-${run.id}`} className="font-bold">
              What the simulation shows
            </h3>
            {run.summary && run.summary.length > 0 ? (
              <ul className="mt-1 list-disc space-y-1 pl-5" data-testid="summary-sentences">
                {run.summary.map((s) => (
                  <li key={s}>{s}</li>
                ))}
              </ul>
            ) : (
              <p className="mt-1" data-testid="summary-sentences">
                Every analysis kept its promised false-positive rate, coverage, bias and standard error within about 3 Monte Carlo SEs.
              </p>
            )}
          </div>
          <ResultsTable rows={rows} replicates={run.spec.replicates} alpha={alpha} />
        </div>
      </details>
    </div>
  );
}
