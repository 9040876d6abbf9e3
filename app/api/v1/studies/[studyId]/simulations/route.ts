import { api } from '@/lib/api/handler';
import { listStudySimulations } from '@/lib/data/simulations';

type Params = { studyId: string };

export const GET = api<Params>(async ({ actor, params }) => ({ items: await listStudySimulations(actor, params.studyId) }));
