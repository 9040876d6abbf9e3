import { api, parseBody, parseQuery } from '@/lib/api/handler';
import { createSuggestion, listSuggestions } from '@/lib/data/suggestions';
import { suggestionCreateSchema, suggestionListQuerySchema } from '@/lib/validation/review';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ req, actor, params }) => ({ items: await listSuggestions(actor, params.studyId, parseQuery(req, suggestionListQuerySchema)) }),
  { params: studyParamsSchema },
);

export const POST = api(
  async ({ req, actor, params }) => createSuggestion(actor, params.studyId, await parseBody(req, suggestionCreateSchema)),
  { params: studyParamsSchema, status: 201 },
);
