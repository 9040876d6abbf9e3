'use client';

import { analysisLabel } from '@/lib/sim/analysis-words';
import { usePathname, useSearchParams } from 'next/navigation';
import { useId, useMemo } from 'react';
import { formatFailedFits, formatMetric, RESULT_COLUMNS, type MetricValue, type ResultColumn } from './words';
import { formatCount } from '@/lib/format';

export interface ResultRow {
  /** The scenario's key in the results (its name, by default its violation). */
  scenario: string;
  /** The scenario in plain words. */
  scenarioLabel: string;
  /** The scenario in a few words, for chart labels. */
  shortLabel: string;
  analysis: string;
  metrics: Record<string, MetricValue>;
}

type SortKey = 'scenario' | 'analysis' | ResultColumn;
const SORT_KEYS: SortKey[] = ['scenario', 'analysis', ...RESULT_COLUMNS.map((c) => c.key)];

/** `?sort=typeIError.desc` → { key, dir }; anything else keeps the order of the specification. */
export function parseSort(raw: string | null): { key: SortKey; dir: 'asc' | 'desc' } | null {
  if (!raw) return null;
  const [key, dir] = raw.split('.');
  if (!SORT_KEYS.includes(key as SortKey)) return null;
  return { key: key as SortKey, dir: dir === 'desc' ? 'desc' : 'asc' };
}

/** Rows sorted by a column; missing values last whichever the direction, ties in the original order. */
export function sortRows(rows: ResultRow[], sort: { key: SortKey; dir: 'asc' | 'desc' } | null): ResultRow[] {
  if (!sort) return rows;
  const sign = sort.dir === 'asc' ? 1 : -1;
  const valueOf = (r: ResultRow): string | number | null => {
    if (sort.key === 'scenario') return r.scenarioLabel;
    if (sort.key === 'analysis') return r.analysis;
    const v = r.metrics[sort.key]?.value;
    return v === null || v === undefined || !Number.isFinite(v) ? null : v;
  };
  return rows
    .map((r, i) => ({ r, i, v: valueOf(r) }))
    .sort((a, b) => {
      if (a.v === null || b.v === null) return a.v === b.v ? a.i - b.i : a.v === null ? 1 : -1;
      const c = typeof a.v === 'string' ? a.v.localeCompare(String(b.v)) : a.v - (b.v as number);
      return c !== 0 ? sign * c : a.i - b.i;
    })
    .map((x) => x.r);
}

/** Scenario × analysis rows with every metric as "value ± MC SE"; the sort is kept in the URL (?sort=column.dir). */
export function ResultsTable({ rows, replicates, alpha }: { rows: ResultRow[]; replicates: number; alpha: number }) {
  const captionId = useId();
  const pathname = usePathname();
  const params = useSearchParams();
  const sort = parseSort(params.get('sort'));
  const sorted = useMemo(() => sortRows(rows, sort), [rows, sort]);

  const sortBy = (key: SortKey) => {
    const next = new URLSearchParams(params.toString());
    const dir = sort?.key === key && sort.dir === 'asc' ? 'desc' : 'asc';
    next.set('sort', `${key}.${dir}`);
    // A shallow URL change (Next keeps useSearchParams in step with history.replaceState): no server round trip.
    window.history.replaceState(null, '', `${pathname}?${next.toString()}`);
  };

  const header = (key: SortKey, label: string, numeric: boolean) => {
    const active = sort?.key === key;
    return (
      <th key={key} scope="col" aria-sort={active ? (sort.dir === 'asc' ? 'ascending' : 'descending') : 'none'} className={`py-1 pr-3 ${numeric ? 'text-right' : ''}`}>
        <button type="button" onClick={() => sortBy(key)} className="inline-flex items-center gap-1 font-semibold text-brand underline-offset-2 hover:underline">
          {label}
          <span aria-hidden="true">{active ? (sort.dir === 'asc' ? '▲' : '▼') : '↕'}</span>
        </button>
      </th>
    );
  };

  return (
    <div>
      {/* Read above the scrolling table, so a narrow screen wraps it instead of cutting it off. */}
      <p id={captionId} className="mb-2 text-sm text-muted">
        Each value ± its Monte Carlo SE, from {formatCount(replicates)} replicates per scenario. Power at the planned effect; false-positive rate from a
        paired run at zero effect; coverage of the {Math.round(100 * (1 - alpha))}% confidence interval; failed fits out of those asked for (each replicate is fitted with and without the effect). Select a column heading to sort.
      </p>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[56rem] text-left text-sm" data-testid="results-table" aria-describedby={captionId}>
          <caption className="sr-only">Every figure of this run, by scenario and analysis</caption>
          <thead>
            <tr className="border-b border-line">
              {header('scenario', 'Scenario', false)}
              {header('analysis', 'Analysis', false)}
              {RESULT_COLUMNS.map((c) => header(c.key, c.label, true))}
            </tr>
          </thead>
          <tbody>
            {sorted.map((r) => (
              <tr key={`${r.scenario}/${r.analysis}`} className="border-b border-line/60 align-top">
                <td className="min-w-[11rem] py-1 pr-3">{r.scenarioLabel}</td>
                <th scope="row" className="py-1 pr-3 font-semibold">
                  {analysisLabel(r.analysis)}
                </th>
                {RESULT_COLUMNS.map((c) => (
                  <td key={c.key} className="whitespace-nowrap py-1 pr-3 text-right tabular-nums">
                    {c.key === 'nonConverged' ? formatFailedFits(r.metrics[c.key], replicates) : formatMetric(r.metrics[c.key], c.rate)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
