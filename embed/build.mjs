// Builds the integrator's loader (embed/loader.ts) into public/embed/stochos-embed.js. Runs before `next build`.
import { build } from 'esbuild';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

// Only the MIT release may be bundled: 4.4.3, 4.4.4 and 5.x are GPL-3.0.
const pkg = JSON.parse(fs.readFileSync(path.join(root, 'node_modules/iframe-resizer/package.json'), 'utf8'));
if (pkg.version !== '4.4.5' || pkg.license !== 'MIT') {
  console.error(`embed/build.mjs: iframe-resizer must be 4.4.5 (MIT); found ${pkg.version} (${pkg.license}).`);
  process.exit(1);
}

const outfile = path.join(root, 'public/embed/stochos-embed.js');
const result = await build({
  absWorkingDir: root,
  entryPoints: ['embed/loader.ts'],
  outfile,
  bundle: true,
  minify: true,
  format: 'iife',
  target: ['es2018'],
  // The library registers with an AMD loader when it finds one; on a host page that would clash with the
  // page's own modules, so the bundle never looks for `define`.
  define: { define: 'undefined' },
  // Its upgrade banner would land in the host page's console.
  pure: ['console.info'],
  legalComments: 'none',
  banner: { js: '/*! Stochos embed loader. Includes iframe-resizer 4.4.5, (c) David J. Bradshaw, MIT License. */' },
  metafile: true,
  logLevel: 'warning',
});
const bytes = fs.statSync(outfile).size;
console.log(`embed loader: ${path.relative(root, outfile)} (${(bytes / 1024).toFixed(1)} KiB, ${Object.keys(result.metafile.inputs).length} inputs)`);
