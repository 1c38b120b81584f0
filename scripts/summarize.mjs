// Adds up the test runners' JSON reports and the pipeline steps into one closing line.
import { existsSync, readFileSync } from 'node:fs';

const [dir, stepsPass, stepsFail, vitestRc, pwRc, seconds] = process.argv.slice(2);
let passed = Number(stepsPass);
let failed = Number(stepsFail);
let skipped = 0;
const lines = [];

// One JSON report per vitest line (scripts/test.sh runs the engine and services groups side by side).
const vitestFiles = ['engine', 'services'].map((g) => [g, `${dir}/vitest-${g}.json`]);
for (const [group, file] of vitestFiles) {
	if (!existsSync(file)) continue;
	const v = JSON.parse(readFileSync(file, 'utf8'));
	passed += v.numPassedTests;
	failed += v.numFailedTests;
	skipped += v.numPendingTests + (v.numTodoTests ?? 0);
	// A suite that failed to load has no tests but is a failure.
	const brokenSuites = v.testResults.filter(
		(r) => r.status === 'failed' && r.assertionResults.length === 0
	).length;
	failed += brokenSuites;
	lines.push(
		`vitest (${group}): ${v.numPassedTests} passed, ${v.numFailedTests + brokenSuites} failed`
	);
}
const missing = vitestFiles.filter(([, f]) => !existsSync(f)).map(([g]) => g);
if (missing.length && vitestRc !== '0') {
	failed += 1;
	lines.push(`vitest (${missing.join(', ')}): did not report`);
}

const pwFile = `${dir}/playwright.json`;
if (existsSync(pwFile)) {
	const p = JSON.parse(readFileSync(pwFile, 'utf8'));
	const s = p.stats;
	passed += s.expected;
	failed += s.unexpected + (s.flaky ?? 0);
	skipped += s.skipped;
	if (p.errors?.length) failed += p.errors.length;
	lines.push(`playwright: ${s.expected} passed, ${s.unexpected + (s.flaky ?? 0)} failed`);
} else if (pwRc !== '0') {
	failed += 1;
	lines.push('playwright: did not report');
}

if (existsSync(`${dir}/steps`)) process.stdout.write(readFileSync(`${dir}/steps`, 'utf8'));
if (existsSync(`${dir}/timings`)) process.stdout.write(readFileSync(`${dir}/timings`, 'utf8'));
for (const l of lines) console.log(l);
console.log(`(${seconds} s)`);
console.log(`${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(failed > 0 ? 1 : 0);
