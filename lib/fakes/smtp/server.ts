// Local SMTP fake with a mailbox HTTP API, for development, demos and tests.
//
// SMTP (smtp-server): any sender, any recipient, AUTH optional and accepted with any credentials,
// STARTTLS disabled (nodemailer: `ignoreTLS: true`). Each message is stored in the mailbox directory
// as `<id>.eml` (the raw message) plus `<id>.json` (the entry below), both written atomically
// (temp file + rename), so a restart keeps them.
//
// HTTP JSON API on 127.0.0.1:
//   GET    /messages?to=<address>&subject=<text>&limit=<n>
//          -> { "messages": MailboxMessage[] }, newest first. `to` matches (case-insensitive) any
//             address in To, Cc or the SMTP envelope (so Bcc recipients find their copy);
//             `subject` is a case-insensitive substring; `limit` defaults to 100 (max 1000).
//   GET    /messages/:id                       -> MailboxMessage
//   GET    /messages/:id/raw                   -> the .eml (message/rfc822)
//   GET    /messages/:id/html                  -> the HTML body (text/html, sandboxed by CSP; 404 if none)
//   GET    /messages/:id/attachments/:index    -> attachment bytes with its Content-Type
//   DELETE /messages                           -> { "deleted": n }   (tests)
//   DELETE /messages/:id                       -> { "deleted": 1 }
//   GET    /health                             -> { "ok": true, "messages": n }
//
// MailboxMessage:
//   {
//     "id": "m0mfz3k2a01-3f9c2a",          // sortable by arrival
//     "receivedAt": "2026-12-01T10:00:00.000Z",
//     "date": "2026-12-01T10:00:00.000Z" | null,   // the Date header
//     "messageId": "<…@…>" | null,
//     "from": "snapshots@stochos.test" | null,     // address only
//     "fromName": "Stochos" | null,
//     "to": ["viewer@client.test"],                // To header addresses, lower case
//     "cc": [],
//     "envelopeTo": ["viewer@client.test"],        // SMTP RCPT TO, lower case
//     "subject": "…",
//     "text": "…",                                 // plain-text body ('' if none)
//     "html": "<p>…</p>" | null,
//     "attachments": [{ "index": 0, "filename": "snapshot.pdf" | null, "contentType": "application/pdf",
//                       "size": 12345, "contentId": null }],
//     "size": 23456                                // raw message bytes
//   }
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { simpleParser, type AddressObject, type ParsedMail } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { refuseUnlessLocal } from '../local-only';
import type { MailboxAttachment, MailboxMessage } from '@/lib/core/api-types';

export type { MailboxAttachment, MailboxMessage };

export interface FakeSmtpOptions {
  /** SMTP port; 0 picks a free one. Default 2525. */
  smtpPort?: number;
  /** Mailbox HTTP port; 0 picks a free one. Default 2526. */
  httpPort?: number;
  host?: string;
  /** Mailbox directory. Default .data/mailbox. */
  dir?: string;
  /** Largest accepted message in bytes. Default 25 MB. */
  maxMessageBytes?: number;
  log?: ((line: string) => void) | false;
}

export interface FakeSmtpHandle {
  smtpPort: number;
  httpUrl: string;
  /** Messages currently stored, newest first. */
  messages(): MailboxMessage[];
  close(): Promise<void>;
}

const ID_PATTERN = /^m[0-9a-z]+-[0-9a-f]+$/;

function writeAtomic(file: string, data: string | Buffer): void {
  const tmp = `${file}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`;
  fs.writeFileSync(tmp, data);
  fs.renameSync(tmp, file);
}

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(field) ? field : field ? [field] : [];
  const out: string[] = [];
  const walk = (entries: AddressObject['value']) => {
    for (const e of entries) {
      if (e.address) out.push(e.address.toLowerCase());
      if (e.group) walk(e.group);
    }
  };
  for (const f of list) walk(f.value);
  return out;
}

/** The stored messages: an in-memory index over the .json files, kept in step with the directory. */
export class Mailbox {
  private readonly index = new Map<string, MailboxMessage>();
  private counter = 0;

  constructor(readonly dir: string) {
    fs.mkdirSync(dir, { recursive: true });
    for (const name of fs.readdirSync(dir)) {
      if (!name.endsWith('.json')) continue;
      const id = name.slice(0, -5);
      if (!ID_PATTERN.test(id) || !fs.existsSync(path.join(dir, `${id}.eml`))) continue;
      try {
        this.index.set(id, JSON.parse(fs.readFileSync(path.join(dir, name), 'utf8')) as MailboxMessage);
      } catch {
        // A torn entry cannot happen with rename-based writes; skip anything unreadable all the same.
      }
    }
  }

