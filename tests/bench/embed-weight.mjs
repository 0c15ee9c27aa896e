// What the embed page's JavaScript is made of, from the production build (`npm run build` first):
//   node tests/bench/embed-weight.mjs [--json] [--modules]
// --modules: the bytes of each source module, summed by area (React, Next's router, the engine, the charts, ...), and
// any module that ships in more than one chunk. It reads the browser source maps, which a build writes only when asked:
//   STOCHOS_BROWSER_SOURCE_MAPS=1 npm run build && node tests/bench/embed-weight.mjs --modules
// Lists every chunk the /embed/[passId] page loads and every chunk its web worker loads (followed through the
// worker bootstrap), with raw and gzip sizes and what each holds, recognised by strings the libraries carry.
// The Chromium check tests/e2e/embed-perf.spec.ts measures the same thing on the wire; this one needs no browser,
// so it can be run after each build while trimming imports. The noModule polyfill chunk is left out (Chromium
// never fetches it).
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';

const root = process.cwd();
const next = path.join(root, '.next');
// The embed frame is a Pages Router page (DEVELOPERS.md, "The embed frame"): it loads the chunks of _app and of its
// own entry.
const route = '/embed/[passId]';

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

const build = JSON.parse(fs.readFileSync(path.join(next, 'build-manifest.json'), 'utf8'));
const pageChunks = new Set([...build.pages['/_app'], ...build.pages[route]].filter((f) => f.endsWith('.js')));

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

// Where each generated character comes from, by the chunk's source map (index maps with sections, as Turbopack writes
// them, or plain ones): [source, text] pieces. Null when the build wrote no map.
const B64 = Object.fromEntries([...'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/'].map((c, i) => [c, i]));
function vlq(str) {
  const out = [];
  let v = 0;
  let shift = 0;
  for (const ch of str) {
    const d = B64[ch];
    v += (d & 31) << shift;
    if (d & 32) shift += 5;
    else {
      out.push(v & 1 ? -(v >>> 1) : v >>> 1);
      v = 0;
      shift = 0;
    }
  }
  return out;
}
function sourcePieces(file, src) {
  const ref = /sourceMappingURL=(\S+)\s*$/.exec(src);
  const mapFile = ref && path.join(path.dirname(path.join(next, file)), ref[1]);
  if (!mapFile || !fs.existsSync(mapFile)) return null;
  const map = JSON.parse(fs.readFileSync(mapFile, 'utf8'));
  const lineStart = [0];
  for (let i = 0; i < src.length; i++) if (src.charCodeAt(i) === 10) lineStart.push(i + 1);
  const marks = [];
  const read = (m, line0, col0) => {
    let src0 = 0;
    m.mappings.split(';').forEach((line, li) => {
      let col = 0;
      for (const seg of line.split(',')) {
        if (!seg) continue;
        const f = vlq(seg);
        col += f[0];
        if (f.length > 1) src0 += f[1];
        const at = lineStart[line0 + li] + (li === 0 ? col0 : 0) + col;
        marks.push([at, f.length > 1 ? m.sources[src0] : null]);
      }
    });
  };
  if (map.sections) for (const s of map.sections) read(s.map, s.offset.line, s.offset.column);
  else read(map, 0, 0);
  marks.sort((a, b) => a[0] - b[0]);
  const text = new Map();
  marks.forEach(([at, source], i) => {
    const name = (source ?? '(chunk wrapper)').replace(/^turbopack:\/\/\/\[project\]\//, '');
    text.set(name, (text.get(name) ?? '') + src.slice(at, i + 1 < marks.length ? marks[i + 1][0] : src.length));
  });
  return text;
}
// A module's share of its chunk's gzip size: its own text compressed alone, scaled so a chunk's modules add up to it.
function moduleShares(src, gzip, pieces) {
  const alone = [...pieces].map(([name, text]) => [name, zlib.gzipSync(text, { level: 6 }).length]);
  const sum = alone.reduce((s, [, g]) => s + g, 0);
  return alone.map(([name, g]) => ({ name, gzip: (g * gzip) / sum }));
}
const AREAS = [
  ['React (react-dom, react, its RSC client, scheduler)', /compiled\/(react|react-dom|react-server-dom-turbopack|scheduler)\//],
  ['Next router and runtime', /node_modules\/next\/|\[turbopack|@swc\/helpers/],
  ['engine (lib/core/engine)', /^lib\/core\/engine\//],
  ['engine maths (@stdlib, seedrandom)', /node_modules\/(@stdlib|seedrandom)\//],
  ['charts (lib/core/charts, components/charts, d3)', /^(lib\/core\/charts|components\/charts)\/|node_modules\/d3-/],
  ['results (headline, cautions, simulation)', /^(lib\/core\/results|lib\/core\/cautions|components\/results)/],
  ['widget and embed page', /^(components\/(widget|embed|snapshots)|lib\/core\/widget|lib\/client)\//],
  ['shared UI and error pages', /^(components\/(ui|segments)|app)\//],
];
const areaOf = (name) => AREAS.find(([, re]) => re.test(name))?.[0] ?? (name.startsWith('node_modules/') ? name.split('/').slice(1, name[13] === '@' ? 3 : 2).join('/') : 'other');

const rows = [...seen].map(([file, { via, src }]) => ({
  file,
  loadedBy: via === 'page' && workerAll.has(file) ? 'both' : via,
  bytes: Buffer.byteLength(src),
  gzip: zlib.gzipSync(src, { level: 6 }).length,
  holds: MARKERS.filter(([, re]) => re.test(src)).map(([name]) => name),
}));
rows.sort((a, b) => b.gzip - a.gzip);

if (process.argv.includes('--modules')) {
  const byModule = new Map();
  let mapped = 0;
  for (const r of rows) {
    if (r.loadedBy === 'lazy') continue;
    const src = seen.get(r.file).src;
    const pieces = sourcePieces(r.file, src);
    if (!pieces) continue;
    mapped++;
    for (const m of moduleShares(src, r.gzip, pieces)) {
      const e = byModule.get(m.name) ?? { gzip: 0, chunks: [] };
      e.gzip += m.gzip;
      e.chunks.push(r.file);
      byModule.set(m.name, e);
    }
  }
  if (!mapped) {
    console.log('No source maps in this build: run `STOCHOS_BROWSER_SOURCE_MAPS=1 npm run build` first.');
  } else {
    const areas = new Map();
    for (const [name, e] of byModule) areas.set(areaOf(name), (areas.get(areaOf(name)) ?? 0) + e.gzip);
    console.log('What loads with the page and its workers, by area (gzip; a module counts for its share of its chunk):');
    for (const [a, g] of [...areas].sort((x, y) => y[1] - x[1])) console.log(`${(g / 1024).toFixed(1).padStart(6)} KiB  ${a}`);
    console.log('Largest modules:');
    for (const [name, e] of [...byModule].sort((x, y) => y[1].gzip - x[1].gzip).slice(0, 40)) console.log(`${(e.gzip / 1024).toFixed(2).padStart(7)} KiB  ${name}`);
    const twice = [...byModule].filter(([name, e]) => e.chunks.length > 1 && name !== '(chunk wrapper)');
    console.log(twice.length ? `In more than one chunk (fetched twice): ${twice.map(([n, e]) => `${n} (${e.chunks.length})`).join(', ')}` : 'No module ships in more than one chunk.');
    console.log('');
  }
}

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
