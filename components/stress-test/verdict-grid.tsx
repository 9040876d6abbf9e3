'use client';

import { useId, useRef, useState, type CSSProperties } from 'react';
import { Button } from '@/components/ui/button';
import { BRADLEY_1978, MORRIS_2019 } from '@/lib/citations';
import { capitalise as cap, formatCount, formatPercent, nounFor, plural } from '@/lib/format';
import { analysisLabel } from '@/lib/sim/analysis-words';
import { bestAnalysis, LIBERAL_BOUND, mcInterval, verdictOf, type CellVerdict, type Verdict } from '@/lib/sim/verdict';
import type { ResultRow } from './results-table';
import { MAX_TAB_REPLICATES } from './run-form-schema';
import { formatRate, VERDICT_LOOK, type MetricValue } from './words';

export interface GridScenario {
  key: string;
  /** A few words: the column heading. */
  short: string;
  /** With its parameters: the tooltip's first line. */
  full: string;
}

export interface VerdictGridProps {
  rows: ResultRow[];
  scenarios: GridScenario[];
  /** The run's analyses in its order. */
  analyses: string[];
  /** The design's planned analysis when the run includes it. */
  planned: string | null;
  alpha: number;
  targetPower: number;
  replicates: number;
  /** Starts the same run again with more replicates per scenario; absent where the reader cannot run one. */
  onMoreReplicates?: (replicates: number) => void;
  /** True while such a run is being started. */
  starting?: boolean;
}


interface Cell {
  verdict: Verdict;
  metrics: Record<string, MetricValue>;
}

const pct = (x: number) => formatPercent(x);

function withError(m: MetricValue | undefined, replicates: number): string {
  if (!m || m.value === null || !Number.isFinite(m.value)) return 'not estimated';
  const iv = mcInterval(m, replicates)!;
  const se = m.mcse !== null && Number.isFinite(m.mcse) ? m.mcse : (iv[1] - m.value) / 1.96;
  return `${pct(m.value)} ± ${pct(se)} MC SE (interval ${pct(Math.max(0, iv[0]))} to ${pct(Math.min(1, iv[1]))})`;
}

/** Why the cell has its verdict, in a sentence. */
export function reasonOf(v: Verdict, alpha: number, targetPower: number): string {
  const parts: string[] = [];
  const liberal = formatRate(LIBERAL_BOUND * alpha);
  if (v.falsePositive === 'broken') parts.push(`false positives well above ${formatRate(alpha)}`);
  else if (v.falsePositive === 'inflated') parts.push(`false positives a little above ${formatRate(alpha)}`);
  else if (v.falsePositive === 'undecided') parts.push(`too few runs to tell whether false positives stay near ${formatRate(alpha)}: the Monte Carlo interval reaches it but also past ${liberal}`);
  if (v.coverage === 'broken') parts.push(`intervals miss the true effect far more often than ${formatRate(alpha)} of the time`);
  else if (v.coverage === 'inflated') parts.push('intervals a little too narrow');
  else if (v.coverage === 'undecided') parts.push(`too few runs to tell whether intervals miss the true effect only ${formatRate(alpha)} of the time: the Monte Carlo interval reaches it but also past ${liberal}`);
  if (parts.length === 0) {
    if (v.power === 'below') return `Keeps its false-positive rate and coverage, but power is below the target ${formatRate(targetPower)}.`;
    if (v.cell === 'no-result') return 'No usable fits in this scenario.';
    return `Keeps its false-positive rate and coverage${v.power === 'meets' ? ` and reaches the target power of ${formatRate(targetPower)}` : ''}.`;
  }
  const s = parts.join('; ');
  return `${s[0]!.toUpperCase()}${s.slice(1)}.${v.powerCounts ? '' : ' Its power is not to its credit.'}`;
}

