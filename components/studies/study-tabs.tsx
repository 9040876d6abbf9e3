'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import { STUDY_TABS } from '@/lib/study-tabs';

export function StudyTabs({ studyId }: { studyId: string }) {
  const pathname = usePathname();
  const base = `/studies/${studyId}`;
  const tabs = [{ slug: '', label: 'Overview' }, ...STUDY_TABS];
  return (
    <nav aria-label="Study sections" className="-mx-4 overflow-x-auto border-b border-line px-4">
      <ul className="flex min-w-max gap-1">
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
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
