// Reads the local SMTP fake's HTTP API (lib/fakes/smtp).
export interface FakeMessage {
  id: string;
  to: string[] | string;
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; contentType: string; size: number }[];
}

export async function listMessages(mailboxUrl: string, to: string): Promise<FakeMessage[]> {
  const res = await fetch(`${mailboxUrl}/messages?to=${encodeURIComponent(to)}`);
  const body = (await res.json()) as FakeMessage[] | { messages: FakeMessage[] };
  return Array.isArray(body) ? body : body.messages;
}

/** Waits for the newest message to `to` whose subject matches, and returns it. */
export async function waitForMessage(mailboxUrl: string, to: string, subject: RegExp, timeoutMs = 15_000): Promise<FakeMessage> {
  const start = Date.now();
  while (Date.now() - start < timeoutMs) {
    const found = (await listMessages(mailboxUrl, to)).find((m) => subject.test(m.subject));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`No message to ${to} matching ${subject} within ${timeoutMs} ms`);
}

export function firstLink(text: string, pattern: RegExp): string {
  const m = text.match(pattern);
  if (!m) throw new Error(`No link matching ${pattern} in:\n${text}`);
  return m[0];
}
