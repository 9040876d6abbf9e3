import { api, parseBody } from '@/lib/api/handler';
import { memberDto } from '@/lib/api/dto';
import { changeWorkspaceMemberRole, removeWorkspaceMember } from '@/lib/data/workspaces';
import { workspaceMemberRoleUpdateSchema } from '@/lib/validation/workspace';

type Params = { workspaceId: string; userId: string };

export const PATCH = api<Params>(async ({ req, actor, params }) => {
  const { role } = await parseBody(req, workspaceMemberRoleUpdateSchema);
  return { items: (await changeWorkspaceMemberRole(actor, params.workspaceId, params.userId, role)).map(memberDto) };
});

export const DELETE = api<Params>(async ({ actor, params }) => {
  await removeWorkspaceMember(actor, params.workspaceId, params.userId);
});
