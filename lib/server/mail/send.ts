import 'server-only';
import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '@/lib/server/env';

let transport: Transporter | null = null;

function getTransport(): Transporter {
  if (transport) return transport;
  const e = env();
  transport = nodemailer.createTransport({
    host: e.SMTP_HOST,
    port: e.SMTP_PORT,
    secure: e.SMTP_SECURE,
    auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASS ?? '' } : undefined,
    // The local fake speaks plain SMTP; a real relay negotiates TLS as usual.
    ignoreTLS: !e.realSmtp,
    // Fail fast when the server is down: callers (the snapshot queue) retry with backoff.
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 60_000,
  });
  return transport;
}

export interface Mail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; content: Buffer; contentType: string }[];
  /** A fixed Message-ID lets a receiving system recognise a resend as the same message. */
  messageId?: string;
}

export async function sendMail(mail: Mail): Promise<void> {
  await getTransport().sendMail({ from: env().MAIL_FROM, ...mail });
}

export function resetMailTransport(): void {
  transport = null;
}

export const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** A plain, readable message with one call-to-action link, as text and HTML. */
export function linkMail(to: string, subject: string, lines: string[], action: { label: string; url: string }): Mail {
  const text = [...lines, '', `${action.label}: ${action.url}`, '', '— Stochos'].join('\n');
  const html = `<div style="font-family:system-ui,sans-serif;color:#222d36;max-width:520px">${lines
    .map((l) => `<p>${escapeHtml(l)}</p>`)
    .join('')}<p><a href="${escapeHtml(action.url)}" style="display:inline-block;background:#176d63;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escapeHtml(
    action.label,
  )}</a></p><p style="color:#5a6b78;font-size:13px">Or paste this address into your browser: ${escapeHtml(action.url)}</p></div>`;
  return { to, subject, text, html };
}

/**
 * What a failed send means for the job. 'retry': the server never took the message (no connection, or a
 * temporary 4xx refusal). 'permanent': a 5xx refusal. 'uncertain': the connection broke while the message was
 * being handed over, so it may have been delivered; it is not sent again.
 */
export function classifySendError(err: unknown): 'retry' | 'permanent' | 'uncertain' {
  const e = err as { code?: string; command?: string; responseCode?: number };
  if (typeof e.responseCode === 'number') return e.responseCode >= 500 ? 'permanent' : e.responseCode >= 400 ? 'retry' : 'uncertain';
  if (e.code === 'ECONNECTION' || e.code === 'EDNS' || e.code === 'ETLS' || e.code === 'EAUTH') return 'retry';
  if (e.command === 'CONN' || e.command === 'EHLO' || e.command === 'HELO' || e.command === 'MAIL FROM' || e.command === 'RCPT TO') return 'retry';
  return 'uncertain';
}