/** One verdict with its Monte Carlo errors in a tooltip shown on hover and on keyboard focus (Escape hides it). */
function VerdictCell({ cell, scenario, analysis, alpha, targetPower, replicates }: { cell: Cell; scenario: GridScenario; analysis: string; alpha: number; targetPower: number; replicates: number }) {
  const id = useId();
  const button = useRef<HTMLButtonElement>(null);
  // Fixed to the viewport, so that the grid's horizontal scroll box does not clip it.
  const [place, setPlace] = useState<CSSProperties | null>(null);
  const open = place !== null;
  const show = () => {
    const r = button.current?.getBoundingClientRect();
    if (!r) return;
    const width = Math.min(288, window.innerWidth - 16);
    setPlace({ position: 'fixed', top: r.bottom + 4, left: Math.max(8, Math.min(r.left, window.innerWidth - width - 8)), width });
  };
  const setOpen = (on: boolean) => (on ? show() : setPlace(null));
  const look = VERDICT_LOOK[cell.verdict.cell];
  const v = cell.verdict;
  const power = cell.metrics.power?.value;
  const powerLine =
    power === null || power === undefined || !Number.isFinite(power) ? 'Power not estimated' : cell.verdict.powerCounts ? `Power ${formatRate(power)}` : 'Power not counted';
  return (
    <span className="relative block">
      <button
        ref={button}
        type="button"
        aria-describedby={id}
        onMouseEnter={() => setOpen(true)}
        onMouseLeave={() => setOpen(false)}
        onFocus={() => setOpen(true)}
        onBlur={() => setOpen(false)}
        onKeyDown={(e) => {
          if (e.key === 'Escape') setOpen(false);
        }}
        onClick={() => setOpen(!open)}
        className={`flex w-full min-w-[8.5rem] flex-col items-start rounded-md border px-2 py-1.5 text-left ${look.tone}`}
        data-testid="verdict-cell"
        data-verdict={cell.verdict.cell}
      >
        <span className="flex items-center gap-1.5 font-semibold">
          <span aria-hidden="true" className="inline-flex h-5 w-5 items-center justify-center rounded-full border border-current text-xs">
            {look.icon}
          </span>
          {look.word}
          <span className="sr-only">
            : {analysisLabel(analysis)} under {scenario.short}
          </span>
        </span>
        <span className={`text-xs ${cell.verdict.powerCounts ? 'text-ink' : 'text-muted'}`}>{powerLine}</span>
      </button>
      <span
        role="tooltip"
        id={id}
        style={place ?? undefined}
        className={`z-30 rounded-md border border-line bg-white p-3 text-xs text-ink shadow-lg ${open ? 'block' : 'hidden'}`}
      >
        <span className="block font-semibold">
          {analysisLabel(analysis)} · {scenario.full}
        </span>
        <span className="mt-1 block">{reasonOf(cell.verdict, alpha, targetPower)}</span>
        {v.settleAt !== null && (
          <span className="mt-1 block" data-testid="settle-hint">
            About {formatCount(v.settleAt)} replicates per scenario ({formatCount(Math.max(0, v.settleAt - replicates))} more than this run’s {formatCount(replicates)}) would settle it,
            if the rate stays where it is.
          </span>
        )}
        <span className="mt-1 block">False-positive rate {withError(cell.metrics.typeIError, replicates)}</span>
        <span className="block">Coverage {withError(cell.metrics.coverage, replicates)}</span>
        <span className="block">
          Power {withError(cell.metrics.power, replicates)}
          {v.powerCounts ? '' : v.falsePositive === 'undecided' ? ' — not counted: the false-positive rate is not settled' : v.falsePositive === 'holds' || v.falsePositive === 'unknown' ? ' — not counted: the intervals miss the true effect, so the estimate is biased' : ' — not counted: the false-positive rate is off'}
        </span>
      </span>
    </span>
  );
}

/**
 * The stress test's picture: the planned analysis first, a verdict per scenario, then the other
 * analyses (scenario columns × analysis rows), each cell a word, an icon and a colour, with its
 * Monte Carlo errors on hover and focus; then the best alternative to the planned analysis.
 */
