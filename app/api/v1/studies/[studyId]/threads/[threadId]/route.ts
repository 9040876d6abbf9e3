import { api } from '@/lib/api/handler';
import { getThread } from '@/lib/data/threads';
import { threadParamsSchema } from '@/lib/validation/params';

export const GET = api(async ({ actor, params }) => getThread(actor, params.studyId, params.threadId), { params: threadParamsSchema });
