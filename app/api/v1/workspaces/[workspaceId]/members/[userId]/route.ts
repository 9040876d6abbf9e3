import { api, parseBody } from '@/lib/api/handler';
import { memberDto } from '@/lib/api/dto';
import { changeWorkspaceMemberRole, removeWorkspaceMember } from '@/lib/data/workspaces';
import { workspaceMemberRoleUpdateSchema } from '@/lib/validation/workspace';
import { workspaceMemberParamsSchema } from '@/lib/validation/params';

export const PATCH = api(
  async ({ req, actor, params }) => {
    const { role } = await parseBody(req, workspaceMemberRoleUpdateSchema);
    return { items: (await changeWorkspaceMemberRole(actor, params.workspaceId, params.userId, role)).map(memberDto) };
  },
  { params: workspaceMemberParamsSchema },
);

export const DELETE = api(
  async ({ actor, params }) => {
    await removeWorkspaceMember(actor, params.workspaceId, params.userId);
  },
  { params: workspaceMemberParamsSchema },
);
