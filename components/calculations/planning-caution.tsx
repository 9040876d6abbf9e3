import { Alert } from '@/components/ui/alert';

/** The caution PRODUCT.md asks for wherever sample sizes are shown. */
export function PlanningCaution() {
  return (
    <Alert tone="info" title="Planning estimates, not guarantees">
      These results rest on the values you enter and on the assumptions each method states. Studies with people or animals need
      approval from an ethics board (IRB, REC or IACUC) and review by a qualified statistician; follow your local regulations.
    </Alert>
  );
}
