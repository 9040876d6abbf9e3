import type { Metadata } from 'next';
import Link from 'next/link';
import { Suspense } from 'react';
import { CreateStudyForm } from '@/components/studies/create-study-form';
import { StudiesTable } from '@/components/studies/studies-table';
import { RememberWorkspace } from '@/components/workspace/remember-workspace';
import { currentActor } from '@/lib/auth/session';
import { getWorkspace } from '@/lib/data/workspaces';
import { load } from '@/lib/page-guard';

export const metadata: Metadata = { title: 'Studies' };

export default async function WorkspacePage({ params }: { params: Promise<{ workspaceId: string }> }) {
  const { workspaceId } = await params;
  const ws = await load(getWorkspace(await currentActor(), workspaceId), `/workspaces/${workspaceId}`);
  return (
    <div className="space-y-6">
      <RememberWorkspace id={ws.id} />
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div>
          <p className="text-sm text-muted">{ws.name}</p>
          <h1 className="text-2xl font-bold">Studies</h1>
        </div>
        <div className="flex items-center gap-3">
          <Link href={`/workspaces/${ws.id}/members`} className="text-sm font-semibold text-brand underline">
            Members{ws.role === 'admin' ? ' and invitations' : ''}
          </Link>
          <CreateStudyForm workspaceId={ws.id} />
        </div>
      </div>
      <Suspense fallback={<p className="text-sm text-muted">Loading studies…</p>}>
        <StudiesTable workspaceId={ws.id} />
      </Suspense>
    </div>
  );
}