  private newId(): string {
    this.counter = (this.counter + 1) % 1296;
    return `m${Date.now().toString(36)}${this.counter.toString(36).padStart(2, '0')}-${randomBytes(3).toString('hex')}`;
  }

  async store(raw: Buffer, envelopeTo: string[]): Promise<MailboxMessage> {
    const parsed: ParsedMail = await simpleParser(raw);
    const from = Array.isArray(parsed.from) ? parsed.from[0] : parsed.from;
    const id = this.newId();
    const entry: MailboxMessage = {
      id,
      receivedAt: new Date().toISOString(),
      date: parsed.date ? parsed.date.toISOString() : null,
      messageId: parsed.messageId ?? null,
      from: from?.value[0]?.address ?? null,
      fromName: from?.value[0]?.name || null,
      to: addresses(parsed.to),
      cc: addresses(parsed.cc),
      envelopeTo: envelopeTo.map((a) => a.toLowerCase()),
      subject: parsed.subject ?? '',
      text: parsed.text ?? '',
      html: typeof parsed.html === 'string' ? parsed.html : null,
      attachments: parsed.attachments.map((a, index) => ({
        index,
        filename: a.filename ?? null,
        contentType: a.contentType,
        size: a.size ?? a.content.length,
        contentId: a.contentId ?? null,
      })),
      size: raw.length,
    };
    // Raw first, entry second: an entry on disk always has its .eml.
    writeAtomic(path.join(this.dir, `${id}.eml`), raw);
    writeAtomic(path.join(this.dir, `${id}.json`), JSON.stringify(entry, null, 2));
    this.index.set(id, entry);
    return entry;
  }

  list(filter: { to?: string; subject?: string; limit?: number } = {}): MailboxMessage[] {
    const to = filter.to?.trim().toLowerCase();
    const subject = filter.subject?.toLowerCase();
    return [...this.index.values()]
      .filter((m) => !to || m.to.includes(to) || m.cc.includes(to) || m.envelopeTo.includes(to))
      .filter((m) => !subject || m.subject.toLowerCase().includes(subject))
      .sort((a, b) => (a.receivedAt === b.receivedAt ? (a.id < b.id ? 1 : -1) : a.receivedAt < b.receivedAt ? 1 : -1))
      .slice(0, filter.limit ?? 100);
  }

  get(id: string): MailboxMessage | undefined {
    return this.index.get(id);
  }

  raw(id: string): Buffer {
    return fs.readFileSync(path.join(this.dir, `${id}.eml`));
  }

  async attachment(id: string, index: number): Promise<{ contentType: string; filename: string | null; content: Buffer } | undefined> {
    const parsed = await simpleParser(this.raw(id));
    const a = parsed.attachments[index];
    return a ? { contentType: a.contentType, filename: a.filename ?? null, content: a.content } : undefined;
  }

  remove(id: string): boolean {
    if (!this.index.delete(id)) return false;
    // Entry first, so a crash in between leaves an .eml without entry, which loading ignores.
    fs.rmSync(path.join(this.dir, `${id}.json`), { force: true });
    fs.rmSync(path.join(this.dir, `${id}.eml`), { force: true });
    return true;
  }

  clear(): number {
    const ids = [...this.index.keys()];
    for (const id of ids) this.remove(id);
    return ids.length;
  }
}

function sendJson(res: http.ServerResponse, status: number, body: unknown): void {
  res.writeHead(status, { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'no-store' });
  res.end(JSON.stringify(body));
}

