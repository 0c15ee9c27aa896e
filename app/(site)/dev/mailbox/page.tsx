import type { Metadata } from 'next';
import Link from 'next/link';
import { Logo } from '@/components/ui/logo';
import { PageHeader } from '@/components/ui/page-header';
import { headers } from 'next/headers';
import { notFound } from 'next/navigation';
import { MailboxView } from '@/components/mailbox/mailbox-view';
import { mailboxOpenFor } from '@/lib/server/mail/dev-mailbox';

export const metadata: Metadata = { title: 'Development mailbox', robots: { index: false, follow: false } };

export default async function DevMailboxPage() {
  // Only on this machine, and only while mail goes to the local fake.
  if (!mailboxOpenFor(await headers())) notFound();
  return (
    <div className="min-h-dvh">
      <header className="border-b border-ink-200 bg-white">
        <div className="mx-auto max-w-6xl px-4 py-3 sm:px-6">
          <Link href="/" className="inline-flex rounded-md" aria-label="Stochos home">
            <Logo />
          </Link>
        </div>
      </header>
      <main id="content" className="mx-auto max-w-6xl px-4 py-6 sm:px-6">
        <PageHeader
          eyebrow="Development"
          title="Mailbox"
          description="Every e-mail this installation sends while it uses the local mail server: sign-in links, invitations, snapshots. Nothing here reaches a real inbox."
        />
        <MailboxView />
      </main>
    </div>
  );
}
