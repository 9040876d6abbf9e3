'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import { STUDY_TABS } from '@/lib/study-tabs';

/** `openThreads`: the count shown on the Review tab (the layout reads it; writes on the Review tab refresh it). */
export function StudyTabs({ studyId, openThreads = 0 }: { studyId: string; openThreads?: number }) {
  const pathname = usePathname();
  const base = `/studies/${studyId}`;
  const tabs = [{ slug: '', label: 'Overview' }, ...STUDY_TABS];
  return (
    // The tabs wrap onto a second line on a narrow screen rather than scroll out of sight.
    <nav aria-label="Study sections" className="border-b border-line">
      <ul className="flex flex-wrap gap-x-1">
        {tabs.map((t) => {
          const href = t.slug ? `${base}/${t.slug}` : base;
          const current = t.slug ? pathname === href || pathname.startsWith(`${href}/`) : pathname === href;
          return (
            <li key={t.slug || 'overview'}>
              <Link
                href={href}
                aria-current={current ? 'page' : undefined}
                className={`block border-b-2 px-3 py-2 text-sm font-semibold ${current ? 'border-brand text-brand-dark' : 'border-transparent text-muted hover:text-ink'}`}
              >
                {t.label}
                {t.slug === 'review' && openThreads > 0 && ' '}
                {t.slug === 'review' && openThreads > 0 && (
                  <span className="rounded-full bg-brand px-1.5 py-0.5 text-xs text-white" data-testid="open-threads">
                    {openThreads}
                    <span className="sr-only"> open {openThreads === 1 ? 'thread' : 'threads'}</span>
                  </span>
                )}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
