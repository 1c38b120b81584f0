import { drizzle } from 'drizzle-orm/postgres-js';
import { migrate } from 'drizzle-orm/postgres-js/migrator';
import postgres from 'postgres';
import { config } from '../config';

/** Applies the committed SQL migrations in drizzle/. Safe to run on every start. */
export async function runMigrations(url = config.databaseUrl, folder = 'drizzle') {
	const client = postgres(url, { max: 1, onnotice: () => {} });
	try {
		await migrate(drizzle(client), { migrationsFolder: folder });
	} finally {
		await client.end({ timeout: 5 });
	}
}
