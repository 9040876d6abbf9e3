import type { Metadata } from 'next';
import Link from 'next/link';
import { KINDS } from '@/components/calculations/kinds';

export const metadata: Metadata = { title: 'Sample-size calculators' };

export default function CalculatorsPage() {
  return (
    <>
      <div className="max-w-3xl space-y-3">
        <h1 className="text-3xl font-bold tracking-tight">Sample-size calculators</h1>
        <p className="text-muted">
          Sample size, power or the smallest detectable effect, worked out exactly as the Plan tab of a study does — with clusters, repeated
          measures, attrition and several outcomes accounted for. No account needed; nothing you enter leaves your browser.
        </p>
      </div>
      <ul className="grid gap-4 sm:grid-cols-2">
        {KINDS.map((k) => (
          <li key={k.kind} className="rounded-lg border border-line bg-white p-5">
            <h2 className="text-lg font-bold">
              <Link href={`/calculators/${k.kind}`} className="text-brand underline-offset-2 hover:underline">
                {k.title}
              </Link>
            </h2>
            <p className="mt-2 text-sm">{k.when}</p>
          </li>
        ))}
      </ul>
      <p className="max-w-3xl text-sm text-muted">
        The same calculations answer <code className="font-mono">POST /api/v1/calculations</code> as JSON, described in the{' '}
        <a href="/api/v1/openapi.json" className="text-brand underline">
          API document
        </a>
        .
      </p>
    </>
  );
}
