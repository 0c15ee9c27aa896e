'use client';

import { useId, useState, type ReactNode, type Ref } from 'react';
import type { Scene } from '@/lib/core/charts/scene';
import { cx } from '@/components/ui/cx';
import { SceneSvg } from './scene-svg';

export interface ChartFrameProps {
  title: ReactNode;
  /** Plain-text title for files and the SVG (defaults to the scene's). */
  fileTitle?: string;
  scene: Scene;
  /** Ref of the element whose width the chart is drawn for. */
  measureRef?: Ref<HTMLDivElement>;
  /** The same data as a table ("Show as table"). */
  table: ReactNode;
  /** Visible caption summarising the result; defaults to the scene's text alternative. */
  caption?: ReactNode;
  /** Interactive layer in plot coordinates (e.g. the S-curve readout). */
  overlay?: ReactNode;
  /** Controls under the chart (e.g. the readout line). */
  below?: ReactNode;
  /** Controls beside the buttons (e.g. an input picker). */
  controls?: ReactNode;
  headingLevel?: 'h2' | 'h3' | 'h4';
  className?: string;
  /** Hide the download buttons (e.g. in tight embeds). */
  downloads?: boolean;
}

function Icon({ d }: { d: string }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 16 16" className="h-3.5 w-3.5 flex-none" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" strokeLinejoin="round">
      <path d={d} />
    </svg>
  );
}

const TOOL =
  'inline-flex h-8 items-center gap-1.5 rounded-md border border-ink-200 bg-white px-2.5 text-[0.8125rem] font-medium text-ink-700 hover:border-ink-300 hover:bg-ink-50 hover:text-ink-900 aria-pressed:border-accent-700 aria-pressed:bg-accent-50 aria-pressed:text-accent-800 disabled:opacity-60';

/**
 * A chart as a figure: title, tools (Show as table, PNG, SVG), the drawing or its table, and a
 * caption that states the result in words.
 */
export function ChartFrame({ title, fileTitle, scene, measureRef, table, caption, overlay, below, controls, headingLevel: H = 'h3', className, downloads = true }: ChartFrameProps) {
  const uid = useId().replace(/[^a-zA-Z0-9_-]/g, '');
  const [asTable, setAsTable] = useState(false);
  const [busy, setBusy] = useState(false);
  const [failed, setFailed] = useState<string | null>(null);
  const offset = scene.nodes[0]?.type === 'group' ? { x: scene.nodes[0].dx ?? 0, y: scene.nodes[0].dy ?? 0 } : undefined;

  // The download code (SVG writer, PNG drawing) is fetched on the first click: most viewers never download.
  async function save(kind: 'png' | 'svg') {
    setBusy(true);
    setFailed(null);
    try {
      const { downloadPng, downloadSvg, fileSlug } = await import('./download');
      const name = fileSlug(fileTitle ?? scene.title);
      if (kind === 'png') await downloadPng(scene, name);
      else downloadSvg(scene, name);
    } catch (e) {
      setFailed(e instanceof Error ? e.message : `The ${kind.toUpperCase()} could not be made.`);
    } finally {
      setBusy(false);
    }
  }

  return (
    <figure aria-labelledby={`${uid}-h`} className={cx('min-w-0 rounded-lg border border-ink-200 bg-white', className)}>
      <div className="flex flex-wrap items-center justify-between gap-2 border-b border-ink-100 px-3 py-2 sm:px-4">
        <H id={`${uid}-h`} className="text-sm font-semibold text-ink-900">
          {title}
        </H>
        <div className="flex flex-wrap items-center gap-1.5">
          {controls}
          <button type="button" className={TOOL} aria-pressed={asTable} onClick={() => setAsTable((v) => !v)}>
            <Icon d="M2 3.5h12M2 8h12M2 12.5h12M6 3.5v9" />
            Show as table
          </button>
          {downloads ? (
            <>
              <button type="button" className={TOOL} onClick={() => void save('png')} disabled={busy} aria-label={`Download ${scene.title} as PNG`}>
                <Icon d="M8 2v8m0 0 3-3m-3 3L5 7M2.5 11.5v2h11v-2" />
                PNG
              </button>
              <button type="button" className={TOOL} onClick={() => void save('svg')} disabled={busy} aria-label={`Download ${scene.title} as SVG`}>
                <Icon d="M8 2v8m0 0 3-3m-3 3L5 7M2.5 11.5v2h11v-2" />
                SVG
              </button>
            </>
          ) : null}
        </div>
      </div>
      <div className="px-1 pt-2 sm:px-2">
        <div ref={measureRef}>{asTable ? <div className="px-2 pb-2">{table}</div> : <SceneSvg scene={scene} idPrefix={`${uid}-`} overlay={overlay} offset={offset} />}</div>
      </div>
      {!asTable && below ? <div className="px-3 sm:px-4">{below}</div> : null}
      {failed ? (
        <p role="alert" className="px-3 pt-1 text-sm text-danger-700 sm:px-4">
          {failed}
        </p>
      ) : null}
      <figcaption className="px-3 pt-1 pb-3 text-[0.8125rem] leading-snug text-ink-600 sm:px-4">{caption ?? scene.description}</figcaption>
    </figure>
  );
}
