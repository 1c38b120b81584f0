/** Connection defaults shared by scripts and the app; every value can be overridden by environment. */
export function databaseUrl(): string {
	if (process.env.DATABASE_URL) return process.env.DATABASE_URL;
	const port = process.env.PGPORT ?? '54329';
	const name = process.env.PGDATABASE ?? 'interstice';
	return `postgres://postgres@127.0.0.1:${port}/${name}`;
}
