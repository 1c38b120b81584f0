// Adds up the test runners' JSON reports and the pipeline steps into one closing line.
import { existsSync, readFileSync } from 'node:fs';

const [dir, stepsPass, stepsFail, vitestRc, pwRc, seconds] = process.argv.slice(2);
let passed = Number(stepsPass);
let failed = Number(stepsFail);
let skipped = 0;
const lines = [];

const vitestFile = `${dir}/vitest.json`;
if (existsSync(vitestFile)) {
	const v = JSON.parse(readFileSync(vitestFile, 'utf8'));
	passed += v.numPassedTests;
	failed += v.numFailedTests;
	skipped += v.numPendingTests + (v.numTodoTests ?? 0);
	// A suite that failed to load has no tests but is a failure.
	const brokenSuites = v.testResults.filter(
		(r) => r.status === 'failed' && r.assertionResults.length === 0
	).length;
	failed += brokenSuites;
	lines.push(`vitest: ${v.numPassedTests} passed, ${v.numFailedTests + brokenSuites} failed`);
} else if (vitestRc !== '0') {
	failed += 1;
	lines.push('vitest: did not report');
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
for (const l of lines) console.log(l);
console.log(`(${seconds} s)`);
console.log(`${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(failed > 0 ? 1 : 0);
