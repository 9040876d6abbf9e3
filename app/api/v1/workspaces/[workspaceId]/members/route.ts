import { api } from '@/lib/api/handler';
import { memberDto } from '@/lib/api/dto';
import { listWorkspaceMembers } from '@/lib/data/workspaces';
import { workspaceParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ actor, params }) => ({
    items: (await listWorkspaceMembers(actor, params.workspaceId)).map(memberDto),
  }),
  { params: workspaceParamsSchema },
);
