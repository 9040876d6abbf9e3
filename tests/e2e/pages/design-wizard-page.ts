import { expect, type Locator, type Page } from '@playwright/test';

/** /studies/<id>/design/<step>: the design wizard with its step index, diagram and checks summary. */
export class DesignWizardPage {
  readonly steps: Locator;
  readonly saveStatus: Locator;
  readonly diagram: Locator;
  readonly checks: Locator;

  constructor(readonly page: Page) {
    this.steps = page.getByRole('navigation', { name: 'Design steps' });
    this.saveStatus = page.getByRole('status').filter({ hasText: /Saved|Saving|Unsaved|Nothing saved/ });
    this.diagram = page.getByRole('img', { name: /Design of/ });
    this.checks = page.getByRole('complementary', { name: 'Diagram and checks' });
  }

  async open(studyId: string, step: string): Promise<void> {
    await this.page.goto(`/studies/${studyId}/design/${step}`);
    await expect(this.page.getByRole('heading', { level: 2, name: new RegExp(`^${step === 'analysis' ? 'Analysis plan' : step}$`, 'i') })).toBeVisible();
  }

  async step(name: string): Promise<void> {
    await this.steps.getByRole('link', { name: new RegExp(name) }).click();
    await expect(this.page.getByRole('heading', { level: 2, name })).toBeVisible();
  }

  async waitSaved(): Promise<void> {
    await expect(this.saveStatus).toContainText(/Saved · revision \d+/, { timeout: 10_000 });
  }

  level(n: number): Locator {
    return this.page.getByRole('listitem').filter({ has: this.page.getByRole('heading', { name: new RegExp(`^Level ${n}`) }) });
  }
}
