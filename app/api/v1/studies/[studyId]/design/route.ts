import { api, DESIGN_BODY_BYTES, parseBody } from '@/lib/api/handler';
import { getDesign, saveDesign } from '@/lib/data/designs';
import { designSaveSchema } from '@/lib/validation/design';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(async ({ actor, params }) => getDesign(actor, params.studyId), { params: studyParamsSchema });

export const PUT = api(
  async ({ req, actor, params }) => {
    const input = await parseBody(req, designSaveSchema, { maxBytes: DESIGN_BODY_BYTES });
    return saveDesign(actor, params.studyId, input);
  },
  { params: studyParamsSchema },
);
