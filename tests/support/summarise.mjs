// Prints one closing line over vitest and Playwright: "N passed, N failed".
import fs from 'node:fs';

let passed = 0;
let failed = 0;
let skipped = 0;
try {
  const v = JSON.parse(fs.readFileSync('.data/test-reports/vitest.json', 'utf8'));
  passed += v.numPassedTests;
  failed += v.numFailedTests;
  skipped += v.numPendingTests + (v.numTodoTests ?? 0);
} catch {
  failed += 1;
  console.error('vitest report missing');
}
try {
  const p = JSON.parse(fs.readFileSync('.data/test-reports/playwright.json', 'utf8'));
  passed += p.stats.expected;
  failed += p.stats.unexpected + (p.stats.flaky ?? 0);
  skipped += p.stats.skipped;
} catch {
  failed += 1;
  console.error('Playwright report missing');
}
console.log(`\n${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
