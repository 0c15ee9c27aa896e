import { z } from 'zod';

// Client and pass inputs, shared by the dashboard forms and the route handlers.

/**
 * An allowed origin is exactly scheme://host[:port]: the value a browser puts in CSP frame-ancestors and in the
 * Origin header. Paths, queries, fragments, credentials and wildcards are refused so that "exact" stays exact.
 * Case, a default port and one trailing slash are normalised away (the browser compares the normalised form).
 */
export function normaliseOrigin(raw: string): { ok: true; origin: string } | { ok: false; message: string } {
  const input = raw.trim();
  if (!input) return { ok: false, message: 'Enter an origin such as https://portal.example.com.' };
  if (input.includes('*')) return { ok: false, message: `“${input}”: wildcards are not allowed; list each origin exactly.` };
  const m = /^([a-zA-Z][a-zA-Z0-9+.-]*):\/\/([^/?#]*)(\/?)$/.exec(input);
  if (!m) {
    if (!/^[a-zA-Z][a-zA-Z0-9+.-]*:\/\//.test(input)) return { ok: false, message: `“${input}”: start with http:// or https://.` };
    return { ok: false, message: `“${input}”: give the origin only (scheme://host[:port]), without a path, query or fragment.` };
  }
  const scheme = m[1]!.toLowerCase();
  if (scheme !== 'http' && scheme !== 'https') return { ok: false, message: `“${input}”: only http:// and https:// origins can frame a widget.` };
  const authority = m[2]!;
  if (authority.includes('@')) return { ok: false, message: `“${input}”: an origin has no user name or password.` };
  if (!authority) return { ok: false, message: `“${input}”: the host name is missing.` };
  let url: URL;
  try {
    url = new URL(`${scheme}://${authority}`);
  } catch {
    return { ok: false, message: `“${input}”: this is not a valid web address.` };
  }
  const host = url.hostname;
  const isIp = /^\d{1,3}(\.\d{1,3}){3}$/.test(host) || host.startsWith('[');
  if (!isIp && !/^(?=.{1,253}$)([a-z0-9]([a-z0-9-]{0,61}[a-z0-9])?)(\.[a-z0-9]([a-z0-9-]{0,61}[a-z0-9])?)*$/.test(host)) {
    return { ok: false, message: `“${input}”: “${host}” is not a valid host name.` };
  }
  // A port typed as ":" with nothing after it, or out of range, is caught by URL; this catches "host:".
  if (/:$/.test(authority)) return { ok: false, message: `“${input}”: the port number is missing after “:”.` };
  return { ok: true, origin: url.origin };
}

/** A domain whose addresses may receive snapshots: host-name syntax, at least two labels, no scheme, no @. */
export function normaliseEmailDomain(raw: string): { ok: true; domain: string } | { ok: false; message: string } {
  const input = raw.trim().toLowerCase();
  if (!input) return { ok: false, message: 'Enter a domain such as example.com.' };
  if (input.includes('@')) return { ok: false, message: `“${raw.trim()}”: enter the domain only (the part after @).` };
  if (input.includes('://') || input.includes('/')) return { ok: false, message: `“${raw.trim()}”: enter a bare domain such as example.com, not a web address.` };
  if (input.includes('*')) return { ok: false, message: `“${raw.trim()}”: wildcards are not allowed; list each domain.` };
  if (!/^(?=.{1,253}$)([a-z0-9]([a-z0-9-]{0,61}[a-z0-9])?\.)+[a-z]([a-z0-9-]{0,61}[a-z0-9])?$/.test(input)) {
    return { ok: false, message: `“${raw.trim()}”: this is not a valid e-mail domain.` };
  }
  return { ok: true, domain: input };
}

const listOf = (what: 'origin' | 'domain', max: number, min: number) =>
  z
    .array(z.string().max(300, 'Use at most 300 characters.'), { message: `Send a list of ${what}s.` })
    .max(max, `At most ${max} ${what}s.`)
    .transform((items, ctx) => {
      const out: string[] = [];
      items.forEach((raw, i) => {
        const r = what === 'origin' ? normaliseOrigin(raw) : normaliseEmailDomain(raw);
        if (!r.ok) ctx.addIssue({ code: 'custom', message: r.message, path: [i] });
        else {
          const v = 'origin' in r ? r.origin : r.domain;
          if (!out.includes(v)) out.push(v);
        }
      });
      if (out.length < min) ctx.addIssue({ code: 'custom', message: `Add at least one ${what === 'origin' ? 'allowed origin (the address of the page that will show the widget)' : 'domain'}.` });
      return out;
    });

export const originsField = listOf('origin', 20, 1);
export const domainsField = listOf('domain', 20, 0);

const clientName = z.string().trim().min(2, 'Enter the client’s name (at least 2 characters).').max(120, 'Use at most 120 characters.');
const clientNote = z.string().trim().max(500, 'Use at most 500 characters.');

export const clientCreateSchema = z
  .object({
    name: clientName,
    allowedOrigins: originsField,
    allowedEmailDomains: domainsField.default([]),
    // An empty domain list means no snapshot recipients; any address must be chosen explicitly.
    snapshotAnyAddress: z.boolean({ message: 'Send true or false.' }).default(false),
    note: clientNote.optional(),
  })
  .strict();

export const clientPatchSchema = z
  .object({
    name: clientName,
    allowedOrigins: originsField,
    allowedEmailDomains: domainsField,
    snapshotAnyAddress: z.boolean({ message: 'Send true or false.' }),
    note: clientNote,
    archived: z.boolean(),
  })
  .partial()
  .strict();

export const PASS_DEFAULT_DAYS = 90;
export const PASS_MAX_DAYS = 366;
const days = z
  .number({ message: 'Enter a number of days.' })
  .int('Use whole days.')
  .min(1, 'A pass lasts at least one day.')
  .max(PASS_MAX_DAYS, `A pass lasts at most ${PASS_MAX_DAYS} days; renew it when it runs out.`);

export const passCreateSchema = z
  .object({
    clientId: z.uuid('Choose a client.'),
    widgetId: z.uuid('Choose a widget.'),
    days: days.default(PASS_DEFAULT_DAYS),
  })
  .strict();

export const passRenewSchema = z
  .object({
    days: days.default(PASS_DEFAULT_DAYS),
    /** Stop the older snippets at once instead of letting them run to their own expiry. */
    retirePrevious: z.boolean().default(false),
  })
  .strict();

/** Splits a textarea's lines (or commas) into list items for the form. */
export function splitLines(s: string): string[] {
  return s
    .split(/[\n,]+/)
    .map((x) => x.trim())
    .filter(Boolean);
}
