import { api, parseQuery } from '@/lib/api/handler';
import { defaultSimulationSpec } from '@/lib/data/simulations';
import { simulationSpecQuerySchema } from '@/lib/validation/simulation-run';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ req, actor, params }) => {
    const { revision } = parseQuery(req, simulationSpecQuerySchema);
    return defaultSimulationSpec(actor, params.studyId, revision);
  },
  { params: studyParamsSchema },
);
