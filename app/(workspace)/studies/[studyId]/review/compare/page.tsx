import type { Metadata } from 'next';
import Link from 'next/link';
import { kindInfo } from '@/components/calculations/kinds';
import { VERDICT_LOOK, VIOLATION_TITLES } from '@/components/stress-test/words';
import { Alert } from '@/components/ui/alert';
import { buttonClass } from '@/components/ui/button';
import type { ComparisonDto } from '@/lib/api/versions';
import { currentActor } from '@/lib/auth/session';
import { DESIGN_STEPS } from '@/lib/design/schema';
import { compareStudyVersions, listVersions } from '@/lib/data/versions';
import { formatCount, formatPercent, plural } from '@/lib/format';
import { load } from '@/lib/page-guard';
import { analysisLabel } from '@/lib/sim/analysis-words';
import { versionTitle } from '@/components/review/words';

export const metadata: Metadata = { title: 'Compare versions' };

const STEP_LABEL = Object.fromEntries(DESIGN_STEPS.map((s) => [s.part, s.label])) as Record<string, string>;
const SEVERITY = { blocker: 'Blocker', warning: 'Warning', advice: 'Advice' } as const;

type Figures = ComparisonDto['plan']['before'];

function sizeText(f: Figures, value: number | null): string {
  if (value === null) return '—';
  return f.sizeLabel ? `${formatCount(value)} ${f.sizeLabel}` : formatCount(value);
}

