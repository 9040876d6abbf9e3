import { api, parseBody } from '@/lib/api/handler';
import { replyToThread } from '@/lib/data/threads';
import { replyCreateSchema } from '@/lib/validation/review';
import { threadParamsSchema } from '@/lib/validation/params';

export const POST = api(
  async ({ req, actor, params }) => replyToThread(actor, params.studyId, params.threadId, await parseBody(req, replyCreateSchema)),
  { params: threadParamsSchema, status: 201 },
);
