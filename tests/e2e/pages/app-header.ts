import type { Locator, Page } from '@playwright/test';

/** The header of the signed-in pages: workspace switcher, "Studies" link and "Sign out". */
export class AppHeader {
  readonly banner: Locator;
  readonly studies: Locator;
  readonly signOut: Locator;

  constructor(readonly page: Page) {
    this.banner = page.getByRole('banner');
    this.studies = this.banner.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Studies', exact: true });
    this.signOut = this.banner.getByRole('button', { name: 'Sign out' });
  }

  /** The workspace switcher's (closed) summary, "Workspace: <name> ▾", naming the current workspace. */
  workspaceName(name: string): Locator {
    return this.banner.getByText(new RegExp(`^Workspace: ${name.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}\\b`));
  }
}
