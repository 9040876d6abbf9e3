import Link from 'next/link';
import type { ReactNode } from 'react';
import { PlanningCaution } from '@/components/calculations/planning-caution';
import { Logo } from '@/components/logo';

/** The public calculators: no sign-in, the same caution on every page. */
export default function CalculatorsLayout({ children }: { children: ReactNode }) {
  return (
    <div className="min-h-screen bg-slate-50">
      <header className="border-b border-line bg-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-3 px-4 py-3">
          <Logo />
          <nav aria-label="Main" className="ml-auto flex items-center gap-4 text-sm">
            <Link href="/calculators" className="font-semibold text-ink hover:text-brand">
              All calculators
            </Link>
            <Link href="/studies" className="font-semibold text-brand hover:text-brand-dark">
              Your studies
            </Link>
          </nav>
        </div>
      </header>
      <main id="main" className="mx-auto max-w-6xl space-y-6 px-4 py-8">
        {children}
        <PlanningCaution />
      </main>
    </div>
  );
}
