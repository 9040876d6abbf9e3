import { api, parseBody } from '@/lib/api/handler';
import { getNotificationSettings, updateNotificationSettings } from '@/lib/data/notifications';
import { notificationSettingsUpdateSchema } from '@/lib/validation/notifications';

export const GET = api(async ({ actor }) => getNotificationSettings(actor));

export const PUT = api(async ({ req, actor }) => updateNotificationSettings(actor, await parseBody(req, notificationSettingsUpdateSchema)));
