import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import { config } from '../config';
import * as schema from './schema';

function connect() {
	const client = postgres(config.databaseUrl, { max: 10, onnotice: () => {} });
	return { client, db: drizzle(client, { schema }) };
}

type Connection = ReturnType<typeof connect>;
let connection: Connection | undefined;

/** One pool per process; the server holds no other state of its own. */
export function getConnection(): Connection {
	connection ??= connect();
	return connection;
}

export const db = new Proxy({} as Connection['db'], {
	get: (_t, prop) => Reflect.get(getConnection().db, prop)
});

export type Db = Connection['db'];
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
/** Where a query runs: the pool, or a transaction the caller holds. */
export type Runner = typeof db | Tx;

export async function closeDb() {
	if (!connection) return;
	const c = connection;
	connection = undefined;
	await c.client.end({ timeout: 5 });
}

export { schema };
