import { useId, type ReactNode } from 'react';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import type { CalculationOutput } from '@/lib/stats/calculations/types';
import { formatValue, labelOf } from './format';
import { headlineKeys, inputKeys, meaning } from './meaning';

export interface ResultPanelProps {
  output: CalculationOutput;
  /** Buttons or links shown under the answer, e.g. "Save to the study" on the Plan tab. */
  actions?: ReactNode;
  /** Heading of the panel; "Result" unless given. */
  title?: string;
  /** Level of the panel's heading (2 on a calculator page); its sections take the next level. */
  headingLevel?: 2 | 3;
}

/**
 * One calculation's answer: the solved value large, what it means in a sentence, then the
 * method, the formula in words, the references, the warnings and the inputs used. Pure
 * presentation of a `CalculationOutput`; the calculator pages and the Plan tab both use it.
 */
export function ResultPanel({ output, actions, title = 'Result', headingLevel = 2 }: ResultPanelProps) {
  const id = useId();
  const H = `h${headingLevel}` as 'h2' | 'h3';
  const Sub = `h${headingLevel + 1}` as 'h3' | 'h4';
  const headline = headlineKeys(output);
  const inputs = inputKeys(output);
  // Derived values that do not apply (null) are left out; an input not given reads "—".
  const derived = Object.keys(output.result).filter((k) => !inputs.includes(k) && !headline.includes(k) && output.result[k] !== null);
  const shownInputs = inputs.filter((k) => k in output.result && !headline.includes(k));
  return (
    <section aria-labelledby={`${id}-title`} className="space-y-5 rounded-lg border border-line bg-white p-5">
      <div className="flex flex-wrap items-center gap-2">
        <H id={`${id}-title`} className="text-lg font-bold">
          {title}
        </H>
        {output.feasibility === 'unreachable' && <Badge tone="caution">Target not reachable: nearest value shown</Badge>}
        {output.feasibility === 'already-met' && <Badge tone="caution">Target already met at the smallest size</Badge>}
      </div>
      <dl className="flex flex-wrap gap-x-10 gap-y-4">
        {headline.map((key) => (
          <div key={key}>
            <dt className="text-sm font-semibold text-muted">{labelOf(key)}</dt>
            <dd className="text-4xl font-bold tracking-tight text-ink" data-result={key}>
              {formatValue(key, output.result[key])}
            </dd>
          </div>
        ))}
      </dl>
      <p className="max-w-3xl text-base">{meaning(output)}</p>
      {output.warnings.length > 0 && (
        <Alert tone="caution" title="Read before using this number">
          <ul className="list-disc space-y-1 pl-5">
            {output.warnings.map((w) => (
              <li key={w}>{w}</li>
            ))}
          </ul>
        </Alert>
      )}
      {actions && <div className="flex flex-wrap gap-2">{actions}</div>}
      <div className="grid gap-5 2xl:grid-cols-2">
        <div className="space-y-4">
          <div>
            <Sub className="text-sm font-bold">Method</Sub>
            <p className="mt-1 text-sm">{output.method}</p>
          </div>
          <div>
            <Sub className="text-sm font-bold">Formula in words</Sub>
            <p className="mt-1 text-sm">{output.formula}</p>
          </div>
          <div>
            <Sub className="text-sm font-bold">References</Sub>
            <ul className="mt-1 list-disc space-y-1 pl-5 text-sm">
              {output.references.map((r) => (
                <li key={r}>{r}</li>
              ))}
            </ul>
          </div>
        </div>
        <div className="space-y-4">
          <ValueTable caption="Inputs used" keys={shownInputs} output={output} />
          {derived.length > 0 && <ValueTable caption="Also worked out" keys={derived} output={output} />}
        </div>
      </div>
    </section>
  );
}

function ValueTable({ caption, keys, output }: { caption: string; keys: string[]; output: CalculationOutput }) {
  return (
    <table className="w-full text-left text-sm">
      <caption className="mb-1 text-left text-sm font-bold">{caption}</caption>
      <tbody>
        {keys.map((key) => (
          <tr key={key} className="border-t border-line">
            <th scope="row" className="py-1 pr-3 font-normal text-muted">
              {labelOf(key)}
            </th>
            <td className="py-1 text-right font-semibold tabular-nums">{formatValue(key, output.result[key])}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
