import { api, parseBody } from '@/lib/api/handler';
import { declineSuggestion } from '@/lib/data/suggestions';
import { suggestionDeclineSchema } from '@/lib/validation/review';
import { suggestionParamsSchema } from '@/lib/validation/params';

export const POST = api(
  async ({ req, actor, params }) => declineSuggestion(actor, params.studyId, params.suggestionId, await parseBody(req, suggestionDeclineSchema)),
  { params: suggestionParamsSchema },
);
