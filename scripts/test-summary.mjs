// Prints the closing summary of `npm test`: every check step (lint, type-checks, build) and every
// vitest test counted once, ending with the plain line `N passed, N failed` that CI reads.
// Usage: node scripts/test-summary.mjs <vitest-json-file> <vitest exit code> <step>=<exit code> ...
// A test file that failed to load has no tests of its own; it counts as one failure so it cannot hide,
// and so does a vitest run that failed (unhandled errors, a failed global setup) with no failed test.
// Exits 1 when anything failed.
import { existsSync, readFileSync } from 'node:fs';

const [jsonFile, vitestExit, ...stepArgs] = process.argv.slice(2);
let passed = 0;
let failed = 0;
let skipped = 0;

for (const arg of stepArgs) {
  const [name, code] = arg.split('=');
  const ok = code === '0';
  if (ok) passed += 1;
  else failed += 1;
  console.log(`  ${ok ? 'ok    ' : 'FAILED'}  ${name}`);
}

if (jsonFile && existsSync(jsonFile)) {
  const report = JSON.parse(readFileSync(jsonFile, 'utf8'));
  passed += report.numPassedTests;
  failed += report.numFailedTests;
  skipped += report.numPendingTests + report.numTodoTests;
  const brokenFiles = report.testResults.filter(
    (file) => file.status === 'failed' && !file.assertionResults.some((test) => test.status === 'failed'),
  );
  for (const file of brokenFiles) {
    console.log(`  FAILED  ${file.name}: ${String(file.message || 'failed to run').split('\n')[0]}`);
  }
  failed += brokenFiles.length;
  if (vitestExit !== '0' && report.numFailedTests === 0 && brokenFiles.length === 0) {
    console.log(`  FAILED  vitest exited ${vitestExit} (unhandled errors or a failed setup: see above)`);
    failed += 1;
  }
  console.log(
    `  tests: ${report.numPassedTests} passed, ${report.numFailedTests} failed, ` +
      `${report.numPendingTests + report.numTodoTests} skipped in ${report.testResults.length} files`,
  );
} else {
  console.log('  FAILED  vitest wrote no results (it did not run or crashed)');
  failed += 1;
}

console.log(`${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exitCode = failed > 0 ? 1 : 0;
