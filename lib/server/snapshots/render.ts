import 'server-only';
import type { RunResult } from '@/lib/core/engine';
import { runForServer } from '@/lib/server/simulate/server-run';
import type { SnapshotContext } from '@/db/snapshots';
import { snapshotContent, type SnapshotContent } from './content';
import { renderSnapshotPdf } from './pdf';
import { getLogo } from '@/db/logos';

// The re-run: the pinned version's model with the viewer's dial values, through the same engine (and so the same
// seed, trial count and sampling design) as the widget in the browser. No options beyond the dial values: the
// browser passes none either (samples are not needed), so the summaries are bit for bit the same. The run goes to the
// worker-thread pool, so the job's lease heartbeat keeps beating while it runs.

export interface RenderedSnapshot {
  content: SnapshotContent;
  result: RunResult;
  /** The pinned view's run, when the viewer asked for two views. */
  pinned: RunResult | null;
  pdf: Buffer;
  pages: number;
  renderMs: number;
}

export async function renderSnapshot(ctx: SnapshotContext): Promise<RenderedSnapshot> {
  const start = performance.now();
  const result = await runForServer(ctx.model, ctx.job.dialValues);
  // The pinned view: the same model, seed and trials with its own dial values, as the browser ran it when pinned.
  const pinned = ctx.job.pinnedDialValues ? await runForServer(ctx.model, ctx.job.pinnedDialValues) : null;
  const content = snapshotContent(ctx.model, result, {
    firmName: ctx.firm.name,
    brandColor: ctx.widget.brandColor || ctx.firm.brandColor,
    paperSize: ctx.firm.paperSize,
    widgetTitle: ctx.widget.title,
    clientName: ctx.clientName,
    requestedAt: ctx.job.createdAt,
    versionNumber: ctx.versionNumber,
    checkState: ctx.checkState,
    checkedAt: ctx.checkedAt,
    checkerName: ctx.checkerName,
    authorName: ctx.authorName,
    panels: ctx.widget.panels,
    headline: ctx.widget.headline,
    dialIds: ctx.widget.dialIds,
  }, pinned);
  const logo = ctx.widget.showLogo ? await getLogo(ctx.job.firmId) : null;
  const pdf = await renderSnapshotPdf(content, result, logo?.bytes ?? null, pinned);
  return { content, result, pinned, pdf: pdf.bytes, pages: pdf.pages, renderMs: Math.round(performance.now() - start) };
}
