'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import { useEffect, useRef, useState } from 'react';

interface Item {
  id: string;
  name: string;
  role: 'admin' | 'member';
}

/** A disclosure menu of the user's workspaces; works with keyboard and without JavaScript. */
export function WorkspaceSwitcher({ workspaces, currentId }: { workspaces: Item[]; currentId?: string }) {
  const pathname = usePathname();
  const fromPath = pathname.match(/^\/workspaces\/([0-9a-f-]{36})/)?.[1];
  // On study pages the last workspace opened (remembered in a cookie) is the current one.
  const [remembered, setRemembered] = useState<string | undefined>();
  useEffect(() => {
    setRemembered(document.cookie.match(/(?:^|; )uw-workspace=([0-9a-f-]{36})/)?.[1]);
  }, [pathname]);
  const active = workspaces.find((w) => w.id === (fromPath ?? currentId ?? remembered));
  const ref = useRef<HTMLDetailsElement>(null);

  useEffect(() => {
    if (ref.current) ref.current.open = false;
  }, [pathname]);

  return (
    <details ref={ref} className="relative">
      <summary className="cursor-pointer list-none rounded-md border border-line bg-white px-3 py-1.5 text-sm font-semibold">
        <span className="sr-only">Workspace: </span>
        {active?.name ?? 'Choose a workspace'} <span aria-hidden="true">▾</span>
      </summary>
      <div className="absolute left-0 z-20 mt-1 w-72 rounded-md border border-line bg-white p-2 shadow-lg">
        <p className="px-2 pb-1 text-xs font-semibold uppercase text-muted">Your workspaces</p>
        <ul>
          {workspaces.map((w) => (
            <li key={w.id}>
              <Link
                href={`/workspaces/${w.id}`}
                aria-current={w.id === active?.id ? 'page' : undefined}
                className="flex justify-between rounded px-2 py-1.5 text-sm hover:bg-brand-light aria-[current=page]:font-semibold"
              >
                <span>{w.name}</span>
                <span className="text-xs text-muted">{w.role}</span>
              </Link>
            </li>
          ))}
        </ul>
        <Link href="/workspaces/new" className="mt-1 block rounded px-2 py-1.5 text-sm text-brand hover:bg-brand-light">
          + New workspace
        </Link>
      </div>
    </details>
  );
}
