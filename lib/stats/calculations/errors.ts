/**
 * The error a calculation throws when its inputs pass the schema one by one but not together:
 * two unknowns, fewer predictors than tested ones, too few observations for the degrees of
 * freedom, a target power at or below the significance level. The API answers it with 400 and
 * `fields`, the form shows each message beside its field. Messages say what to fix.
 */
export class CalculationInputError extends Error {
  /** Messages by input name (the API's names), as zod's flattened field errors. */
  readonly fields: Record<string, string[]>;

  constructor(message: string, fields: Record<string, string[]> = {}) {
    super(message);
    this.name = 'CalculationInputError';
    this.fields = fields;
  }
}

/** One message on one or several fields. */
export function inputError(message: string, fieldNames: readonly string[]): CalculationInputError {
  return new CalculationInputError(message, Object.fromEntries(fieldNames.map((name) => [name, [message]])));
}
