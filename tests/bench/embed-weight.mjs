// What the embed page's JavaScript is made of, from the production build (`npm run build` first):
//   node tests/bench/embed-weight.mjs [--json]
// Lists every chunk the /embed/[passId] page loads and every chunk its web worker loads (followed through the
// worker bootstrap), with raw and gzip sizes and what each holds, recognised by strings the libraries carry.
// The Chromium check tests/e2e/embed-perf.spec.ts measures the same thing on the wire; this one needs no browser,
// so it can be run after each build while trimming imports. The noModule polyfill chunk is left out (Chromium
// never fetches it).
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import { createRequire } from 'node:module';

const root = process.cwd();
const next = path.join(root, '.next');
const route = '/embed/[passId]/page';
const dir = path.join(next, 'server/app/embed/[passId]');

const MARKERS = [
  ['zod', /ZodError|"Invalid input/],
  ['ml-matrix', /EigenvalueDecomposition|Matrix must be/],
  ['jsep (formula parser)', /jsep|Unexpected "/],
  ['model schema', /is reserved \(a function or constant name\)/],
  ['@stdlib math', /invalid double notation|rempio2/i],
  ['engine sampling', /xor4096|uniform over the tolerance band/],
  ['d3 / charts', /This browser cannot draw on a canvas|scaleLinear|d3/],
  ['results / headline / cautions', /Chance of exceeding the budget|The engine stopped without a message/],
  ['iframe-resizer (child)', /iFrameResizer\.contentWindow|\[iFrameSizer\]/],
  ['react-dom', /react-dom|__reactContainer|Minified React error/],
  ['next router', /invariant global layout router not mounted|NEXT_REDIRECT|next-router-state-tree/],
  ['turbopack runtime', /Worker entrypoint must be loaded|TURBOPACK_CHUNK_LISTS|TURBOPACK_WORKER_LOCATION/],
];

globalThis.self = globalThis;
createRequire(import.meta.url)(path.join(dir, 'page_client-reference-manifest.js'));
const manifest = globalThis.__RSC_MANIFEST[route];
const build = JSON.parse(fs.readFileSync(path.join(dir, 'page/build-manifest.json'), 'utf8'));
const pageChunks = new Set(build.rootMainFiles);
for (const files of Object.values(manifest.entryJSFiles)) for (const f of files) pageChunks.add(f);

// Follow chunk names referenced from loaded chunks: a web worker's bootstrap lists the worker's chunks; any other
// reference is a chunk loaded on demand (dynamic import).
const seen = new Map();
const workerChunks = new Set();
const workerAll = new Set();
const queue = [...pageChunks];
while (queue.length) {
  const f = queue.shift();
  if (seen.has(f)) continue;
  const src = fs.readFileSync(path.join(next, f), 'utf8');
  seen.set(f, { via: pageChunks.has(f) ? 'page' : workerChunks.has(f) ? 'worker' : 'lazy', src });
  for (const w of src.matchAll(/"(static\/chunks\/turbopack-worker-[\w.-]+\.js)",\[([^\]]*)\]/g)) {
    workerChunks.add(w[1]);
    for (const c of w[2].matchAll(/static\/chunks\/[\w.-]+\.js/g)) {
      workerAll.add(c[0]);
      if (!pageChunks.has(c[0])) workerChunks.add(c[0]);
    }
  }
  for (const m of src.matchAll(/static\/chunks\/[\w.-]+\.js/g)) if (!seen.has(m[0])) queue.push(m[0]);
}

const rows = [...seen].map(([file, { via, src }]) => ({
  file,
  loadedBy: via === 'page' && workerAll.has(file) ? 'both' : via,
  bytes: Buffer.byteLength(src),
  gzip: zlib.gzipSync(src, { level: 6 }).length,
  holds: MARKERS.filter(([, re]) => re.test(src)).map(([name]) => name),
}));
rows.sort((a, b) => b.gzip - a.gzip);
const total = rows.reduce((s, r) => s + r.gzip, 0);
const upFront = rows.filter((r) => r.loadedBy !== 'lazy').reduce((s, r) => s + r.gzip, 0);
const report = { route, files: rows.length, gzipBytes: total, gzipKiB: +(total / 1024).toFixed(1), byFile: rows };
if (!process.argv.includes('--json')) {
  for (const r of rows) console.log(`${(r.gzip / 1024).toFixed(1).padStart(6)} KiB gz ${(r.bytes / 1024).toFixed(1).padStart(7)} KiB  ${r.loadedBy.padEnd(6)} ${r.file}  ${r.holds.join(', ')}`);
  console.log(`embed page JavaScript loaded with the page and its workers: ${(upFront / 1024).toFixed(1)} KiB gzip (${(upFront / 1000).toFixed(1)} kB)`);
  console.log(
    `  on demand (dynamic import, fetched only when used): ${((total - upFront) / 1024).toFixed(1)} KiB in all: the iframe resizer when framed, the formula parser and formula-only math for a formula model, the correlation code for a correlated model, the comparison view when a view is pinned, chart downloads on click, the model schema only to explain a model that fails`,
  );
  console.log(`  every chunk the page can reach: ${report.gzipKiB} KiB gzip in ${rows.length} files`);
}
console.log(JSON.stringify({ embedWeight: { gzipBytes: total, gzipKiB: report.gzipKiB, files: rows.length, upFrontGzipBytes: upFront, upFrontGzipKiB: +(upFront / 1024).toFixed(1), onDemandGzipBytes: total - upFront } }));
