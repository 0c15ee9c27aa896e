import { cx } from './cx';

export interface ProgressBarProps {
  /** Current amount; leave undefined for an indeterminate bar. */
  value?: number;
  max?: number;
  /** Accessible name, e.g. "Trials done". */
  label: string;
  /** Text read out and shown beside the bar, e.g. "42 000 of 100 000 trials". */
  valueText?: string;
  showLabel?: boolean;
  className?: string;
}

export function ProgressBar({ value, max = 100, label, valueText, showLabel = true, className }: ProgressBarProps) {
  const pct = value === undefined ? undefined : Math.max(0, Math.min(100, (value / max) * 100));
  return (
    <div className={className}>
      {showLabel ? (
        <div className="mb-1 flex items-baseline justify-between gap-3 text-xs text-ink-600">
          <span className="font-medium text-ink-700">{label}</span>
          {valueText || pct !== undefined ? <span className="num">{valueText ?? `${Math.round(pct as number)} %`}</span> : null}
        </div>
      ) : null}
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={max}
        aria-valuenow={value}
        aria-valuetext={valueText}
        className="h-2 w-full overflow-hidden rounded-full bg-ink-100 ring-1 ring-ink-200 ring-inset"
      >
        <div
          className={cx('h-full rounded-full bg-accent-600 transition-[width] duration-150', pct === undefined && 'w-1/3 animate-pulse')}
          style={pct === undefined ? undefined : { width: `${pct}%` }}
        />
      </div>
    </div>
  );
}
