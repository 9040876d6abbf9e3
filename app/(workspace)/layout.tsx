import Link from 'next/link';
import { redirect } from 'next/navigation';
import type { ReactNode } from 'react';
import { signOutAction } from '@/app/(auth)/actions';
import { Logo } from '@/components/logo';
import { WorkspaceSwitcher } from '@/components/workspace/workspace-switcher';
import { currentActor } from '@/lib/auth/session';
import { listMyWorkspaces } from '@/lib/data/workspaces';

export default async function WorkspaceLayout({ children }: { children: ReactNode }) {
  const actor = await currentActor();
  if (!actor) redirect('/sign-in');
  const workspaces = await listMyWorkspaces(actor);
  return (
    <div className="min-h-screen">
      <header className="border-b border-line bg-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-3 px-4 py-3">
          <Logo href="/studies" />
          <WorkspaceSwitcher workspaces={workspaces} />
          <nav aria-label="Main" className="ml-auto flex items-center gap-4 text-sm">
            <Link href="/studies" className="font-semibold text-ink hover:text-brand">
              Studies
            </Link>
            <Link href="/calculators" className="font-semibold text-ink hover:text-brand">
              Calculators
            </Link>
            <Link href="/settings/notifications" className="font-semibold text-ink hover:text-brand">
              Notifications
            </Link>
            <span className="hidden text-muted sm:inline" title={actor.email}>
              {actor.name ?? actor.email}
            </span>
            <form action={signOutAction}>
              <button type="submit" className="rounded-md px-2 py-1 font-semibold text-brand hover:bg-brand-light">
                Sign out
              </button>
            </form>
          </nav>
        </div>
      </header>
      <main id="main" className="mx-auto max-w-6xl px-4 py-6">
        {children}
      </main>
    </div>
  );
}
