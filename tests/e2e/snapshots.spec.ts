import { test, expect, type FrameLocator, type Locator } from '@playwright/test';
import type Database from 'better-sqlite3';
import { PDFParse } from 'pdf-parse';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { waitForMessage } from '../support/mailbox';
import { E2E_HOST } from './support/ports';

// "E-mail this view" in Chromium from the demo host page on the second origin: the viewer moves two dials,
// asks for the PDF, and the PDF that reaches the SMTP fake shows the same headline figure and dial values.

const HOST = E2E_HOST;

let db: Database.Database;
let firmId: string;

test.beforeAll(() => {
  db = openTestDb(process.env.E2E_DATA_DIR!);
  firmId = firmIdOf(db, 'owner@orrinvale.example');
});
test.afterAll(() => db?.close());

/** The PDF's text layer and the page differ only in the kind of space between groups and units. */
const norm = (s: string) => s.replace(/[\u00a0\u202f\u2009]/g, ' ').replace(/\s+/g, ' ').trim();

/** A seeded pass of Quillbrook Pumps Ltd (lib/dev/seed/clients.ts: allows the host page's origin and @quillbrook-pumps.example). */
function seededPass(): { passId: string; title: string } {
  const rows = db
    .prepare(
      `select p.id as passId, w.title as title, w.dial_ids as dialIds from passes p join clients c on c.id = p.client_id join widgets w on w.id = p.widget_id
       where p.firm_id = ? and c.name = 'Quillbrook Pumps Ltd' and p.revoked_at is null order by w.title`,
    )
    .all(firmId) as { passId: string; title: string; dialIds: string }[];
  const row = rows.find((r) => (JSON.parse(r.dialIds) as string[]).length >= 2);
  if (!row) throw new Error('the demo seed has no Quillbrook widget with two dials');
  return row;
}

/** Waits until the headline has left its first value and stays the same for a second with no run pending. */
async function settledHeadline(box: Locator, before: string | null): Promise<string> {
  let last = '';
  await expect
    .poll(
      async () => {
        const stale = /opacity-60/.test((await box.getAttribute('class')) ?? '');
        const now = stale ? '' : ((await box.locator('p.num').first().textContent()) ?? '');
        const settled = now !== '' && now === last && now !== before;
        last = now;
        return settled;
      },
      { intervals: [1000], timeout: 60_000 },
    )
    .toBe(true);
  return last;
}

test('a viewer e-mails the view they set up; the PDF shows their headline figure and dial values digit for digit', async ({ page }) => {
  const { passId, title } = seededPass();
  await page.goto(`${HOST}/?pass=${passId}`);
  const f: FrameLocator = page.frameLocator(`iframe[title="${title}"]`);
  await expect(f.getByRole('heading', { name: title }).first()).toBeVisible();
  const box = f.locator('[aria-live="polite"][aria-atomic="true"]').first();
  await expect(box).not.toContainText('Computing');
  const first = await settledHeadline(box, null);

  // Move two dials: the first to its top end, the second two steps down from where the author left it.
  // The dials' sliders (the S-curve's percentile reader is a slider too, but no dial).
  const sliders = f.locator('input[type="range"]');
  await sliders.nth(0).focus();
  await sliders.nth(0).press('End');
  await sliders.nth(1).focus();
  await sliders.nth(1).press('ArrowLeft');
  await sliders.nth(1).press('ArrowLeft');
  const headline = await settledHeadline(box, first);

  // What the page shows: each dial's printed value (the slider's value text, "24.25 mm") and label.
  const shown: { label: string; text: string }[] = [];
  for (const s of await sliders.all()) {
    const id = await s.getAttribute('id');
    const label = (await f.locator(`label[for="${id}"]`).textContent())!.trim();
    shown.push({ label, text: norm((await s.getAttribute('aria-valuetext'))!) });
  }
  expect(shown.length).toBeGreaterThanOrEqual(2);

  const to = `design.review+${Date.now().toString(36)}@quillbrook-pumps.example`;
  await f.getByRole('button', { name: 'E-mail this view' }).click();
  await f.getByLabel('Send a PDF of this view to').fill(to);
  const posted = page.waitForResponse((r) => r.url().includes(`/api/embed/passes/${passId}/snapshots`));
  await f.getByRole('button', { name: 'Send PDF' }).click();
  const res = await posted;
  expect(res.status()).toBe(202);
  await expect(f.getByRole('status').filter({ hasText: to })).toContainText(`On its way to ${to}`);

  const mailbox = process.env.E2E_MAILBOX_URL!;
  const m = await waitForMessage(mailbox, to, new RegExp(title.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')), 90_000);
  expect(m.attachments?.[0]).toMatchObject({ contentType: 'application/pdf' });
  const pdfRes = await fetch(`${mailbox}/messages/${m.id}/attachments/0`);
  expect(pdfRes.headers.get('content-type')).toBe('application/pdf');
  const bytes = Buffer.from(await pdfRes.arrayBuffer());
  const parser = new PDFParse({ data: bytes });
  const text = norm((await parser.getText()).text);
  await parser.destroy();

  // The headline figure, digit for digit, and every dial as the page printed it.
  expect(text).toContain(norm(headline));
  for (const d of shown) {
    const at = text.indexOf(d.label);
    expect(at, `dial label ${d.label} in the PDF`).toBeGreaterThanOrEqual(0);
    expect(text.slice(at, at + d.label.length + 40), `value of ${d.label}`).toContain(d.text);
  }
  // The moved dials are not the author's values: the PDF is of this view, not the default one.
  expect(norm(headline)).not.toBe(norm(first));

  // The job's own measurements, for the record (the speed is benchmarked elsewhere, never asserted here).
  const job = () => db.prepare('select state, attempts, pdf_bytes as bytes, render_ms as ms from snapshot_jobs where recipient = ?').get(to) as { state: string; attempts: number; bytes: number; ms: number };
  await expect.poll(() => job().state).toBe('sent');
  expect(job()).toMatchObject({ attempts: 1, bytes: bytes.length });
  test.info().annotations.push({ type: 'pdf', description: `${bytes.length} bytes, rendered in ${job().ms} ms` });
  console.log(`snapshot PDF: ${bytes.length} bytes, rendered in ${job().ms} ms (${title})`);
});
