import { execFileSync } from 'node:child_process';
import path from 'node:path';
import type { NotificationEvent } from '@/lib/notifications/notify';

/** Calls notify() for `to` on a study through tests/e2e/support/notify-cli.ts (see there why). */
export function notifyFromOutside(event: Omit<NotificationEvent, 'recipientIds' | 'actorId'> & { to: string }): void {
  const root = path.resolve(__dirname, '../../..');
  execFileSync(process.execPath, ['--conditions=react-server', '--import', 'tsx', 'tests/e2e/support/notify-cli.ts', JSON.stringify(event)], {
    cwd: root,
    env: process.env,
    stdio: ['ignore', 'inherit', 'inherit'],
    timeout: 60_000,
  });
}
