'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import { STUDY_TABS } from '@/lib/study-tabs';

export function StudyTabs({ studyId }: { studyId: string }) {
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
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
