import { api } from '@/lib/api/handler';
import { cancelSimulation, getSimulation } from '@/lib/data/simulations';

type Params = { simulationId: string };

export const GET = api<Params>(async ({ actor, params }) => getSimulation(actor, params.simulationId));

export const DELETE = api<Params>(async ({ actor, params }) => cancelSimulation(actor, params.simulationId));
