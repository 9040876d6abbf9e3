import { formatNumber } from '@/components/calculations/format';
import { HEAT_COLOURS, heatStep, textOn } from '@/lib/plan/sensitivity';
import { formatCount } from '@/lib/format';

export interface HeatCell {
  icc: number;
  clusterSize: number;
  clustersPerArm: number | null;
}

export interface ClusterHeatmapProps {
  cells: HeatCell[];
  iccs: number[];
  clusterSizes: number[];
  current: { icc: number; clusterSize: number };
  /** 'classrooms', 'pupils per classroom' … */
  clusterWord: string;
  memberWord: string;
  targetPower: number;
}

export function heatmapSummary({ cells, current, clusterWord, memberWord, targetPower }: ClusterHeatmapProps): string {
  const here = cells.find((c) => c.icc === current.icc && c.clusterSize === current.clusterSize);
  const reachable = cells.filter((c) => c.clustersPerArm !== null) as (HeatCell & { clustersPerArm: number })[];
  if (reachable.length === 0) return `No combination shown reaches ${formatNumber(targetPower * 100)}% power.`;
  const min = reachable.reduce((a, b) => (b.clustersPerArm < a.clustersPerArm ? b : a));
  const max = reachable.reduce((a, b) => (b.clustersPerArm > a.clustersPerArm ? b : a));
  return (
    `${clusterWord.charAt(0).toUpperCase() + clusterWord.slice(1)} per arm needed for ${formatNumber(targetPower * 100)}% power range from ${min.clustersPerArm} (ICC ${min.icc}, ${min.clusterSize} ${memberWord}) ` +
    `to ${max.clustersPerArm} (ICC ${max.icc}, ${max.clusterSize} ${memberWord}).` +
    (here ? ` At the current ICC ${current.icc} and ${current.clusterSize} ${memberWord}: ${here.clustersPerArm ?? 'not reachable'}.` : '') +
    ' More members per cluster help less and less as the ICC grows.'
  );
}

/**
 * ICC × cluster size → clusters per arm, as a table whose cells are coloured by the number they
 * print (a log scale, light to dark), so the grid is its own accessible data table. The current
 * inputs' cell is outlined.
 */
export function ClusterHeatmap(props: ClusterHeatmapProps) {
  const { cells, iccs, clusterSizes, current, clusterWord, memberWord, targetPower } = props;
  const values = cells.map((c) => c.clustersPerArm).filter((v): v is number => v !== null);
  const min = Math.min(...values);
  const max = Math.max(...values);
  const cell = (icc: number, m: number) => cells.find((c) => c.icc === icc && c.clusterSize === m);
  return (
    <figure aria-labelledby="heatmap-title" className="space-y-3 rounded-lg border border-line bg-white p-5">
      <figcaption className="space-y-1">
        <h3 id="heatmap-title" className="text-base font-bold">
          {clusterWord.charAt(0).toUpperCase() + clusterWord.slice(1)} per arm needed, by ICC and {memberWord}
        </h3>
        <p className="text-sm" data-testid="heatmap-summary">
          {heatmapSummary(props)}
        </p>
      </figcaption>
      {/* Focusable, so that a keyboard can scroll it on a narrow screen. */}
      <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Clusters needed, by ICC and cluster size (scrolls sideways)">
        <table className="border-separate border-spacing-0.5 text-center text-sm" data-testid="cluster-heatmap">
          <caption className="sr-only">
            {clusterWord} per arm needed for {formatNumber(targetPower * 100)}% power; rows are ICCs, columns are {memberWord}
          </caption>
          <thead>
            <tr>
              <th scope="col" className="px-2 py-1 text-left text-xs font-semibold text-muted">
                ICC ↓ / {memberWord} →
              </th>
              {clusterSizes.map((m) => (
                <th key={m} scope="col" className={`px-2 py-1 text-xs font-semibold tabular-nums ${m === current.clusterSize ? 'text-brand underline' : ''}`}>
                  {m}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {iccs.map((icc) => (
              <tr key={icc}>
                <th scope="row" className={`px-2 py-1 text-left text-xs font-semibold tabular-nums ${icc === current.icc ? 'text-brand underline' : ''}`}>
                  {icc}
                </th>
                {clusterSizes.map((m) => {
                  const c = cell(icc, m);
                  const v = c?.clustersPerArm ?? null;
                  const isCurrent = icc === current.icc && m === current.clusterSize;
                  const bg = v === null ? '#ffffff' : HEAT_COLOURS[heatStep(v, min, max)]!;
                  return (
                    <td
                      key={m}
                      className={`min-w-[3rem] rounded px-2 py-1.5 font-semibold tabular-nums ${isCurrent ? 'outline outline-[3px] outline-offset-[-1px] outline-[#7a4b00]' : ''}`}
                      style={{ backgroundColor: bg, color: v === null ? '#4a5568' : textOn(bg) }}
                    >
                      {v === null ? '—' : formatCount(v)}
                      {isCurrent && <span className="sr-only"> (current inputs)</span>}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="flex flex-wrap items-center gap-2 text-xs text-muted" aria-hidden="true">
        <span>fewer</span>
        {HEAT_COLOURS.map((c) => (
          <span key={c} className="inline-block h-3 w-6 rounded-sm border border-line" style={{ backgroundColor: c }} />
        ))}
        <span>more {clusterWord} per arm</span>
        <span className="ml-3 inline-block h-3 w-6 rounded-sm outline outline-2 outline-[#7a4b00]" />
        <span>current inputs</span>
        <span className="ml-3">— not reachable</span>
      </div>
    </figure>
  );
}
