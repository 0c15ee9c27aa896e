// No vitest import here: Playwright specs use it too.
import { Client } from './http-client';
import { waitForMessage, firstLink } from './mailbox';

/**
 * Signs up a new firm the way its owner does: the sign-up request, the confirmation link from the local mailbox,
 * the password chosen at sign-up. Returns the owner's e-mail once the account exists (not signed in).
 */
export async function signUpAndConfirm(appUrl: string, mailboxUrl: string, input: { firmName: string; name: string; email: string; password: string }): Promise<void> {
  const c = new Client(appUrl);
  const res = await c.post('/api/sign-up', input);
  if (res.status !== 202) throw new Error(`sign-up failed: ${res.status} ${await res.text()}`);
  const msg = await waitForMessage(mailboxUrl, input.email, /Confirm your e-mail address/);
  const token = firstLink(msg.text, /\/sign-up\/confirm\/[A-Za-z0-9_-]+/).split('/').pop()!;
  const ok = await c.post('/api/sign-up/confirm', { token, password: input.password });
  if (ok.status !== 201) throw new Error(`sign-up confirmation failed: ${ok.status} ${await ok.text()}`);
}
