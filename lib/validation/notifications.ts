import { z } from 'zod';
import { DELIVERIES, NOTIFICATION_KINDS, type NotificationKind } from '@/lib/notifications/kinds';

const delivery = z.enum(DELIVERIES, { error: 'Choose at once, daily digest or none.' });

/** Every kind with its delivery: the settings form and the answer of GET/PUT. */
export const notificationSettingsSchema = z
  .object(Object.fromEntries(NOTIFICATION_KINDS.map((k) => [k, delivery])) as Record<NotificationKind, typeof delivery>)
  .meta({ id: 'NotificationSettings' });
export type NotificationSettingsInput = z.infer<typeof notificationSettingsSchema>;

/** A change: the kinds left out stay as they are. */
export const notificationSettingsUpdateSchema = notificationSettingsSchema
  .partial()
  .strict()
  .refine((v) => Object.keys(v).length > 0, { message: 'Send at least one kind of notification with its delivery.' })
  .meta({ id: 'NotificationSettingsUpdate' });
export type NotificationSettingsUpdate = z.infer<typeof notificationSettingsUpdateSchema>;

/** The unsubscribe address's token (checked for its signature by lib/notifications/unsubscribe-token.ts). */
export const unsubscribeParamsSchema = z.object({
  token: z
    .string({ error: 'This unsubscribe link is not valid.' })
    .regex(/^[0-9a-f-]{36}\.[a-z]{1,20}\.[A-Za-z0-9_-]{43}$/, { error: 'This unsubscribe link is not valid: copy the whole link from the e-mail.' }),
});
