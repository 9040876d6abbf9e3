import { api } from '@/lib/api/handler';
import { reopenThread } from '@/lib/data/threads';
import { threadParamsSchema } from '@/lib/validation/params';

export const POST = api(async ({ actor, params }) => reopenThread(actor, params.studyId, params.threadId), { params: threadParamsSchema });
