import { api, DESIGN_BODY_BYTES, parseBody } from '@/lib/api/handler';
import { checkDesign } from '@/lib/data/designs';
import { checkRunSchema } from '@/lib/validation/design';
import { studyParamsSchema } from '@/lib/validation/params';

export const POST = api(
  async ({ req, actor, params }) => {
    const { design } = await parseBody(req, checkRunSchema, { maxBytes: DESIGN_BODY_BYTES });
    return checkDesign(actor, params.studyId, design);
  },
  { params: studyParamsSchema },
);