function contentDisposition(filename: string | null): string {
  if (!filename) return 'attachment';
  const ascii = filename.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(filename)}`;
}

export async function startFakeSmtp(options: FakeSmtpOptions = {}): Promise<FakeSmtpHandle> {
  const host = options.host ?? '127.0.0.1';
  const log = options.log === false ? () => undefined : (options.log ?? ((line: string) => console.error(`[fake-smtp] ${line}`)));
  const maxBytes = options.maxMessageBytes ?? 25 * 1024 * 1024;
  const mailbox = new Mailbox(options.dir ?? '.data/mailbox');

  const smtp = new SMTPServer({
    authOptional: true,
    allowInsecureAuth: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    banner: 'Stochos local mail fake',
    size: maxBytes,
    onAuth(_auth, _session, callback) {
      callback(null, { user: 'local' });
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('error', (err) => callback(err));
      stream.on('end', () => {
        if (stream.sizeExceeded) {
          const err = new Error(`Message exceeds the fixed maximum message size of ${maxBytes} bytes`) as Error & { responseCode: number };
          err.responseCode = 552;
          callback(err);
          return;
        }
        const rcpt = session.envelope.rcptTo.map((r) => r.address);
        mailbox
          .store(Buffer.concat(chunks), rcpt)
          .then((m) => {
            log(`stored ${m.id} "${m.subject}" for ${rcpt.join(', ')}`);
            callback();
          })
          .catch((err: unknown) => {
            log(`could not store a message: ${String(err)}`);
            const e = new Error('Local mailbox could not store the message') as Error & { responseCode: number };
            e.responseCode = 451;
            callback(e);
          });
      });
    },
  });

  const api = http.createServer((req, res) => {
    void (async () => {
      const url = new URL(req.url ?? '/', 'http://mailbox.local');
      const parts = url.pathname.split('/').filter(Boolean);
      const method = req.method ?? 'GET';
      try {
        const refused = refuseUnlessLocal(req, [`http://${host}:${(api.address() as AddressInfo | null)?.port ?? 0}`]);
        if (refused) return sendJson(res, 403, { error: refused });
        if (method === 'GET' && url.pathname === '/health') return sendJson(res, 200, { ok: true, messages: mailbox.list({ limit: 1e9 }).length });
        if (parts[0] !== 'messages') return sendJson(res, 404, { error: 'Not found' });
        if (parts.length === 1) {
          if (method === 'GET') {
            const limitRaw = url.searchParams.get('limit');
            const limit = limitRaw && /^\d+$/.test(limitRaw) ? Math.min(1000, Math.max(1, Number(limitRaw))) : 100;
            return sendJson(res, 200, {
              messages: mailbox.list({ to: url.searchParams.get('to') ?? undefined, subject: url.searchParams.get('subject') ?? undefined, limit }),
            });
          }
          if (method === 'DELETE') return sendJson(res, 200, { deleted: mailbox.clear() });
          return sendJson(res, 405, { error: 'Method not allowed' });
        }
        const id = parts[1];
        const message = ID_PATTERN.test(id) ? mailbox.get(id) : undefined;
        if (!message) return sendJson(res, 404, { error: `No message ${id}` });
        if (parts.length === 2) {
          if (method === 'GET') return sendJson(res, 200, message);
          if (method === 'DELETE') return sendJson(res, 200, { deleted: mailbox.remove(id) ? 1 : 0 });
          return sendJson(res, 405, { error: 'Method not allowed' });
        }
        if (method !== 'GET') return sendJson(res, 405, { error: 'Method not allowed' });
        if (parts.length === 3 && parts[2] === 'raw') {
          res.writeHead(200, { 'Content-Type': 'message/rfc822', 'Content-Disposition': `attachment; filename="${id}.eml"` });
          return res.end(mailbox.raw(id));
        }
        if (parts.length === 3 && parts[2] === 'html') {
          if (message.html === null) return sendJson(res, 404, { error: 'This message has no HTML body' });
          res.writeHead(200, {
            'Content-Type': 'text/html; charset=utf-8',
            // Shown inside the development mailbox page: no scripts, no outside requests.
            'Content-Security-Policy': "sandbox; default-src 'none'; img-src data: cid:; style-src 'unsafe-inline'",
            'X-Content-Type-Options': 'nosniff',
          });
          return res.end(message.html);
        }
        if (parts.length === 4 && parts[2] === 'attachments' && /^\d+$/.test(parts[3])) {
          const a = await mailbox.attachment(id, Number(parts[3]));
          if (!a) return sendJson(res, 404, { error: `No attachment ${parts[3]} on ${id}` });
          res.writeHead(200, {
            'Content-Type': a.contentType,
            'Content-Length': String(a.content.length),
            'Content-Disposition': contentDisposition(a.filename),
            'X-Content-Type-Options': 'nosniff',
          });
          return res.end(a.content);
        }
        return sendJson(res, 404, { error: 'Not found' });
      } catch (err) {
        log(`mailbox API error on ${method} ${url.pathname}: ${String(err)}`);
        if (!res.headersSent) sendJson(res, 500, { error: 'Mailbox error; see the fake SMTP log.' });
        else res.end();
      }
    })();
  });

  const listen = (server: { listen: (port: number, host: string, cb: () => void) => unknown; once: (e: string, cb: (err: Error) => void) => unknown }, port: number) =>
    new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(port, host, () => resolve());
    });
  await listen(smtp.server, options.smtpPort ?? 2525);
  try {
    await listen(api, options.httpPort ?? 2526);
  } catch (err) {
    await new Promise<void>((r) => smtp.close(() => r()));
    throw err;
  }
  const smtpPort = (smtp.server.address() as AddressInfo).port;
  const httpPort = (api.address() as AddressInfo).port;

  return {
    smtpPort,
    httpUrl: `http://${host}:${httpPort}`,
    messages: () => mailbox.list({ limit: 1e9 }),
    close: async () => {
      await Promise.all([
        new Promise<void>((r) => smtp.close(() => r())),
        new Promise<void>((r) => {
          api.close(() => r());
          api.closeAllConnections();
        }),
      ]);
    },
  };
}
