import { expect, type Locator, type Page } from '@playwright/test';

/** /invitations/<token>: who invited whom, then sign-in / sign-up links or "Accept invitation". */
export class InvitationPage {
  readonly heading: Locator;
  readonly signInToAccept: Locator;
  readonly createAccount: Locator;
  readonly accept: Locator;

  constructor(readonly page: Page) {
    const main = page.getByRole('main');
    this.heading = main.getByRole('heading', { level: 1, name: 'Invitation' });
    this.signInToAccept = main.getByRole('link', { name: 'Sign in to accept' });
    this.createAccount = main.getByRole('link', { name: 'Create an account' });
    this.accept = main.getByRole('button', { name: 'Accept invitation' });
  }

  async open(link: string): Promise<void> {
    await this.page.goto(link);
    await expect(this.heading).toBeVisible();
  }

  summary(text: string | RegExp): Locator {
    return this.page.getByRole('main').getByText(text);
  }
}
