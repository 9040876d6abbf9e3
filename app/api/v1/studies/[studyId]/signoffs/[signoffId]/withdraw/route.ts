import { api, parseBody } from '@/lib/api/handler';
import { withdrawSignoff } from '@/lib/data/versions';
import { signoffParamsSchema } from '@/lib/validation/params';
import { signoffWithdrawSchema } from '@/lib/validation/versions';

export const POST = api(
  async ({ req, actor, params }) => withdrawSignoff(actor, params.studyId, params.signoffId, await parseBody(req, signoffWithdrawSchema)),
  { params: signoffParamsSchema },
);
