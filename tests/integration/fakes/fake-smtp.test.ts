// nodemailer sends through the local SMTP fake; the mailbox HTTP API gives the message back,
// with attachment bytes identical, and keeps it across a restart.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import nodemailer from 'nodemailer';
import PDFDocument from 'pdfkit';
import { startFakeSmtp, type FakeSmtpHandle, type MailboxMessage } from '@/lib/fakes/smtp/server';

const cleanups: Array<() => Promise<void>> = [];
afterEach(async () => {
  for (const fn of cleanups.splice(0).reverse()) await fn();
});

function tempDir(): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fake-smtp-'));
  cleanups.push(async () => fs.rmSync(dir, { recursive: true, force: true }));
  return dir;
}

async function start(dir: string): Promise<FakeSmtpHandle> {
  const h = await startFakeSmtp({ smtpPort: 0, httpPort: 0, dir, log: false });
  return h;
}

function makePdf(): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'A4', compress: true });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.fontSize(18).text('Gap stack-up snapshot');
    doc.fontSize(10).text('P(gap < 0) = 0.0012; seed 42; 100000 trials');
    doc.end();
  });
}

function transport(port: number, auth = false) {
  return nodemailer.createTransport({
    host: '127.0.0.1',
    port,
    secure: false,
    ignoreTLS: true,
    ...(auth ? { auth: { user: 'app', pass: 'anything' } } : {}),
  });
}

async function getJson<T>(url: string): Promise<{ status: number; body: T }> {
  const res = await fetch(url);
  return { status: res.status, body: (await res.json()) as T };
}

