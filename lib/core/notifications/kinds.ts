import type { Role } from '@/lib/core/api-types';

// The kinds of notification e-mail, who receives each and how the settings page names it. Shared by the server
// (queueing) and the browser (the settings card), so it imports nothing server-only.
export const NOTIFICATION_KINDS = ['check_requested', 'check_decided', 'widget_published'] as const;
export type NotificationKind = (typeof NOTIFICATION_KINDS)[number];

export const NOTIFICATION_INFO: Record<NotificationKind, { label: string; detail: string; roles: readonly Role[] }> = {
  check_requested: {
    label: 'A version waits for my check',
    detail: 'Sent to checkers when another member saves a version: the author’s note and a link to the comparison.',
    roles: ['checker'],
  },
  check_decided: {
    label: 'My version was signed off or sent back',
    detail: 'Sent to the version’s author with the checker’s note.',
    roles: ['author'],
  },
  widget_published: {
    label: 'A widget was published',
    detail: 'Sent to account owners when a member publishes a widget or a new version of one.',
    roles: ['owner'],
  },
};
