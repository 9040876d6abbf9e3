import { expect, type Locator, type Page } from '@playwright/test';

/** /calculators and /calculators/<kind>: the inputs, the "Solve for" choice and the result panel. */
export class CalculatorPage {
  readonly heading: Locator;
  readonly inputs: Locator;
  readonly result: Locator;
  readonly status: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole('heading', { level: 1 });
    this.inputs = page.getByRole('form', { name: 'Inputs' });
    this.result = page.getByRole('region', { name: 'Result' });
    this.status = page.getByRole('main').getByRole('alert');
  }

  async gotoIndex(): Promise<void> {
    await this.page.goto('/calculators');
    await expect(this.heading).toHaveText('Sample-size calculators');
  }

  async goto(kind: string, title: string): Promise<void> {
    await this.page.goto(`/calculators/${kind}`);
    await expect(this.heading).toHaveText(title);
    // The result is worked out in the browser: once it shows, the form is live.
    await expect(this.result).toBeVisible();
  }

  field(label: string): Locator {
    return this.inputs.getByLabel(label, { exact: true });
  }

  async set(label: string, value: string): Promise<void> {
    await this.field(label).fill(value);
  }

  /** Fills several inputs, by label, in the order given. */
  async setAll(values: Record<string, string>): Promise<void> {
    for (const [label, value] of Object.entries(values)) await this.set(label, value);
  }

  /** Picks what to solve for, e.g. "sample size", "power", "clusters per arm". */
  async solveFor(what: string): Promise<void> {
    await this.inputs.getByRole('group', { name: 'Solve for' }).getByRole('radio', { name: what, exact: true }).check();
  }

  /** The large value for a label in the result, e.g. "Sample size per group". */
  answer(label: string): Locator {
    return this.result.getByRole('term').filter({ hasText: new RegExp(`^${label}$`) }).locator('xpath=following-sibling::dd[1]');
  }

  caution(): Locator {
    return this.page.getByText('Planning estimates, not guarantees');
  }
}
