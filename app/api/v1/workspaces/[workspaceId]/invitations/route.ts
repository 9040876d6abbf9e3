import { api, parseBody } from '@/lib/api/handler';
import { invitationDto } from '@/lib/api/dto';
import { inviteToWorkspace, listWorkspaceInvitations } from '@/lib/data/invitations';
import { workspaceInvitationCreateSchema } from '@/lib/validation/workspace';

type Params = { workspaceId: string };

export const GET = api<Params>(async ({ actor, params }) => ({
  items: (await listWorkspaceInvitations(actor, params.workspaceId)).map(invitationDto),
}));

export const POST = api<Params>(
  async ({ req, actor, params }) => {
    const input = await parseBody(req, workspaceInvitationCreateSchema);
    return invitationDto(await inviteToWorkspace(actor, params.workspaceId, input));
  },
  { status: 201 },
);
