/**
 * Where tests may write. Tests create and delete rows freely, so they refuse to run against a
 * database whose name does not say it is for tests (the development database is `interstice`).
 */
import { config } from '../config';

export function testDatabaseUrl(): string {
	const url = config.databaseUrl;
	const name = new URL(url).pathname.replace(/^\//, '');
	if (!/test/i.test(name)) {
		throw new Error(
			`Tests write to the database; "${name}" does not look like a test database. ` +
				'Run them through `npm test`, or set DATABASE_URL=postgres://postgres@127.0.0.1:54329/interstice_test (migrated and seeded).'
		);
	}
	return url;
}
