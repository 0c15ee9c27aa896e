import { z } from 'zod';

// The viewer's snapshot request, shared by the route handler and the embed form.

/** A practical address check (RFC 5321 lengths, one @, a dotted domain); the mail server has the last word. */
export function normaliseEmail(raw: string): { ok: true; address: string; domain: string } | { ok: false; message: string } {
  const input = raw.trim();
  if (!input) return { ok: false, message: 'Enter the e-mail address the PDF should go to.' };
  if (input.length > 254) return { ok: false, message: 'This e-mail address is too long.' };
  const m = /^([A-Za-z0-9.!#$%&'*+/=?^_`{|}~-]{1,64})@((?:[A-Za-z0-9](?:[A-Za-z0-9-]{0,61}[A-Za-z0-9])?\.)+[A-Za-z][A-Za-z0-9-]{0,61}[A-Za-z0-9])$/.exec(input);
  if (!m || m[1]!.startsWith('.') || m[1]!.endsWith('.') || m[1]!.includes('..')) {
    return { ok: false, message: `“${input}” is not a valid e-mail address. Use the form name@example.com.` };
  }
  const domain = m[2]!.toLowerCase();
  return { ok: true, address: `${m[1]}@${domain}`, domain };
}

/**
 * Whether a snapshot may go to an address at `domain`: one of the client's domains, or any address when the
 * firm chose that explicitly. No domains and no such choice means nobody.
 */
export function domainAllowed(domain: string, client: { allowedEmailDomains: readonly string[]; snapshotAnyAddress: boolean }): boolean {
  return client.snapshotAnyAddress || client.allowedEmailDomains.includes(domain.toLowerCase());
}

export const snapshotRequestSchema = z
  .object({
    email: z.string({ message: 'Enter the e-mail address the PDF should go to.' }).max(300, 'This e-mail address is too long.'),
    dialValues: z
      .record(z.string().max(64), z.number({ message: 'Each dial value must be a finite number.' }).refine(Number.isFinite, 'Each dial value must be a finite number.'))
      .default({}),
    /** The dial values of a view the viewer pinned to compare with: the PDF then shows both views side by side. */
    pinnedDialValues: z
      .record(z.string().max(64), z.number({ message: 'Each dial value must be a finite number.' }).refine(Number.isFinite, 'Each dial value must be a finite number.'))
      .optional(),
    /** The version number on the viewer's screen; a republished widget is refused so the PDF matches the screen. */
    version: z.number().int().positive().optional(),
  })
  .strict();

export type SnapshotRequestInput = z.infer<typeof snapshotRequestSchema>;

export interface SnapshotAccepted {
  id: string;
  state: 'queued';
  recipient: string;
  message: string;
}
