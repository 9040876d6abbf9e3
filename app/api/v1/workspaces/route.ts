import { api, parseBody } from '@/lib/api/handler';
import type { WorkspaceDto } from '@/lib/api/dto';
import { createWorkspace, listMyWorkspaces } from '@/lib/data/workspaces';
import { workspaceCreateSchema } from '@/lib/validation/workspace';

export const GET = api(async ({ actor }): Promise<{ items: WorkspaceDto[] }> => ({ items: await listMyWorkspaces(actor) }));

export const POST = api(
  async ({ req, actor }): Promise<WorkspaceDto> => {
    const input = await parseBody(req, workspaceCreateSchema);
    return createWorkspace(actor, input);
  },
  { status: 201 },
);
