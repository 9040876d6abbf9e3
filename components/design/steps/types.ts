import type { Design, DesignPart } from '@/lib/design/schema';

export interface StepProps<P extends DesignPart> {
  value: Design[P];
  design: Design;
  onValid: (v: Design[P]) => void;
  onDraft: (valid: boolean) => void;
  disabled: boolean;
}