export function VerdictGrid({ rows, scenarios, analyses, planned, alpha, targetPower, replicates, onMoreReplicates, starting = false }: VerdictGridProps) {
  const cells = new Map<string, Cell>();
  for (const r of rows) cells.set(`${r.scenario}/${r.analysis}`, { verdict: verdictOf(r.metrics, { alpha, targetPower, replicates }), metrics: r.metrics });
  const ordered = planned ? [planned, ...analyses.filter((a) => a !== planned)] : analyses;
  const cellsOf = (a: string) =>
    scenarios.flatMap((s) => {
      const c = cells.get(`${s.key}/${a}`);
      return c ? [{ verdict: c.verdict, power: c.metrics.power?.value ?? null }] : [];
    });
  const others = analyses.filter((a) => a !== planned);
  const best = bestAnalysis(others, cellsOf);
  const bestCells = best ? cellsOf(best) : [];
  const plannedCells = planned ? cellsOf(planned) : [];

  const fails = plannedCells.filter((c) => c.verdict.cell === 'broken').length;
  const unsettled = plannedCells.filter((c) => c.verdict.cell === 'undecided').length;
  const headline = !planned
    ? 'The design names no analysis that this run includes; every analysis is shown, the best first below.'
    : fails > 0
      ? `The planned analysis, ${analysisLabel(planned)}, fails in ${fails} of ${plannedCells.length} ${nounFor(plannedCells.length, 'scenario')}: its false-positive rate or its coverage is off by more than the Monte Carlo error allows.`
      : unsettled > 0
        ? `This run has too few replicates to tell whether the planned analysis, ${analysisLabel(planned)}, keeps its false-positive rate and coverage in ${unsettled} of ${plannedCells.length} ${nounFor(plannedCells.length, 'scenario')}: the figures agree with a rate that holds and with one well off.`
      : plannedCells.every((c) => c.verdict.cell === 'holds')
        ? `The planned analysis, ${analysisLabel(planned)}, keeps its false-positive rate and coverage and reaches the target power in every scenario.`
        : `The planned analysis, ${analysisLabel(planned)}, keeps its false-positive rate and coverage within the margin in every scenario; see the cells marked below.`;

  const powers = bestCells.filter((c) => c.verdict.powerCounts && c.power !== null && Number.isFinite(c.power)).map((c) => c.power!);
  const bestWords = (() => {
    if (!best) return null;
    const broken = bestCells.filter((c) => c.verdict.cell === 'broken').length;
    const range = powers.length === 0 ? '' : Math.min(...powers) === Math.max(...powers) ? `; power ${formatRate(powers[0])}` : `; power ${formatRate(Math.min(...powers))} to ${formatRate(Math.max(...powers))}`;
    if (broken > 0) return `${cap(analysisLabel(best))} is the least bad of the others, but it too fails in ${broken} ${nounFor(broken, 'scenario')}${range}.`;
    const undecided = bestCells.filter((c) => c.verdict.cell === 'undecided').length;
    if (undecided > 0)
      return `${cap(analysisLabel(best))} is the best of the others on this run, but there are too few runs to tell whether it keeps its false-positive rate and coverage in ${undecided} of ${bestCells.length} ${nounFor(bestCells.length, 'scenario')}${range}.`;
    return `${cap(analysisLabel(best))} keeps its false-positive rate and coverage in every scenario${range} (target ${formatRate(targetPower)}).`;
  })();

  // Replicates per scenario that would settle every undecided cell, within what this tab runs.
  const undecided = [...cells.values()].filter((c) => c.verdict.settleAt !== null);
  const needed = undecided.length > 0 ? Math.max(...undecided.map((c) => c.verdict.settleAt!)) : null;
  const offer = needed === null ? null : Math.min(needed, MAX_TAB_REPLICATES);

  return (
    <div className="space-y-4">
      <div className="rounded-md border-l-4 border-brand bg-brand-light px-4 py-3 text-sm" role="region" aria-labelledby="verdict-heading">
        <h3 id="verdict-heading" className="font-bold">
          Does the planned analysis hold?
        </h3>
        <p className="mt-1" data-testid="verdict-headline">
          {headline}
        </p>
      </div>

      <p className="max-w-3xl text-sm text-muted">
            Each cell judges one analysis under one scenario. <strong>Fails</strong>: the false-positive rate (or the share of intervals missing the true
            effect) is above {formatRate(alpha)} beyond its Monte Carlo interval (± 1.96 MC SE, {MORRIS_2019.short}) and above{' '}
            {formatRate(LIBERAL_BOUND * alpha)}, the liberal bound of {LIBERAL_BOUND} × {formatRate(alpha)} ({BRADLEY_1978.short}). <strong>Slightly off</strong>: above{' '}
            {formatRate(alpha)} beyond the Monte Carlo error, but within that bound. <strong>Too few runs to tell</strong>: the interval reaches {formatRate(alpha)} but also past{' '}
            {formatRate(LIBERAL_BOUND * alpha)}, so the run cannot tell a rate that holds from one well off. Power is counted only where false positives hold;
            target {formatRate(targetPower)}. Hover over or focus a cell for its figures.
      </p>
      {needed !== null && offer !== null && (
        <div className="flex max-w-3xl flex-wrap items-center gap-3 rounded-md border border-dashed border-muted px-4 py-3 text-sm" data-testid="more-replicates">
          <p className="flex-1 basis-64">
            {plural(undecided.length, 'cell')} {undecided.length === 1 ? 'has' : 'have'} too few runs to tell. About {formatCount(needed)} replicates per scenario
            would settle {undecided.length === 1 ? 'it' : 'them'} (this run had {formatCount(replicates)}; the figure assumes the rates stay where they are).
            {needed > MAX_TAB_REPLICATES && ` This tab runs at most ${formatCount(MAX_TAB_REPLICATES)}, which would settle some of them.`}
          </p>
          {onMoreReplicates && (
            <Button type="button" variant="secondary" disabled={starting} onClick={() => onMoreReplicates(offer)}>
              {starting ? 'Starting…' : `Run again with ${formatCount(offer)} replicates`}
            </Button>
          )}
        </div>
      )}
      <div className="overflow-x-auto pb-2">
        <table className="border-separate border-spacing-1 text-left text-sm" data-testid="verdict-grid">
          <caption className="sr-only">The verdict on each analysis under each scenario, the planned analysis first</caption>
          <thead>
            <tr>
              <th scope="col" className="px-1 align-bottom font-semibold">
                Analysis
              </th>
              {scenarios.map((s) => (
                <th key={s.key} scope="col" className="max-w-[12rem] px-1 align-bottom font-semibold">
                  {s.short}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {ordered.map((a) => (
              <tr key={a} data-testid={a === planned ? 'planned-row' : undefined}>
                <th scope="row" className={`min-w-[7rem] px-1 align-top font-semibold sm:whitespace-nowrap ${a === planned ? 'text-brand-dark' : ''}`}>
                  {analysisLabel(a)}
                  {a === planned && <span className="block text-xs font-normal text-muted">planned</span>}
                  {a === best && <span className="block text-xs font-normal text-muted">best alternative</span>}
                </th>
                {scenarios.map((s) => {
                  const c = cells.get(`${s.key}/${a}`);
                  return (
                    <td key={s.key} className="align-top">
                      {c ? <VerdictCell cell={c} scenario={s} analysis={a} alpha={alpha} targetPower={targetPower} replicates={replicates} /> : <span className="text-muted">—</span>}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>

      {bestWords && (
        <div className="rounded-md border border-line px-4 py-3 text-sm" role="region" aria-labelledby="best-heading">
          <h3 id="best-heading" className="font-bold">
            {planned ? 'The best alternative' : 'The best analysis'}
          </h3>
          <p className="mt-1" data-testid="best-alternative">
            {bestWords}
          </p>
        </div>
      )}
    </div>
  );
}
