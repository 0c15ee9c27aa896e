'use client';

import { useState } from 'react';
import { Card } from '@/components/ui/card';
import { Checkbox } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';
import { useNotificationPrefs } from '@/components/hooks/use-notification-prefs';
import { NOTIFICATION_INFO, NOTIFICATION_KINDS, type NotificationKind } from '@/lib/core/notifications/kinds';
import type { Role } from '@/lib/core/api-types';

/**
 * Each person's own choice of review-loop e-mails. The kinds that fit the role come first; the others are listed
 * too (a role can change) but say that they apply to another role.
 */
export function NotificationPrefs({ role }: { role: Role }) {
  const prefs = useNotificationPrefs();
  const [busy, setBusy] = useState<NotificationKind | null>(null);
  const [messages, setMessages] = useState<string[]>([]);
  const [status, setStatus] = useState('');
  if (prefs.error) return <LoadError error={prefs.error} what="your notification choices" onRetry={() => prefs.mutate()} />;
  const kinds = [...NOTIFICATION_KINDS].sort((a, b) => Number(!NOTIFICATION_INFO[a].roles.includes(role)) - Number(!NOTIFICATION_INFO[b].roles.includes(role)));
  return (
    <Card title="My e-mail notifications" as="h2" description="Your own choice: it changes only the e-mails sent to you. Everything is on until you turn it off.">
      {!prefs.data ? (
        <Loading>Loading your choices…</Loading>
      ) : (
        <div className="space-y-4">
          <FormError messages={messages} />
          {kinds.map((k) => {
            const info = NOTIFICATION_INFO[k];
            const forMe = info.roles.includes(role);
            return (
              <Checkbox
                key={k}
                name={`notify-${k}`}
                label={info.label}
                hint={forMe ? info.detail : `${info.detail} You receive it only while your role is ${info.roles.join(' or ')}.`}
                checked={prefs.data!.prefs[k]}
                aria-busy={busy === k || undefined}
                onChange={async (e) => {
                  const on = e.currentTarget.checked;
                  setBusy(k);
                  setMessages([]);
                  try {
                    await prefs.save({ [k]: on });
                    setStatus(`Saved: “${info.label}” is ${on ? 'on' : 'off'}.`);
                  } catch (err) {
                    setMessages([(err as Error).message]);
                  } finally {
                    setBusy(null);
                  }
                }}
              />
            );
          })}
          <p role="status" className="min-h-5 text-sm text-ink-700">
            {status}
          </p>
        </div>
      )}
    </Card>
  );
}
