import { api, DESIGN_BODY_BYTES, parseBody } from '@/lib/api/handler';
import { checkDesign } from '@/lib/data/designs';
import { checkRunSchema } from '@/lib/validation/design';

export const POST = api<{ studyId: string }>(async ({ req, actor, params }) => {
  const { design } = await parseBody(req, checkRunSchema, { maxBytes: DESIGN_BODY_BYTES });
  return checkDesign(actor, params.studyId, design);
});
