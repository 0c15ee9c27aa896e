import type { CSSProperties, ReactNode } from 'react';
import type { Paint, Scene, SceneNode } from '@/lib/core/charts/scene';

// Draws a chart scene as React SVG elements: the same shapes svg-string.ts writes for downloads.
// In the page, text uses the app's Plex faces through their CSS variables.

const FONT: Record<'sans' | 'mono', CSSProperties> = {
  sans: { fontFamily: 'var(--font-sans), system-ui, sans-serif' },
  mono: { fontFamily: 'var(--font-mono), ui-monospace, monospace', fontVariantNumeric: 'tabular-nums' },
};

const BASELINE = { alphabetic: undefined, middle: 'middle', hanging: 'hanging' } as const;

function paint(p: Paint | undefined, prefix: string): string | undefined {
  if (p === undefined) return undefined;
  return typeof p === 'string' ? p : `url(#${prefix}${p.pattern})`;
}

function Node({ n, prefix, k }: { n: SceneNode; prefix: string; k: string }): ReactNode {
  const opacity = n.opacity;
  switch (n.type) {
    case 'rect':
      return <rect x={n.x} y={n.y} width={n.width} height={n.height} rx={n.rx} fill={paint(n.fill, prefix)} stroke={paint(n.stroke, prefix)} strokeWidth={n.stroke ? n.strokeWidth : undefined} opacity={opacity} />;
    case 'line':
      return <line x1={n.x1} y1={n.y1} x2={n.x2} y2={n.y2} stroke={paint(n.stroke, prefix)} strokeWidth={n.strokeWidth ?? 1} strokeDasharray={n.dash} opacity={opacity} />;
    case 'path':
      return <path d={n.d} fill={paint(n.fill, prefix) ?? 'none'} stroke={paint(n.stroke, prefix)} strokeWidth={n.stroke ? (n.strokeWidth ?? 1) : undefined} strokeDasharray={n.dash} strokeLinejoin={n.strokeLinejoin} opacity={opacity} />;
    case 'circle':
      return <circle cx={n.cx} cy={n.cy} r={n.r} fill={paint(n.fill, prefix)} stroke={paint(n.stroke, prefix)} strokeWidth={n.stroke ? (n.strokeWidth ?? 1) : undefined} opacity={opacity} />;
    case 'text':
      return (
        <text
          x={n.x}
          y={n.y}
          fontSize={n.size}
          fontWeight={n.weight}
          fill={n.fill}
          textAnchor={n.anchor}
          dominantBaseline={n.baseline ? BASELINE[n.baseline] : undefined}
          transform={n.rotate ? `rotate(${n.rotate} ${n.x} ${n.y})` : undefined}
          opacity={opacity}
          style={FONT[n.font]}
        >
          {n.text}
        </text>
      );
    case 'group':
      return (
        <g transform={n.dx || n.dy ? `translate(${n.dx ?? 0} ${n.dy ?? 0})` : undefined} opacity={opacity} aria-hidden={n.decorative || undefined}>
          {n.children.map((c, i) => (
            <Node key={c.key ?? `${k}-${i}`} n={c} prefix={prefix} k={`${k}-${i}`} />
          ))}
        </g>
      );
  }
}

export interface SceneSvgProps {
  scene: Scene;
  /** Unique prefix for pattern ids (several charts share one page). */
  idPrefix: string;
  /** Interactive layer drawn on top, in plot coordinates (translated by `offset`). */
  overlay?: ReactNode;
  offset?: { x: number; y: number };
  className?: string;
}

export function SceneSvg({ scene, idPrefix, overlay, offset, className }: SceneSvgProps) {
  const titleId = `${idPrefix}title`;
  const descId = `${idPrefix}desc`;
  return (
    <svg
      viewBox={`0 0 ${scene.width} ${scene.height}`}
      width="100%"
      style={{ display: 'block', maxWidth: '100%', height: 'auto' }}
      role="img"
      aria-labelledby={`${titleId} ${descId}`}
      className={className}
    >
      <title id={titleId}>{scene.title}</title>
      <desc id={descId}>{scene.description}</desc>
      {scene.patterns.length ? (
        <defs>
          {scene.patterns.map((p) => (
            <pattern key={p.id} id={`${idPrefix}${p.id}`} patternUnits="userSpaceOnUse" width={p.spacing} height={p.spacing} patternTransform={`rotate(${p.angle})`}>
              <rect width={p.spacing} height={p.spacing} fill={p.background} />
              <line x1={0} y1={0} x2={0} y2={p.spacing} stroke={p.color} strokeWidth={p.strokeWidth * 2} />
            </pattern>
          ))}
        </defs>
      ) : null}
      <rect width="100%" height="100%" fill={scene.background} />
      {scene.nodes.map((n, i) => (
        <Node key={n.key ?? i} n={n} prefix={idPrefix} k={String(i)} />
      ))}
      {overlay ? <g transform={offset ? `translate(${offset.x} ${offset.y})` : undefined}>{overlay}</g> : null}
    </svg>
  );
}
