/**
 * Server configuration from the environment, with defaults that work on a developer machine.
 * Read through this module only, so scripts (run outside SvelteKit) and the app agree.
 */
const env = (name: string, fallback: string) => {
	const value = process.env[name];
	return value === undefined || value === '' ? fallback : value;
};

export const config = {
	get databaseUrl() {
		if (process.env.DATABASE_URL) return process.env.DATABASE_URL;
		return `postgres://postgres@127.0.0.1:${env('PGPORT', '54329')}/${env('PGDATABASE', 'interstice')}`;
	},
	get origin() {
		return env('ORIGIN', 'http://127.0.0.1:3000');
	},
	get production() {
		return process.env.NODE_ENV === 'production' && !process.env.INTERSTICE_INSECURE_COOKIES;
	},
	smtp: {
		get host() {
			return env('SMTP_HOST', '127.0.0.1');
		},
		get port() {
			return Number(env('SMTP_PORT', '2525'));
		},
		get user() {
			return env('SMTP_USER', '');
		},
		get pass() {
			return env('SMTP_PASS', '');
		},
		get from() {
			return env('MAIL_FROM', 'Interstice <no-reply@interstice.test>');
		}
	},
	get mailCatcherUrl() {
		return env('MAIL_CATCHER_URL', 'http://127.0.0.1:2526');
	},
	/** Development pages (the outgoing-mail viewer): off unless the start and test scripts turn them on. */
	get devTools() {
		return env('INTERSTICE_DEV_TOOLS', process.env.NODE_ENV === 'development' ? '1' : '0') === '1';
	},
	payments: {
		get secretKey() {
			return env('PAYMENTS_SECRET_KEY', 'sk_test_local');
		},
		get webhookSecret() {
			return env('PAYMENTS_WEBHOOK_SECRET', 'whsec_local');
		},
		get host() {
			return env('PAYMENTS_API_HOST', '127.0.0.1');
		},
		get port() {
			return Number(env('PAYMENTS_API_PORT', '12111'));
		},
		get protocol() {
			return env('PAYMENTS_API_PROTOCOL', 'http') as 'http' | 'https';
		}
	},
	get storageDir() {
		return env('STORAGE_DIR', '.data/storage');
	}
};
