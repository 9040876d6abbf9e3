import type { ReactNode } from 'react';

export function Badge({ children, tone = 'neutral' }: { children: ReactNode; tone?: 'neutral' | 'brand' | 'ok' | 'caution' }) {
  const tones = {
    neutral: 'bg-slate-100 text-ink border-line',
    brand: 'bg-brand-light text-brand-dark border-brand',
    ok: 'bg-ok-light text-ok border-ok',
    caution: 'bg-caution-light text-caution border-caution',
  } as const;
  return <span className={`inline-block rounded-full border px-2 py-0.5 text-xs font-semibold ${tones[tone]}`}>{children}</span>;
}
