import { api, parseBody } from '@/lib/api/handler';
import { resolveThread } from '@/lib/data/threads';
import { threadResolveSchema } from '@/lib/validation/review';
import { threadParamsSchema } from '@/lib/validation/params';

export const POST = api(
  async ({ req, actor, params }) => resolveThread(actor, params.studyId, params.threadId, await parseBody(req, threadResolveSchema)),
  { params: threadParamsSchema },
);
