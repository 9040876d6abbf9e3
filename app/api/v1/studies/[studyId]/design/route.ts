import { api, DESIGN_BODY_BYTES, parseBody } from '@/lib/api/handler';
import { getDesign, saveDesign } from '@/lib/data/designs';
import { designSaveSchema } from '@/lib/validation/design';

type Params = { studyId: string };

export const GET = api<Params>(async ({ actor, params }) => getDesign(actor, params.studyId));

export const PUT = api<Params>(async ({ req, actor, params }) => {
  const input = await parseBody(req, designSaveSchema, { maxBytes: DESIGN_BODY_BYTES });
  return saveDesign(actor, params.studyId, input);
});
