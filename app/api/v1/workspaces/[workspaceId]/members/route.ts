import { api } from '@/lib/api/handler';
import { memberDto } from '@/lib/api/dto';
import { listWorkspaceMembers } from '@/lib/data/workspaces';

export const GET = api<{ workspaceId: string }>(async ({ actor, params }) => ({
  items: (await listWorkspaceMembers(actor, params.workspaceId)).map(memberDto),
}));
