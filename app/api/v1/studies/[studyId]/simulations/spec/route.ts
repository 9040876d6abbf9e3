import { api, parseQuery } from '@/lib/api/handler';
import { defaultSimulationSpec } from '@/lib/data/simulations';
import { simulationSpecQuerySchema } from '@/lib/validation/simulation-run';

type Params = { studyId: string };

export const GET = api<Params>(async ({ req, actor, params }) => {
  const { revision } = parseQuery(req, simulationSpecQuerySchema);
  return defaultSimulationSpec(actor, params.studyId, revision);
});
