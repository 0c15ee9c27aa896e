import { z } from 'zod';
import { NOTIFICATION_KINDS, type NotificationKind } from '@/lib/core/notifications/kinds';

// One person's notification choices: any subset of the kinds, each on or off.
export const notificationPrefsSchema = z
  .object(Object.fromEntries(NOTIFICATION_KINDS.map((k) => [k, z.boolean({ error: 'Choose on or off.' }).optional()])) as Record<NotificationKind, z.ZodOptional<z.ZodBoolean>>)
  .strict();
export type NotificationPrefsInput = z.infer<typeof notificationPrefsSchema>;
