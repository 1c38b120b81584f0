/**
 * Test support has one home: nothing under src/ outside src/lib/server/testing/ is named like a test
 * helper. A branch that adds `foo.spec-util.ts` or `foo-access-rows.ts` elsewhere fails here, naming
 * the file to move.
 */
import { readdirSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '../../../..');
const home = 'src/lib/server/testing/';

function walk(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
		e.isDirectory() ? walk(join(dir, e.name)) : [relative(root, join(dir, e.name))]
	);
}

const helperName =
	/(\.spec-util\.ts|access-rows\.ts|test-factory\.ts|test-build\.ts|fixtures\.ts)$/;

describe('test support lives in one place', () => {
	it('finds the helpers it guards', () => {
		expect(walk(join(root, home)).some((f) => f.endsWith('-access-rows.ts'))).toBe(true);
	});

	it('no helper-named file sits outside src/lib/server/testing/', () => {
		const stray = walk(join(root, 'src')).filter((f) => helperName.test(f) && !f.startsWith(home));
		expect(stray).toEqual([]);
	});
});
