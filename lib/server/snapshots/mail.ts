import 'server-only';
import { escapeHtml, sendMail } from '@/lib/server/mail/send';
import type { SnapshotContent } from './content';

// The snapshot e-mail: the headline figures in a short text and HTML body, the PDF attached, and the job's own
// Message-ID so a receiving system can recognise the message as one and the same.

export interface SnapshotMail {
  to: string;
  subject: string;
  text: string;
  html: string;
  filename: string;
}


export function snapshotFilename(title: string, iso: string): string {
  const slug = title
    .normalize('NFKD')
    .replace(/[^\w\s-]/g, '')
    .trim()
    .toLowerCase()
    .replace(/[\s_]+/g, '-')
    .slice(0, 60);
  return `${slug || 'snapshot'}-${iso.slice(0, 10)}.pdf`;
}

export function composeSnapshotMail(to: string, c: SnapshotContent, requestedAt: string): SnapshotMail {
  const h = c.headline;
  const lines = [
    `Here is the snapshot of “${c.title}” you asked for, as you set it up on ${c.dateText}.`,
    ...(h ? [`${h.label}: ${h.value}${h.sub ? ` (${h.sub})` : ''}`] : []),
    ...(c.dials.length ? ['Values chosen:', ...c.dials.map((d) => `  ${d.label}: ${d.value}${d.unit ? ` ${d.unit}` : ''}`)] : []),
    ...(c.compare ? ['You pinned another view to compare: the PDF shows both views side by side, with the difference of each figure.'] : []),
    `${c.versionText}. ${c.trialsText}.`,
    'The attached PDF has the charts, the assumptions, the method and the cautions that go with these figures.',
  ];
  const text = [...lines, '', `— ${c.firmName}, sent by Stochos for ${c.clientName}`].join('\n');
  const html =
    `<div style="font-family:system-ui,sans-serif;color:#222d36;max-width:560px;line-height:1.45">` +
    `<p style="margin:0 0 4px;color:#445461;font-size:13px">${escapeHtml(c.firmName)}</p>` +
    `<p>Here is the snapshot of <strong>${escapeHtml(c.title)}</strong> you asked for, as you set it up on ${escapeHtml(c.dateText)}.</p>` +
    (h
      ? `<div style="border:1px solid #c4ccd3;border-left:4px solid ${escapeHtml(c.brandColor)};padding:10px 14px;margin:12px 0"><div style="font-size:13px;color:#33414c">${escapeHtml(h.label)}</div><div style="font-size:26px;font-weight:600">${escapeHtml(h.value)}</div>${h.sub ? `<div style="font-size:12px;color:#445461">${escapeHtml(h.sub)}</div>` : ''}</div>`
      : '') +
    (c.dials.length
      ? `<table style="border-collapse:collapse;font-size:14px">${c.dials
          .map((d) => `<tr><td style="padding:2px 16px 2px 0;color:#445461">${escapeHtml(d.label)}</td><td style="padding:2px 0;text-align:right;font-family:ui-monospace,monospace">${escapeHtml(d.value)}${d.unit ? ` ${escapeHtml(d.unit)}` : ''}</td></tr>`)
          .join('')}</table>`
      : '') +
    `<p style="font-size:13px;color:#445461">${escapeHtml(c.versionText)}. ${escapeHtml(c.trialsText)}. The attached PDF has the charts, the assumptions, the method and the cautions that go with these figures.</p>` +
    `</div>`;
  const subject = `${c.title}: ${h ? `${h.label} ${h.value}` : 'your snapshot'}`;
  return { to, subject, text, html, filename: snapshotFilename(c.title, requestedAt) };
}

export async function deliverSnapshotMail(m: SnapshotMail, pdf: Buffer, messageId: string): Promise<void> {
  await sendMail({
    to: m.to,
    subject: m.subject,
    text: m.text,
    html: m.html,
    messageId,
    attachments: [{ filename: m.filename, content: pdf, contentType: 'application/pdf' }],
  });
}

// Shared with the notification mails; kept importable from here for the snapshot worker.
export { classifySendError } from '@/lib/server/mail/send';
