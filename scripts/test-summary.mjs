// Prints one closing line for the whole run, "slateroom: N passed, N failed", from the JSON
// reports of Vitest and Playwright that scripts/test.sh asks them to write.
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

const dir = process.argv[2];
let passed = 0;
let failed = 0;
let skipped = 0;
for (const name of ['vitest.json', 'outage.json']) {
	const file = join(dir, name);
	if (!existsSync(file)) continue;
	const r = JSON.parse(readFileSync(file, 'utf8'));
	passed += r.numPassedTests ?? 0;
	failed += r.numFailedTests ?? 0;
	skipped += (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0);
}
const pw = join(dir, 'playwright.json');
if (existsSync(pw)) {
	const s = JSON.parse(readFileSync(pw, 'utf8')).stats ?? {};
	passed += s.expected ?? 0;
	failed += (s.unexpected ?? 0) + (s.flaky ?? 0);
	skipped += s.skipped ?? 0;
}
console.log(`slateroom: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(failed > 0 || passed === 0 ? 1 : 0);
