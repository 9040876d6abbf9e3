import type { Metadata } from 'next';
import Link from 'next/link';
import { InvitationsList } from '@/components/members/invitations-list';
import { InviteForm } from '@/components/members/invite-form';
import { MembersList } from '@/components/members/members-list';
import { canWorkspace } from '@/lib/auth/permissions';
import { currentActor } from '@/lib/auth/session';
import { getWorkspace } from '@/lib/data/workspaces';
import { load } from '@/lib/page-guard';

export const metadata: Metadata = { title: 'Workspace members' };

const ROLES = [
  { value: 'member', label: 'Member', description: 'Creates studies and joins the studies they are invited to.' },
  { value: 'admin', label: 'Admin', description: 'Also manages the workspace’s members and invitations.' },
];

export default async function WorkspaceMembersPage({ params }: { params: Promise<{ workspaceId: string }> }) {
  const { workspaceId } = await params;
  const actor = await currentActor();
  const ws = await load(getWorkspace(actor, workspaceId), `/workspaces/${workspaceId}/members`);
  const isAdmin = canWorkspace(ws.role, 'workspace.members.manage');
  return (
    <div className="space-y-8">
      <div>
        <p className="text-sm">
          <Link href={`/workspaces/${ws.id}`} className="text-brand underline">
            {ws.name}
          </Link>
        </p>
        <h1 className="text-2xl font-bold">Members</h1>
        {!isAdmin && <p className="mt-1 text-sm text-muted">Only workspace admins can invite people or change roles.</p>}
      </div>
      <section aria-labelledby="members-heading" className="space-y-3">
        <h2 id="members-heading" className="text-lg font-bold">
          People in this workspace
        </h2>
        <MembersList
          endpoint={`/api/v1/workspaces/${ws.id}/members`}
          queryKey={['workspace-members', ws.id]}
          canManage={isAdmin}
          roleOptions={ROLES}
          selfId={actor!.id}
        />
      </section>
      {isAdmin && (
        <>
          <section aria-labelledby="invite-heading" className="space-y-3 rounded-lg border border-line bg-white p-5">
            <h2 id="invite-heading" className="text-lg font-bold">
              Invite to the workspace
            </h2>
            <InviteForm
              endpoint={`/api/v1/workspaces/${ws.id}/invitations`}
              roles={ROLES}
              defaultRole="member"
              queryKey={['workspace-invitations', ws.id]}
            />
          </section>
          <section aria-labelledby="invitations-heading" className="space-y-3">
            <h2 id="invitations-heading" className="text-lg font-bold">
              Invitations
            </h2>
            <InvitationsList endpoint={`/api/v1/workspaces/${ws.id}/invitations`} queryKey={['workspace-invitations', ws.id]} />
          </section>
        </>
      )}
    </div>
  );
}