/** A table of rows whose last two cells are a value before and after (the after in bold when it differs). */
function BeforeAfterTable({ caption, head, rows }: { caption: string; head: string[]; rows: { key: string; cells: string[]; testId?: string }[] }) {
  return (
    <table className="w-full text-left text-sm">
      <caption className="sr-only">{caption}</caption>
      <thead>
        <tr className="border-b border-line">
          {head.map((h) => (
            <th key={h} scope="col" className="py-1 pr-3">
              {h}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {rows.map(({ key, cells, testId }) => {
          const [first, ...rest] = cells;
          const before = cells[cells.length - 2];
          const after = cells[cells.length - 1];
          return (
            <tr key={key} className="border-b border-line align-top last:border-0" data-testid={testId}>
              <th scope="row" className="py-1 pr-3 font-normal">
                {first}
              </th>
              {rest.map((c, i) => (
                <td key={i} className={`py-1 pr-3 ${i === rest.length - 1 && before !== after ? 'font-semibold' : ''}`}>
                  {c}
                </td>
              ))}
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

function PlanTable({ plan }: { plan: ComparisonDto['plan'] }) {
  const rows: [string, (f: Figures) => string][] = [
    ['Calculation', (f) => (f.kind ? (kindInfo(f.kind)?.title ?? f.kind) : 'None yet')],
    ['Size needed for the target power', (f) => sizeText(f, f.requiredSize)],
    ['Size the design plans', (f) => sizeText(f, f.plannedSize)],
    ['Power with the planned size', (f) => formatPercent(f.powerAtPlanned)],
    ['Target power', (f) => formatPercent(f.targetPower)],
  ];
  return (
    <BeforeAfterTable
      caption="The Plan’s sample size and power, before and after"
      head={['Figure', 'Before', 'After']}
      rows={rows.map(([label, get]) => ({ key: label, cells: [label, get(plan.before), get(plan.after)] }))}
    />
  );
}

/**
 * Two versions side by side: the fields that changed in the wizard's words, the findings that
 * appeared or cleared, the Plan's size and power before and after, and the stress-test verdicts
 * when both versions have a finished run. Any two versions can be chosen here.
 */
export default async function ComparePage({ params, searchParams }: { params: Promise<{ studyId: string }>; searchParams: Promise<{ from?: string; to?: string }> }) {
  const { studyId } = await params;
  const sp = await searchParams;
  const actor = await currentActor();
  const versions = await load(listVersions(actor, studyId), `/studies/${studyId}/review/compare`);
  const newest = versions.items[0]?.number ?? 1;
  const asNumber = (v: string | undefined, fallback: number) => (v && /^[1-9][0-9]{0,8}$/.test(v) ? Number(v) : fallback);
  const to = asNumber(sp.to, newest);
  const from = asNumber(sp.from, Math.max(1, to - 1));
  const known = (n: number) => versions.items.some((v) => v.number === n);
  const c = known(from) && known(to) ? await load(compareStudyVersions(actor, studyId, from, to)) : null;
  const title = (n: number) => versionTitle(versions.items.find((v) => v.number === n) ?? { number: n, name: null });

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 className="text-xl font-bold">Compare versions</h2>
        <Link href={`/studies/${studyId}/review/versions`} className="text-sm font-semibold text-brand underline">
          All versions and sign-offs
        </Link>
      </div>
      <form method="get" className="flex flex-wrap items-end gap-3 rounded-lg border border-line bg-white p-4">
        {(['from', 'to'] as const).map((which) => (
          <div key={which} className="space-y-1">
            <label htmlFor={`compare-${which}`} className="block text-sm font-semibold">
              {which === 'from' ? 'From version' : 'To version'}
            </label>
            <select id={`compare-${which}`} name={which} defaultValue={which === 'from' ? from : to} className="block rounded-md border border-line bg-white px-3 py-2 text-sm">
              {versions.items.map((v) => (
                <option key={v.number} value={v.number}>
                  {versionTitle(v)}
                </option>
              ))}
            </select>
          </div>
        ))}
        <button type="submit" className={buttonClass('secondary')}>
          Compare
        </button>
      </form>

      {!c ? (
        <Alert tone="caution">Choose two versions of this study to compare.</Alert>
      ) : (
        <>
          <p className="text-sm">
            From <span className="font-semibold">{title(c.from.number)}</span> to <span className="font-semibold">{title(c.to.number)}</span>.
          </p>
          <section aria-labelledby="changes-heading" className="space-y-2 rounded-lg border border-line bg-white p-5">
            <h3 id="changes-heading" className="text-lg font-bold">
              What changed in the design
            </h3>
            {c.changes.length === 0 ? (
              <p className="text-sm">The two versions have the same design.</p>
            ) : (
              <BeforeAfterTable
                caption="Changed fields, old and new value"
                head={['Field', 'Step', 'Before', 'After']}
                rows={c.changes.map((ch) => ({ key: ch.path, cells: [ch.label, STEP_LABEL[ch.step]!, ch.before, ch.after], testId: 'change' }))}
              />
            )}
          </section>

          <div className="grid gap-5 lg:grid-cols-2">
            <section aria-labelledby="findings-heading" className="space-y-2 rounded-lg border border-line bg-white p-5">
              <h3 id="findings-heading" className="text-lg font-bold">
                Findings
              </h3>
              <p className="text-sm text-muted">{plural(c.findings.unchanged, 'finding')} in both.</p>
              {(['appeared', 'cleared'] as const).map((which) => (
                <div key={which}>
                  <h4 className="text-sm font-semibold">{which === 'appeared' ? 'Appeared' : 'Cleared'}</h4>
                  {c.findings[which].length === 0 ? (
                    <p className="text-sm text-muted">None.</p>
                  ) : (
                    <ul className="list-disc space-y-1 pl-5 text-sm">
                      {c.findings[which].map((f) => (
                        <li key={`${f.ruleId}/${f.key}`}>
                          {SEVERITY[f.severity]}: {f.title}
                        </li>
                      ))}
                    </ul>
                  )}
                </div>
              ))}
            </section>
            <section aria-labelledby="plan-heading" className="space-y-2 rounded-lg border border-line bg-white p-5">
              <h3 id="plan-heading" className="text-lg font-bold">
                The Plan’s sample size and power
              </h3>
              <PlanTable plan={c.plan} />
              <p className="text-xs text-muted">Worked out from each version’s design by the calculation the Plan tab offers for it.</p>
            </section>
          </div>

          <section aria-labelledby="stress-heading" className="space-y-2 rounded-lg border border-line bg-white p-5">
            <h3 id="stress-heading" className="text-lg font-bold">
              Stress-test verdicts
            </h3>
            {!c.stress ? (
              <p className="text-sm text-muted">Shown when both versions have a finished stress test.</p>
            ) : c.stress.rows.length === 0 ? (
              <p className="text-sm text-muted">The two runs share no scenario and analysis.</p>
            ) : (
              <BeforeAfterTable
                caption="Verdict of each scenario and analysis, before and after"
                head={['Scenario', 'Analysis', 'Before', 'After']}
                rows={c.stress.rows.map((r) => ({
                  key: `${r.scenario}/${r.analysis}`,
                  cells: [r.scenarioName ?? VIOLATION_TITLES[r.violation as keyof typeof VIOLATION_TITLES] ?? r.violation, analysisLabel(r.analysis), VERDICT_LOOK[r.before].word, VERDICT_LOOK[r.after].word],
                }))}
              />
            )}
          </section>
        </>
      )}
    </div>
  );
}
