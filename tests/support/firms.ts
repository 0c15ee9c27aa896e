import { Client, uniqueEmail } from './http-client';
import { waitForMessage, firstLink } from './mailbox';
import { signUpAndConfirm } from './sign-up';

export { signUpAndConfirm };

export const PASSWORD = 'correct horse battery';

// Loaded only when no mailbox is given: Playwright specs import this file too, and cannot load vitest.
async function vitestMailbox(): Promise<string> {
  const { inject } = await import('vitest');
  return inject('mailboxUrl');
}

/** Signs up a new firm (confirmed through the local mailbox) and returns its owner, signed in. */
export async function newFirm(appUrl: string, tag = 'owner', mailboxUrl?: string): Promise<{ owner: Client; email: string }> {
  const owner = new Client(appUrl);
  const email = uniqueEmail(tag);
  await signUpAndConfirm(appUrl, mailboxUrl ?? (await vitestMailbox()), { firmName: `Test firm ${tag}`, name: 'Olive Owner', email, password: PASSWORD });
  const s = await owner.signIn(email, PASSWORD);
  if (!s.ok) throw new Error(`sign-in failed: ${s.error}`);
  return { owner, email };
}

/** Invites a member, reads the invitation from the local mailbox, accepts it and signs the member in. */
export async function addMember(appUrl: string, mailboxUrl: string, owner: Client, role: 'author' | 'checker'): Promise<{ client: Client; email: string; membershipId: string }> {
  const email = uniqueEmail(role);
  const inv = await owner.post('/api/team/invitations', { email, role });
  if (inv.status !== 201) throw new Error(`invite failed: ${inv.status} ${await inv.text()}`);
  const msg = await waitForMessage(mailboxUrl, email, /invited you/);
  const token = firstLink(msg.text, /\/invite\/[A-Za-z0-9_-]+/).split('/').pop()!;
  const client = new Client(appUrl);
  const acc = await client.post('/api/invitations/accept', { token, name: `Test ${role}`, password: PASSWORD });
  if (acc.status !== 201) throw new Error(`accept failed: ${acc.status} ${await acc.text()}`);
  const s = await client.signIn(email, PASSWORD);
  if (!s.ok) throw new Error(`member sign-in failed: ${s.error}`);
  const team = await owner.json<{ members: { id: string; email: string }[] }>('GET', '/api/team');
  const membershipId = team.body.members.find((m) => m.email === email)!.id;
  return { client, email, membershipId };
}
