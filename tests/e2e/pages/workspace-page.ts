import { expect, type Locator, type Page } from '@playwright/test';
import { AppHeader } from './app-header';

const UUID = '[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}';
export const WORKSPACE_URL = new RegExp(`/workspaces/(${UUID})(?:[?#].*)?$`);
export const STUDY_URL = new RegExp(`/studies/(${UUID})(?:[?#].*)?$`);

/** /workspaces/<id>: the studies of one workspace and the "New study" form. */
export class WorkspacePage {
  readonly header: AppHeader;
  readonly heading: Locator;
  readonly newStudy: Locator;
  readonly title: Locator;
  readonly description: Locator;
  readonly createStudy: Locator;
  readonly search: Locator;
  readonly show: Locator;
  readonly table: Locator;
  readonly members: Locator;

  constructor(readonly page: Page) {
    this.header = new AppHeader(page);
    this.heading = page.getByRole('heading', { level: 1, name: 'Studies' });
    this.newStudy = page.getByRole('button', { name: 'New study' });
    const form = page.getByRole('form', { name: 'New study' });
    this.title = form.getByLabel('Title', { exact: true });
    this.description = form.getByLabel('Description', { exact: true });
    this.createStudy = form.getByRole('button', { name: 'Create study' });
    this.search = page.getByLabel('Search studies');
    this.show = page.getByLabel('Show', { exact: true });
    this.table = page.getByRole('table');
    this.members = page.getByRole('link', { name: /^Members/ });
  }

  async goto(id: string): Promise<void> {
    await this.page.goto(`/workspaces/${id}`);
    await expect(this.heading).toBeVisible();
  }

  /** Asserts the browser is on a workspace page and returns the workspace id. */
  async expectLoaded(): Promise<string> {
    await this.page.waitForURL(WORKSPACE_URL);
    await expect(this.heading).toBeVisible();
    return WORKSPACE_URL.exec(this.page.url())![1]!;
  }

  /** Creates a study through the form; resolves with the new study's id once its page is open. */
  async createStudyNamed(title: string, description = ''): Promise<string> {
    await this.newStudy.click();
    await this.title.fill(title);
    if (description) await this.description.fill(description);
    await this.createStudy.click();
    await this.page.waitForURL(STUDY_URL);
    return STUDY_URL.exec(this.page.url())![1]!;
  }

  studyLink(title: string): Locator {
    return this.table.getByRole('link', { name: title, exact: true });
  }
}
