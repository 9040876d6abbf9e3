import { api, parseBody } from '@/lib/api/handler';
import { acceptSuggestion } from '@/lib/data/suggestions';
import { suggestionAcceptSchema } from '@/lib/validation/review';
import { suggestionParamsSchema } from '@/lib/validation/params';

export const POST = api(
  async ({ req, actor, params }) => acceptSuggestion(actor, params.studyId, params.suggestionId, await parseBody(req, suggestionAcceptSchema)),
  { params: suggestionParamsSchema },
);
