// Prints one closing line for the whole run, "slateroom: N passed, N failed", from the JSON
// reports of Vitest and Playwright that scripts/test.sh asks them to write.
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

const dir = process.argv[2];
let passed = 0;
let failed = 0;
let skipped = 0;
// A file that fails outside any test (its set-up throws, it cannot be loaded) counts no failed
// test, so it is counted on its own: the closing line must never read "0 failed" when it did.
let brokenFiles = 0;
for (const name of ['vitest.json', 'outage.json']) {
	const file = join(dir, name);
	if (!existsSync(file)) continue;
	const r = JSON.parse(readFileSync(file, 'utf8'));
	passed += r.numPassedTests ?? 0;
	failed += r.numFailedTests ?? 0;
	skipped += (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0);
	for (const f of r.testResults ?? []) {
		if (f.status === 'failed' && !(f.assertionResults ?? []).some((a) => a.status === 'failed')) brokenFiles += 1;
	}
}
const pw = join(dir, 'playwright.json');
if (existsSync(pw)) {
	const s = JSON.parse(readFileSync(pw, 'utf8')).stats ?? {};
	passed += s.expected ?? 0;
	failed += (s.unexpected ?? 0) + (s.flaky ?? 0);
	skipped += s.skipped ?? 0;
	brokenFiles += (JSON.parse(readFileSync(pw, 'utf8')).errors ?? []).length;
}
const broken = brokenFiles ? `, ${brokenFiles} file${brokenFiles === 1 ? '' : 's'} failed outside any test` : '';
console.log(`slateroom: ${passed} passed, ${failed} failed${broken}${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(failed > 0 || brokenFiles > 0 || passed === 0 ? 1 : 0);
