import { api, parseBody } from '@/lib/api/handler';
import { invitationDto } from '@/lib/api/dto';
import { inviteToWorkspace, listWorkspaceInvitations } from '@/lib/data/invitations';
import { workspaceInvitationCreateSchema } from '@/lib/validation/workspace';
import { workspaceParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ actor, params }) => ({
    items: (await listWorkspaceInvitations(actor, params.workspaceId)).map(invitationDto),
  }),
  { params: workspaceParamsSchema },
);

export const POST = api(
  async ({ req, actor, params }) => {
    const input = await parseBody(req, workspaceInvitationCreateSchema);
    return invitationDto(await inviteToWorkspace(actor, params.workspaceId, input));
  },
  { params: workspaceParamsSchema, status: 201 },
);
