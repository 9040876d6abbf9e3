import { expect, type Locator, type Page } from '@playwright/test';
import { AppHeader } from './app-header';

export type StudyRoleLabel = 'Editor' | 'Consultant' | 'Writer' | 'Viewer';

/** /studies/<id> and its tabs. */
export class StudyPage {
  readonly header: AppHeader;
  readonly title: Locator;
  readonly tabs: Locator;
  readonly about: Locator;
  readonly editDetails: Locator;
  readonly archive: Locator;
  readonly readOnlyNotice: Locator;
  readonly team: Locator;
  readonly invite: Locator;
  readonly inviteEmail: Locator;
  readonly inviteRole: Locator;
  readonly sendInvitation: Locator;
  readonly activity: Locator;

  constructor(readonly page: Page) {
    this.header = new AppHeader(page);
    this.title = page.getByRole('heading', { level: 1 });
    this.tabs = page.getByRole('navigation', { name: 'Study sections' });
    this.about = page.getByRole('region', { name: 'About this study' });
    this.editDetails = this.about.getByRole('button', { name: 'Edit details' });
    this.archive = this.about.getByRole('button', { name: 'Archive study' });
    this.readOnlyNotice = this.about.getByText('Your role can read this study but not edit it.');
    this.team = page.getByRole('region', { name: 'Team' });
    this.invite = page.getByRole('region', { name: 'Invite to this study' });
    this.inviteEmail = this.invite.getByLabel('E-mail address');
    this.inviteRole = this.invite.getByLabel('Role', { exact: true });
    this.sendInvitation = this.invite.getByRole('button', { name: 'Send invitation' });
    this.activity = page.getByRole('complementary', { name: 'Activity' });
  }

  async goto(studyId: string, tab?: string): Promise<void> {
    await this.page.goto(tab ? `/studies/${studyId}/${tab}` : `/studies/${studyId}`);
    await expect(this.title).toBeVisible();
  }

  roleBadge(role: string): Locator {
    return this.page.getByText(`Your role: ${role}`, { exact: true });
  }

  tab(name: string): Locator {
    return this.tabs.getByRole('link', { name, exact: true });
  }

  notBuiltHeading(tabLabel: string): Locator {
    return this.page.getByRole('heading', { level: 2, name: `${tabLabel}: not built yet` });
  }

  async inviteSomeone(email: string, role: StudyRoleLabel): Promise<void> {
    await this.inviteEmail.fill(email);
    await this.inviteRole.selectOption({ label: role });
    await this.sendInvitation.click();
    await expect(this.invite.getByText(`Invited ${email}.`)).toBeVisible();
  }

  invitation(email: string): Locator {
    return this.invite.getByRole('listitem').filter({ hasText: email });
  }

  member(email: string): Locator {
    return this.team.getByRole('listitem').filter({ hasText: email });
  }

  /** The owner's role menu for another member, labelled "Role of <name>". */
  memberRole(name: string): Locator {
    return this.team.getByLabel(`Role of ${name}`);
  }
}
