import { FRISON_POCOCK_1992, VICKERS_ALTMAN_2001 } from '@/lib/citations';
import { calculate } from '@/lib/stats/calculations';
import type { CalculationRequest } from '@/lib/stats/calculations/request';
import { formatValue, labelOf } from './format';

type RepeatedRequest = Extract<CalculationRequest, { kind: 'repeated-measures' }>;
type Analysis = RepeatedRequest['analysis'];

const ANALYSES: { analysis: Analysis; title: string; what: string }[] = [
  { analysis: 'post', title: 'Follow-up only', what: 'Compares the mean of the follow-ups; the baseline is not used.' },
  { analysis: 'change', title: 'Change from baseline', what: 'Compares the change from the baseline mean to the follow-up mean.' },
  { analysis: 'ancova', title: 'ANCOVA', what: 'Compares the follow-up mean adjusted for the baseline mean.' },
];

/** The answer (the solved quantity, else power) of `request` analysed as `analysis`; null if it cannot be worked out. */
function answerOf(request: RepeatedRequest, analysis: Analysis): { key: string; value: number } | null {
  try {
    const out = calculate({ ...request, analysis });
    const key = out.solvedFor ?? 'power';
    const value = out.result[key];
    return typeof value === 'number' ? { key, value } : null;
  } catch {
    return null;
  }
}

/**
 * A baseline-and-follow-up calculation shown as its three analyses side by side, each with what it
 * needs (the quantity solved for), ANCOVA recommended: never less efficient than the other two
 * (Frison & Pocock 1992; Vickers & Altman 2001). `planned` marks the analysis the design's plan names.
 */
export function BaselineComparison({ request, planned, heading: Heading }: { request: RepeatedRequest; planned?: Analysis; heading: 'h3' | 'h4' }) {
  if (request.baselines < 1) return null;
  const answers = ANALYSES.map((a) => ({ ...a, answer: answerOf(request, a.analysis) }));
  return (
    <div className="space-y-2" data-testid="baseline-comparison">
      <Heading className="text-sm font-bold">Three ways to use the baseline</Heading>
      <ul className="grid gap-2 sm:grid-cols-3">
        {answers.map(({ analysis, title, what, answer }) => {
          const recommended = analysis === 'ancova';
          return (
            <li key={analysis} className={`rounded-md border px-3 py-2 text-sm ${recommended ? 'border-2 border-ok bg-ok-light' : 'border-line bg-white'}`} data-analysis={analysis}>
              <p className="font-semibold">
                {title}
                {recommended && (
                  <span className="ml-2 inline-flex items-center gap-1 rounded-full border border-ok px-2 text-xs font-semibold text-ok">
                    <span aria-hidden="true">✓</span> Recommended
                  </span>
                )}
              </p>
              <p className="mt-1 text-2xl font-bold tabular-nums">{answer ? formatValue(answer.key, answer.value) : '—'}</p>
              <p className="text-xs text-muted">{answer ? labelOf(answer.key).toLowerCase() : 'cannot be worked out'}</p>
              <p className="mt-1 text-xs">{what}</p>
              {planned === analysis && <p className="mt-1 text-xs font-semibold">Your analysis plan</p>}
            </li>
          );
        })}
      </ul>
      <p className="text-xs text-muted">
        ANCOVA is never less efficient than the other two under these assumptions ({FRISON_POCOCK_1992.short}; {VICKERS_ALTMAN_2001.short}); the answer above is
        for ANCOVA.
      </p>
    </div>
  );
}
