'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';

/** The Review tab's own sections: threads and suggestions, versions and sign-off, activity. */
export function ReviewNav({ studyId }: { studyId: string }) {
  const pathname = usePathname();
  const base = `/studies/${studyId}/review`;
  const links = [
    { href: base, label: 'Threads and suggestions' },
    { href: `${base}/versions`, label: 'Versions and sign-off' },
    { href: `${base}/activity`, label: 'Activity' },
  ];
  return (
    <nav aria-label="Review sections">
      <ul className="flex flex-wrap gap-2">
        {links.map((l) => {
          const current = l.href === base ? pathname === base : pathname === l.href || pathname.startsWith(`${l.href}/`);
          return (
            <li key={l.href}>
              <Link
                href={l.href}
                // Not prefetched: the other sections may not be built yet, and a prefetched missing page keeps its request open.
                prefetch={false}
                aria-current={current ? 'page' : undefined}
                className={`block rounded-full border px-3 py-1 text-sm font-semibold ${current ? 'border-brand bg-brand-light text-brand-dark' : 'border-line bg-white text-ink hover:bg-slate-100'}`}
              >
                {l.label}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
