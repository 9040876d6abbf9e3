import { api, parseBody, parseQuery } from '@/lib/api/handler';
import { createThread, listThreads } from '@/lib/data/threads';
import { threadCreateSchema, threadListQuerySchema } from '@/lib/validation/review';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ req, actor, params }) => ({ items: await listThreads(actor, params.studyId, parseQuery(req, threadListQuerySchema)) }),
  { params: studyParamsSchema },
);

export const POST = api(
  async ({ req, actor, params }) => createThread(actor, params.studyId, await parseBody(req, threadCreateSchema)),
  { params: studyParamsSchema, status: 201 },
);
