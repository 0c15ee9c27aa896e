// Prints one closing line over vitest and Playwright JSON reports: "N passed, N failed".
//   node tests/support/summarise.mjs                       vitest.json and playwright.json (npm test)
//   node tests/support/summarise.mjs --vitest a.json ...   the reports named (npm run test:postgres)
import fs from 'node:fs';

const args = process.argv.slice(2);
const named = { vitest: [], playwright: [] };
for (let i = 0; i < args.length; i += 2) {
  const kind = args[i]?.replace(/^--/, '');
  if (!(kind in named) || !args[i + 1]) {
    console.error(`usage: summarise.mjs [--vitest report.json]... [--playwright report.json]...`);
    process.exit(2);
  }
  named[kind].push(args[i + 1]);
}
if (!args.length) {
  named.vitest.push('.data/test-reports/vitest.json');
  named.playwright.push('.data/test-reports/playwright.json');
}

let passed = 0;
let failed = 0;
let skipped = 0;
for (const file of named.vitest) {
  try {
    const v = JSON.parse(fs.readFileSync(file, 'utf8'));
    passed += v.numPassedTests;
    failed += v.numFailedTests;
    skipped += v.numPendingTests + (v.numTodoTests ?? 0);
    // A file that failed before its tests ran (a hook, an import) counts as a failure too.
    failed += (v.testResults ?? []).filter((f) => f.status === 'failed' && !(f.assertionResults ?? []).some((a) => a.status === 'failed')).length;
  } catch {
    failed += 1;
    console.error(`vitest report missing: ${file}`);
  }
}
for (const file of named.playwright) {
  try {
    const p = JSON.parse(fs.readFileSync(file, 'utf8'));
    passed += p.stats.expected;
    failed += p.stats.unexpected + (p.stats.flaky ?? 0);
    skipped += p.stats.skipped;
  } catch {
    failed += 1;
    console.error(`Playwright report missing: ${file}`);
  }
}
console.log(`\n${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
