import { expect, type Locator, type Page } from '@playwright/test';

/** /studies/<id>/plan: the calculation chosen for the design, its inputs, answer, charts and saved results. */
export class PlanPage {
  readonly heading: Locator;
  readonly why: Locator;
  readonly assumptions: Locator;
  readonly inputs: Locator;
  readonly answer: Locator;
  readonly caution: Locator;
  readonly curveSummary: Locator;
  readonly curveTable: Locator;
  readonly heatmap: Locator;
  readonly note: Locator;
  readonly save: Locator;
  readonly saved: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole('heading', { level: 2, name: /for revision \d+/ });
    this.why = page.getByRole('heading', { name: 'Why this calculation' });
    this.assumptions = page.getByRole('region', { name: 'Assumptions and where they come from' });
    this.inputs = page.getByRole('form', { name: 'Inputs' });
    this.answer = page.getByRole('region', { name: 'Answer for this design' });
    this.caution = page.getByText('Planning estimates, not guarantees');
    this.curveSummary = page.getByTestId('power-curve-summary');
    this.curveTable = page.getByTestId('power-curve-table');
    this.heatmap = page.getByTestId('cluster-heatmap');
    this.note = page.getByLabel('Note with the saved result (optional)');
    this.save = page.getByRole('button', { name: 'Save this result' });
    this.saved = page.getByRole('region', { name: 'Saved results' });
  }

  async goto(studyId: string): Promise<void> {
    await this.page.goto(`/studies/${studyId}/plan`);
    await expect(this.heading).toBeVisible();
  }

  /** The large solved value in the answer, e.g. headline('clustersPerArm'). */
  headline(key: string): Locator {
    return this.answer.locator(`[data-result="${key}"]`);
  }

  input(label: string | RegExp): Locator {
    return this.inputs.getByLabel(label);
  }

  /**
   * The power curve's data, row by row ("size power"), read from its table (not from pixels). The
   * chart is loaded in the browser after the page (it is not rendered on the server), so this
   * waits for the table first.
   */
  async curveRows(): Promise<string[]> {
    await expect(this.curveTable.locator('tbody tr').first()).toBeAttached();
    return this.curveTable.locator('tbody tr').evaluateAll((rows) => rows.map((r) => (r.textContent ?? '').replace(/\s+/g, ' ').trim()));
  }

  async saveResult(note?: string): Promise<void> {
    if (note) await this.note.fill(note);
    await this.save.click();
    await expect(this.page.getByRole('status').filter({ hasText: /Saved with design revision \d+/ })).toBeVisible();
  }
}
