// Views per day for one pass: a small bar chart (loads as bars, dial moves as a line) with a table alternative.
import type { PassDetailView } from '@/lib/core/embed/views';

const W = 560;
const H = 120;
const PAD = { l: 28, r: 8, t: 8, b: 20 };

export function ViewsChart({ daily }: { daily: PassDetailView['daily'] }) {
  const n = daily.length;
  const maxLoad = Math.max(1, ...daily.map((d) => d.load));
  const maxDial = Math.max(1, ...daily.map((d) => d.dial));
  const iw = W - PAD.l - PAD.r;
  const ih = H - PAD.t - PAD.b;
  const bw = iw / n;
  const y = (v: number, max: number) => PAD.t + ih - (v / max) * ih;
  const line = daily.map((d, i) => `${i === 0 ? 'M' : 'L'}${(PAD.l + bw * (i + 0.5)).toFixed(1)},${y(d.dial, maxDial).toFixed(1)}`).join('');
  const total = daily.reduce((s, d) => ({ load: s.load + d.load, dial: s.dial + d.dial, snapshot: s.snapshot + d.snapshot }), { load: 0, dial: 0, snapshot: 0 });
  const label = `Views over the last ${n} days: ${total.load} loads, ${total.dial} dial interactions, ${total.snapshot} snapshot requests.`;
  return (
    <figure className="space-y-2">
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={label} className="h-auto w-full max-w-[720px]">
        <defs>
          <pattern id="views-hatch" width="4" height="4" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
            <rect width="4" height="4" fill="#d3eeea" />
            <line x1="0" y1="0" x2="0" y2="4" stroke="#176d63" strokeWidth="1.2" />
          </pattern>
        </defs>
        <line x1={PAD.l} x2={W - PAD.r} y1={PAD.t + ih} y2={PAD.t + ih} stroke="#aab6bf" />
        <text x={PAD.l - 4} y={PAD.t + 8} textAnchor="end" fontSize="10" fill="#445461" className="num">
          {maxLoad}
        </text>
        <text x={PAD.l - 4} y={PAD.t + ih} textAnchor="end" fontSize="10" fill="#445461" className="num">
          0
        </text>
        {daily.map((d, i) => {
          const h = (d.load / maxLoad) * ih;
          return d.load > 0 ? <rect key={d.day} x={PAD.l + bw * i + 1} y={PAD.t + ih - h} width={Math.max(1, bw - 2)} height={h} fill="url(#views-hatch)" stroke="#176d63" strokeWidth="0.6" /> : null;
        })}
        <path d={line} fill="none" stroke="#b45309" strokeWidth="1.5" strokeDasharray="4 2" />
        <text x={PAD.l} y={H - 4} fontSize="10" fill="#445461" className="num">
          {daily[0]?.day}
        </text>
        <text x={W - PAD.r} y={H - 4} fontSize="10" fill="#445461" textAnchor="end" className="num">
          {daily[n - 1]?.day}
        </text>
      </svg>
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-700">
        <span className="inline-flex items-center gap-1.5">
          <svg aria-hidden="true" width="14" height="10">
            <rect width="14" height="10" fill="url(#views-hatch)" stroke="#176d63" />
          </svg>
          Loads per day (scale 0–{maxLoad})
        </span>
        <span className="inline-flex items-center gap-1.5">
          <svg aria-hidden="true" width="18" height="10">
            <path d="M0 5h18" stroke="#b45309" strokeWidth="1.5" strokeDasharray="4 2" />
          </svg>
          Dial interactions per day (own scale, 0–{maxDial})
        </span>
      </figcaption>
      <details className="text-xs text-ink-700">
        <summary className="cursor-pointer">Show the figures as a table</summary>
        <table className="num mt-2 w-full max-w-md text-right">
          <caption className="sr-only">Views per day</caption>
          <thead>
            <tr>
              <th scope="col" className="text-left">
                Day (UTC)
              </th>
              <th scope="col">Loads</th>
              <th scope="col">Dial moves</th>
              <th scope="col">Snapshots</th>
            </tr>
          </thead>
          <tbody>
            {daily
              .filter((d) => d.load + d.dial + d.snapshot > 0)
              .map((d) => (
                <tr key={d.day}>
                  <th scope="row" className="text-left font-normal">
                    {d.day}
                  </th>
                  <td>{d.load}</td>
                  <td>{d.dial}</td>
                  <td>{d.snapshot}</td>
                </tr>
              ))}
          </tbody>
        </table>
      </details>
    </figure>
  );
}
