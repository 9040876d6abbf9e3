/**
 * The analytic calculations of the Plan tab, the calculator pages and POST /api/v1/calculations:
 * `calculate` takes a parsed request (lib/stats/calculations/request.ts) and dispatches to one
 * file per kind. It throws CalculationInputError (errors.ts) when the inputs do not fit
 * together; the API answers that with 400 and its `fields`.
 */
import type { CalculationRequest } from './request';
import { clusterMeans } from './cluster-means';
import { clusterProportions } from './cluster-proportions';
import { clusterRates } from './cluster-rates';
import { designEffectCalculation } from './design-effect';
import { longitudinalSlopes } from './longitudinal-slopes';
import { optimalAllocation } from './optimal-allocation';
import { regression } from './regression';
import { repeatedMeasures } from './repeated-measures';
import { twoGroupMeans } from './two-group-means';
import { twoProportions } from './two-proportions';
import { twoRates } from './two-rates';
import type { CalculationOutput } from './types';

export { CalculationInputError } from './errors';
export type { CalculationOutput, Feasibility, ResultValue } from './types';

export function calculate(request: CalculationRequest): CalculationOutput {
  switch (request.kind) {
    case 'two-group-means':
      return twoGroupMeans(request);
    case 'regression':
      return regression(request);
    case 'cluster-means':
      return clusterMeans(request);
    case 'repeated-measures':
      return repeatedMeasures(request);
    case 'longitudinal-slopes':
      return longitudinalSlopes(request);
    case 'two-proportions':
      return twoProportions(request);
    case 'cluster-proportions':
      return clusterProportions(request);
    case 'two-rates':
      return twoRates(request);
    case 'cluster-rates':
      return clusterRates(request);
    case 'design-effect':
      return designEffectCalculation(request);
    case 'optimal-allocation':
      return optimalAllocation(request);
  }
}
