import { expect, type Locator, type Page } from '@playwright/test';

/** /studies/<id>/stress-test: the run form, the current run's progress, its verdict grid and detail table, and the study's runs. */
export class StressTestPage {
  readonly heading: Locator;
  readonly caution: Locator;
  readonly form: Locator;
  readonly replicates: Locator;
  readonly seed: Locator;
  readonly run: Locator;
  readonly cancel: Locator;
  readonly progress: Locator;
  readonly progressText: Locator;
  readonly summary: Locator;
  readonly results: Locator;
  readonly grid: Locator;
  readonly plannedRow: Locator;
  readonly bestAlternative: Locator;
  readonly moreReplicates: Locator;
  readonly details: Locator;
  readonly lastFinished: Locator;
  readonly pastRuns: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole('heading', { level: 2, name: /^Stress test of revision \d+$/ });
    this.caution = page.getByText('Planning estimates, not guarantees');
    this.form = page.getByRole('form', { name: 'New stress test' });
    this.replicates = this.form.getByLabel('Replicates per scenario');
    this.seed = this.form.getByLabel('Seed');
    this.run = this.form.getByRole('button', { name: 'Run the stress test' });
    this.cancel = page.getByRole('button', { name: 'Cancel this run' });
    this.progress = page.getByRole('progressbar', { name: 'Replicates done' });
    this.progressText = page.getByTestId('progress-text');
    this.summary = page.getByRole('region', { name: 'What the simulation shows' }).first();
    this.results = page.getByTestId('results-table').first();
    this.grid = page.getByTestId('verdict-grid').first();
    this.plannedRow = this.grid.getByTestId('planned-row');
    this.bestAlternative = page.getByTestId('best-alternative').first();
    this.moreReplicates = page.getByTestId('more-replicates').first();
    this.details = page.getByTestId('run-details').first();
    this.lastFinished = page.getByTestId('last-finished-run');
    this.pastRuns = page.getByRole('region', { name: 'Runs of this study' });
  }

  async goto(studyId: string): Promise<void> {
    await this.page.goto(`/studies/${studyId}/stress-test`);
    await expect(this.heading).toBeVisible();
  }

  scenario(label: string | RegExp): Locator {
    return this.form.getByRole('checkbox', { name: label });
  }

  /** An analysis's checkbox, by its id (the label says it in words). */
  analysis(name: string): Locator {
    return this.form.locator(`input[type="checkbox"][value="${name}"]`);
  }

  /** The progress bar's replicates done, or null before it shows. */
  async replicatesDone(): Promise<number | null> {
    if ((await this.progress.count()) === 0) return null;
    const v = await this.progress.getAttribute('aria-valuenow');
    return v === null ? null : Number(v);
  }

  /** Opens the collapsed detail (summary sentences and the table of every figure). */
  async openDetails(): Promise<void> {
    if ((await this.details.getAttribute('open')) === null) await this.details.locator('summary').click();
  }

  /** The results table's rows as text, cells joined by a space: "scenario analysis power …". */
  async resultRows(): Promise<string[]> {
    return this.results
      .locator('tbody tr')
      .evaluateAll((rows) => rows.map((r) => Array.from(r.querySelectorAll('th, td'), (c) => (c.textContent ?? '').replace(/\s+/g, ' ').trim()).join(' ')));
  }
}
