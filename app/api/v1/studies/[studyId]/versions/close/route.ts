import { api } from '@/lib/api/handler';
import { closeMyVersion } from '@/lib/data/versions';
import { studyParamsSchema } from '@/lib/validation/params';

/** The wizard's author left the page: their open version ends here. */
export const POST = api(async ({ actor, params }) => closeMyVersion(actor, params.studyId), { params: studyParamsSchema });
