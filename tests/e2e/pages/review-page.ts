import { expect, type Locator, type Page } from '@playwright/test';

/** /studies/<id>/review: threads and suggestions, with their filters. */
export class ReviewPage {
  readonly sections: Locator;
  readonly openThreads: Locator;
  readonly resolvedThreads: Locator;
  readonly suggestions: Locator;
  readonly about: Locator;
  readonly writtenBy: Locator;
  readonly state: Locator;

  constructor(readonly page: Page) {
    this.sections = page.getByRole('navigation', { name: 'Review sections' });
    this.openThreads = page.getByRole('region', { name: /^Open threads/ });
    this.resolvedThreads = page.getByRole('region', { name: /^Resolved threads/ });
    this.suggestions = page.getByRole('complementary', { name: 'Suggested changes' });
    const filters = page.getByRole('form', { name: 'Filter threads' });
    this.about = filters.getByLabel('About');
    this.writtenBy = filters.getByLabel('Written by');
    this.state = filters.getByLabel('State');
  }

  async goto(studyId: string, query = ''): Promise<void> {
    await this.page.goto(`/studies/${studyId}/review${query}`);
    await expect(this.openThreads).toBeVisible();
  }

  /** A thread, by what it is about (its heading). */
  thread(about: string | RegExp, within: Locator = this.page.getByRole('main')): Locator {
    return within.getByRole('article', { name: about });
  }

  suggestion(field: string | RegExp): Locator {
    return this.suggestions.getByRole('article', { name: field });
  }

  /** Writes in a comment box, picking each `@Name` from the member list with the keyboard. */
  static async compose(box: Locator, parts: (string | { mention: string })[]): Promise<void> {
    await box.focus();
    for (const p of parts) {
      if (typeof p === 'string') await box.pressSequentially(p);
      else {
        await box.pressSequentially(`@${p.mention.slice(0, 3)}`);
        const option = box.page().getByRole('listbox', { name: 'Members to mention' }).getByRole('option', { name: p.mention });
        await expect(option).toBeVisible();
        await box.press('Enter');
      }
    }
  }
}
