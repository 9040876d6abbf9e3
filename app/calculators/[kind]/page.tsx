import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { CalculatorForm } from '@/components/calculations/calculator-form';
import { kindInfo } from '@/components/calculations/kinds';
import { CALCULATION_KINDS } from '@/lib/stats/calculations/request';

/** One page per kind, built ahead; any other name is a 404. */
export const dynamicParams = false;

export function generateStaticParams() {
  return CALCULATION_KINDS.map((kind) => ({ kind }));
}

export async function generateMetadata({ params }: { params: Promise<{ kind: string }> }): Promise<Metadata> {
  const info = kindInfo((await params).kind);
  return { title: info ? `${info.title} calculator` : 'Not found' };
}

export default async function CalculatorPage({ params }: { params: Promise<{ kind: string }> }) {
  const info = kindInfo((await params).kind);
  if (!info) notFound();
  return (
    <>
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link href="/calculators" className="text-brand underline">
          Calculators
        </Link>
        <span aria-hidden="true"> / </span>
        <span aria-current="page">{info.title}</span>
      </nav>
      <div className="max-w-3xl space-y-2">
        <h1 className="text-3xl font-bold tracking-tight">{info.title}</h1>
        <p className="text-muted">{info.when}</p>
      </div>
      <CalculatorForm kind={info.kind} />
    </>
  );
}
