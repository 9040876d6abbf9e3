import Link from 'next/link';
import { Logo } from '@/components/logo';
import { buttonClass } from '@/components/ui/button';
import { currentActor } from '@/lib/auth/session';

export const dynamic = 'force-dynamic';

const STEPS = [
  { title: 'Describe the design', text: 'What the experimental unit is, how units nest in clusters, how often each is measured and what is assigned at which level.' },
  { title: 'See where independence fails', text: 'Pupils in one classroom, plants on one tray, nights of one volunteer: Unitwise flags them and says which analysis the design needs.' },
  { title: 'Justify the sample size', text: 'Clusters, design effect, repeated measures, attrition and several outcomes, with the methods cited for a grant or protocol.' },
  { title: 'Stress-test the analysis', text: 'Simulated power, false-positive rate and interval coverage when normality, constant variance or linearity break.' },
];

export default async function LandingPage() {
  const actor = await currentActor().catch(() => null);
  return (
    <div className="min-h-screen bg-white">
      <header className="mx-auto flex max-w-6xl items-center justify-between px-4 py-4">
        <Logo />
        <nav aria-label="Account" className="flex gap-2">
          <Link href="/calculators" className={buttonClass('ghost')}>
            Calculators
          </Link>
          {actor ? (
            <Link href="/studies" className={buttonClass('primary')}>
              Your studies
            </Link>
          ) : (
            <>
              <Link href="/sign-in" className={buttonClass('ghost')}>
                Sign in
              </Link>
              <Link href="/sign-up" className={buttonClass('primary')}>
                Create an account
              </Link>
            </>
          )}
        </nav>
      </header>
      <main id="main">
        <section className="mx-auto max-w-6xl px-4 pt-12 pb-16">
          <h1 className="max-w-3xl text-4xl font-bold tracking-tight sm:text-5xl">Count the units that are really independent.</h1>
          <p className="mt-5 max-w-2xl text-lg text-muted">
            Unitwise is a shared workspace for planning studies analysed with linear models. Researchers, methods consultants and grant
            writers describe the design, find where measurements depend on each other, justify the sample size and see how the planned
            analysis behaves when its assumptions fail — before any data are collected.
          </p>
          <div className="mt-8 flex flex-wrap gap-3">
            <Link href={actor ? '/studies' : '/sign-up'} className={buttonClass('primary', 'px-6 py-3 text-base')}>
              {actor ? 'Open your studies' : 'Start planning'}
            </Link>
            {!actor && (
              <Link href="/sign-in" className={buttonClass('secondary', 'px-6 py-3 text-base')}>
                Sign in
              </Link>
            )}
          </div>
        </section>
        <section aria-labelledby="how-heading" className="border-t border-line bg-slate-50">
          <div className="mx-auto max-w-6xl px-4 py-12">
            <h2 id="how-heading" className="text-2xl font-bold">
              From design to justification
            </h2>
            <ol className="mt-6 grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
              {STEPS.map((s, i) => (
                <li key={s.title} className="rounded-lg border border-line bg-white p-5">
                  <p className="text-sm font-bold text-brand">Step {i + 1}</p>
                  <h3 className="mt-1 font-bold">{s.title}</h3>
                  <p className="mt-2 text-sm text-muted">{s.text}</p>
                </li>
              ))}
            </ol>
            <p className="mt-8 max-w-3xl text-sm text-muted">
              Results are planning estimates, not guarantees. Studies with people or animals need approval from an ethics board (IRB, REC
              or IACUC) and review by a qualified statistician; follow your local regulations.
            </p>
          </div>
        </section>
      </main>
    </div>
  );
}
