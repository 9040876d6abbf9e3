import { api, parseBody } from '@/lib/api/handler';
import { listSignoffs, signOff } from '@/lib/data/versions';
import { studyParamsSchema } from '@/lib/validation/params';
import { signoffCreateSchema } from '@/lib/validation/versions';

export const GET = api(async ({ actor, params }) => listSignoffs(actor, params.studyId), { params: studyParamsSchema });

export const POST = api(async ({ req, actor, params }) => signOff(actor, params.studyId, await parseBody(req, signoffCreateSchema)), { params: studyParamsSchema, status: 201 });
