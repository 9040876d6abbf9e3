import type { Metadata } from 'next';
import { NotificationSettingsForm } from '@/components/notifications/settings-form';
import { currentActor } from '@/lib/auth/session';
import { getNotificationSettings } from '@/lib/data/notifications';
import { DIGEST_HOUR_UTC } from '@/lib/notifications/kinds';

export const metadata: Metadata = { title: 'Notification settings' };

export default async function NotificationSettingsPage() {
  const settings = await getNotificationSettings(await currentActor());
  return (
    <div className="mx-auto max-w-3xl space-y-4">
      <h1 className="text-2xl font-bold">Notification settings</h1>
      <p className="text-sm text-muted">
        Unitwise e-mails you about the review of studies you belong to. For each kind, choose an e-mail at once, one daily digest (sent
        from {String(DIGEST_HOUR_UTC).padStart(2, '0')}:00 UTC, grouped by study), or none. You never get e-mail about your own actions,
        and every e-mail has a link that stops that kind without signing in.
      </p>
      <NotificationSettingsForm initial={settings} />
    </div>
  );
}