describe('fake SMTP with mailbox API', () => {
  it('round-trips a message with a PDF attachment byte for byte', async () => {
    const dir = tempDir();
    const smtp = await start(dir);
    cleanups.push(() => smtp.close());
    const pdf = await makePdf();
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');

    const info = await transport(smtp.smtpPort).sendMail({
      from: '"Stochos snapshots" <snapshots@stochos.test>',
      to: 'Viewer@Client.test',
      bcc: 'archive@firm.test',
      subject: 'Snapshot: Gap stack-up',
      text: 'Your snapshot is attached.',
      html: '<p>Your snapshot is <b>attached</b>.</p>',
      attachments: [{ filename: 'gap-stack-up.pdf', content: pdf, contentType: 'application/pdf' }],
    });
    expect((info.accepted as string[]).map((a) => a.toLowerCase())).toEqual(['viewer@client.test', 'archive@firm.test']);

    const { body } = await getJson<{ messages: MailboxMessage[] }>(`${smtp.httpUrl}/messages?to=viewer@client.test`);
    expect(body.messages).toHaveLength(1);
    const m = body.messages[0];
    expect(m.subject).toBe('Snapshot: Gap stack-up');
    expect(m.from).toBe('snapshots@stochos.test');
    expect(m.fromName).toBe('Stochos snapshots');
    expect(m.to).toEqual(['viewer@client.test']);
    expect(m.envelopeTo).toEqual(['viewer@client.test', 'archive@firm.test']);
    expect(m.text.trim()).toBe('Your snapshot is attached.');
    expect(m.html).toContain('<b>attached</b>');
    expect(m.attachments).toEqual([{ index: 0, filename: 'gap-stack-up.pdf', contentType: 'application/pdf', size: pdf.length, contentId: null }]);
    expect(m.messageId).toBe(info.messageId);

    const att = await fetch(`${smtp.httpUrl}/messages/${m.id}/attachments/0`);
    expect(att.status).toBe(200);
    expect(att.headers.get('content-type')).toBe('application/pdf');
    expect(att.headers.get('content-disposition')).toContain('gap-stack-up.pdf');
    expect(Buffer.from(await att.arrayBuffer()).equals(pdf)).toBe(true);

    // The Bcc copy is found by its envelope recipient; someone else finds nothing.
    expect((await getJson<{ messages: MailboxMessage[] }>(`${smtp.httpUrl}/messages?to=archive@firm.test`)).body.messages).toHaveLength(1);
    expect((await getJson<{ messages: MailboxMessage[] }>(`${smtp.httpUrl}/messages?to=nobody@client.test`)).body.messages).toHaveLength(0);

    const raw = await fetch(`${smtp.httpUrl}/messages/${m.id}/raw`);
    expect(raw.headers.get('content-type')).toBe('message/rfc822');
    expect(await raw.text()).toContain('Subject: Snapshot: Gap stack-up');
    expect(fs.existsSync(path.join(dir, `${m.id}.eml`))).toBe(true);
    expect(fs.existsSync(path.join(dir, `${m.id}.json`))).toBe(true);

    const html = await fetch(`${smtp.httpUrl}/messages/${m.id}/html`);
    expect(html.headers.get('content-security-policy')).toContain('sandbox');
    expect(await html.text()).toContain('<b>attached</b>');
  });

  it('keeps messages across a restart and lists newest first', async () => {
    const dir = tempDir();
    const first = await start(dir);
    const pdf = await makePdf();
    await transport(first.smtpPort).sendMail({
      from: 'snapshots@stochos.test',
      to: 'viewer@client.test',
      subject: 'First',
      text: 'one',
      attachments: [{ filename: 'one.pdf', content: pdf }],
    });
    await transport(first.smtpPort, true).sendMail({ from: 'snapshots@stochos.test', to: 'viewer@client.test', subject: 'Second', text: 'two' });
    const before = (await getJson<{ messages: MailboxMessage[] }>(`${first.httpUrl}/messages?to=viewer@client.test`)).body.messages;
    expect(before.map((m) => m.subject)).toEqual(['Second', 'First']);
    await first.close();

    const second = await start(dir);
    cleanups.push(() => second.close());
    const after = (await getJson<{ messages: MailboxMessage[] }>(`${second.httpUrl}/messages?to=viewer@client.test`)).body.messages;
    expect(after).toEqual(before);
    const old = after.find((m) => m.subject === 'First')!;
    const att = await fetch(`${second.httpUrl}/messages/${old.id}/attachments/0`);
    expect(Buffer.from(await att.arrayBuffer()).equals(pdf)).toBe(true);

    const one = await getJson<MailboxMessage>(`${second.httpUrl}/messages/${old.id}`);
    expect(one.body.id).toBe(old.id);
    expect((await getJson(`${second.httpUrl}/messages?subject=seco`)).body).toMatchObject({ messages: [{ subject: 'Second' }] });
  });

  it('answers 404 for unknown messages and attachments, and DELETE empties the mailbox for good', async () => {
    const dir = tempDir();
    const smtp = await start(dir);
    await transport(smtp.smtpPort).sendMail({ from: 'a@stochos.test', to: 'b@client.test', subject: 'Hello', text: 'x' });
    const [m] = (await getJson<{ messages: MailboxMessage[] }>(`${smtp.httpUrl}/messages`)).body.messages;
    expect((await fetch(`${smtp.httpUrl}/messages/m0000-000000`)).status).toBe(404);
    expect((await fetch(`${smtp.httpUrl}/messages/${m.id}/attachments/0`)).status).toBe(404);
    expect((await fetch(`${smtp.httpUrl}/messages/${m.id}/html`)).status).toBe(404);

    const del = await fetch(`${smtp.httpUrl}/messages`, { method: 'DELETE' });
    expect(await del.json()).toEqual({ deleted: 1 });
    expect((await getJson<{ messages: MailboxMessage[] }>(`${smtp.httpUrl}/messages`)).body.messages).toHaveLength(0);
    await smtp.close();
    expect(fs.readdirSync(dir)).toEqual([]);
    const again = await start(dir);
    cleanups.push(() => again.close());
    expect((await getJson<{ messages: MailboxMessage[] }>(`${again.httpUrl}/messages`)).body.messages).toHaveLength(0);
  });

  it('refuses a message above the size limit with a permanent SMTP error', async () => {
    const dir = tempDir();
    const smtp = await startFakeSmtp({ smtpPort: 0, httpPort: 0, dir, log: false, maxMessageBytes: 10_000 });
    cleanups.push(() => smtp.close());
    const err = await transport(smtp.smtpPort)
      .sendMail({ from: 'a@stochos.test', to: 'b@client.test', subject: 'Big', text: 'x'.repeat(50_000) })
      .then(() => null, (e: unknown) => e as { responseCode?: number });
    expect(err?.responseCode).toBe(552);
    expect(smtp.messages()).toHaveLength(0);
  });

  it('starts from the environment with tsx', async () => {
    const dir = tempDir();
    const child = spawn(process.execPath, [path.resolve('node_modules/tsx/dist/cli.mjs'), 'lib/fakes/smtp/main.ts'], {
      env: { ...process.env, FAKE_SMTP_PORT: '0', FAKE_MAILBOX_PORT: '0', FAKE_MAILBOX_DIR: dir },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    cleanups.push(
      () =>
        new Promise<void>((res) => {
          if (child.exitCode !== null) return res();
          child.once('exit', () => res());
          child.kill('SIGTERM');
        }),
    );
    const { smtpPort, httpUrl } = await new Promise<{ smtpPort: number; httpUrl: string }>((resolve, reject) => {
      let out = '';
      const timer = setTimeout(() => reject(new Error(`no start line: ${out}`)), 20_000);
      child.stdout!.on('data', (c: Buffer) => {
        out += c.toString();
        const m = /SMTP on port (\d+); mailbox API at (http:\/\/[\d.:]+)\/messages/.exec(out);
        if (m) {
          clearTimeout(timer);
          resolve({ smtpPort: Number(m[1]), httpUrl: m[2] });
        }
      });
      child.once('exit', (code) => reject(new Error(`exited ${code}: ${out}`)));
    });
    await transport(smtpPort).sendMail({ from: 'a@stochos.test', to: 'b@client.test', subject: 'Via main', text: 'x' });
    const list = (await getJson<{ messages: MailboxMessage[] }>(`${httpUrl}/messages?to=b@client.test`)).body.messages;
    expect(list.map((m) => m.subject)).toEqual(['Via main']);
  });
});
