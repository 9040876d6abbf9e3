/** Page objects for the notification settings, the unsubscribe page and the review's activity page. */
import { expect, type Locator, type Page } from '@playwright/test';

export class NotificationSettingsPage {
  readonly heading: Locator;
  readonly save: Locator;
  readonly status: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole('heading', { level: 1, name: 'Notification settings' });
    this.save = page.getByRole('button', { name: 'Save settings' });
    this.status = page.getByRole('status');
  }

  /** Opens the page from the link in the signed-in header. */
  async openFromHeader(): Promise<void> {
    await this.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Notifications' }).click();
    await expect(this.heading).toBeVisible();
  }

  choice(kind: string, delivery: 'At once' | 'Daily digest' | 'None'): Locator {
    return this.page.getByRole('group', { name: kind, exact: true }).getByRole('radio', { name: new RegExp(`^${delivery}`) });
  }
}

export class UnsubscribePage {
  readonly stop: Locator;

  constructor(readonly page: Page) {
    this.stop = page.getByRole('button', { name: 'Stop these e-mails' });
  }

  heading(topic: string): Locator {
    return this.page.getByRole('heading', { level: 1, name: `Stop e-mails about ${topic}` });
  }
}

export class ActivityPage {
  readonly heading: Locator;
  readonly kind: Locator;
  readonly person: Locator;
  readonly show: Locator;
  readonly events: Locator;
  readonly download: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole('heading', { level: 2, name: 'Activity' });
    this.kind = page.getByLabel('Kind of event');
    this.person = page.getByLabel('Person');
    this.show = page.getByRole('button', { name: 'Show' });
    this.events = page.getByRole('list', { name: 'Events' });
    this.download = page.getByRole('link', { name: 'Download CSV' });
  }

  async goto(studyId: string): Promise<void> {
    await this.page.goto(`/studies/${studyId}/review/activity`);
    await expect(this.heading).toBeVisible();
  }
}
