/**
 * Vitest wiring: one app process per test file (starting one costs about a second), closed with
 * the file's database pool afterwards.
 */
import { afterAll, beforeAll } from 'vitest';
import { closeDb } from '../db';
import { Client, startApp, type App, type StartOptions } from './app-server';

export function useApp(opts: StartOptions = {}) {
	let app: App | undefined;
	beforeAll(async () => {
		app = await startApp(opts);
	});
	afterAll(async () => {
		await app?.stop();
		await closeDb();
	});
	const current = () => {
		if (!app) throw new Error('The app is not started yet (use it inside tests or hooks).');
		return app;
	};
	return {
		get app() {
			return current();
		},
		get baseURL() {
			return current().baseURL;
		},
		/** A new client with an empty cookie jar and, unless given, a loopback address of its own. */
		client(opts: { address?: string; session?: string } = {}) {
			const c = new Client(current().baseURL, { address: opts.address });
			if (opts.session) c.useSession(opts.session);
			return c;
		}
	};
}
