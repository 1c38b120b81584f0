/**
 * Server configuration from the environment, with defaults that work on a developer machine.
 * Read through this module only, so scripts (run outside SvelteKit) and the app agree.
 */
/** The local payment fake's keys: fine on a developer machine, refused in production mode. */
export const BUILT_IN = { secretKey: 'sk_test_local', webhookSecret: 'whsec_local' } as const;

/** Every secret value that ships with the code (the defaults above, .env.example's). */
export const BUILT_IN_SECRETS: readonly string[] = [BUILT_IN.secretKey, BUILT_IN.webhookSecret];

const env = (name: string, fallback: string) => {
	const value = process.env[name];
	return value === undefined || value === '' ? fallback : value;
};

/** A setting: its variable, the value when it is unset or empty, and how to read the text. */
type Setting = readonly [name: string, fallback: string, parse?: (value: string) => unknown];
type SettingValue<S> = S extends readonly [string, string, (value: string) => infer V] ? V : string;

/**
 * An object with one read-only property per setting, read from the environment each time it is
 * read (a test or script that sets a variable later sees the new value).
 */
function settings<T extends Record<string, Setting>>(
	table: T
): { readonly [K in keyof T]: SettingValue<T[K]> } {
	const out = {};
	for (const [key, [name, fallback, parse]] of Object.entries(table)) {
		Object.defineProperty(out, key, {
			enumerable: true,
			get: () => (parse ? parse(env(name, fallback)) : env(name, fallback))
		});
	}
	return out as { readonly [K in keyof T]: SettingValue<T[K]> };
}

export const config = {
	get databaseUrl() {
		if (process.env.DATABASE_URL) return process.env.DATABASE_URL;
		return `postgres://postgres@127.0.0.1:${env('PGPORT', '54329')}/${env('PGDATABASE', 'interstice')}`;
	},
	get origin() {
		return env('ORIGIN', 'http://127.0.0.1:3000');
	},
	/**
	 * Production mode: NODE_ENV=production. The server then refuses to start on unsafe settings
	 * (productionProblems), accepts no built-in secret, sets Secure cookies and has no development
	 * tools. `npm start` and the test harness run `node build` without it.
	 */
	get production() {
		return process.env.NODE_ENV === 'production';
	},
	smtp: settings({
		host: ['SMTP_HOST', '127.0.0.1'],
		port: ['SMTP_PORT', '2525', Number],
		user: ['SMTP_USER', ''],
		pass: ['SMTP_PASS', ''],
		from: ['MAIL_FROM', 'Interstice <no-reply@interstice.test>']
	}),
	/** MAIL_DISABLED=1: no mail is sent (each one is logged instead); for a deployment without mail. */
	get mailDisabled() {
		return process.env.MAIL_DISABLED === '1';
	},
	get mailCatcherUrl() {
		return env('MAIL_CATCHER_URL', 'http://127.0.0.1:2526');
	},
	/**
	 * Development tools (the no-op endpoint that bench:http compares against, the bench token's
	 * bucket): off unless the start and test scripts turn them on, and never in production mode.
	 */
	get devTools() {
		if (this.production) return false;
		return env('INTERSTICE_DEV_TOOLS', process.env.NODE_ENV === 'development' ? '1' : '0') === '1';
	},
	payments: settings({
		secretKey: ['PAYMENTS_SECRET_KEY', BUILT_IN.secretKey],
		webhookSecret: ['PAYMENTS_WEBHOOK_SECRET', BUILT_IN.webhookSecret],
		host: ['PAYMENTS_API_HOST', '127.0.0.1'],
		port: ['PAYMENTS_API_PORT', '12111', Number],
		protocol: ['PAYMENTS_API_PROTOCOL', 'http', (v) => v as 'http' | 'https']
	}),
	get storageDir() {
		return env('STORAGE_DIR', '.data/storage');
	},
	/**
	 * Where photo files live: 'disk' (STORAGE_DIR on this machine) or 's3' (an S3-compatible
	 * bucket, the same settings a hosted provider takes; several app processes or machines share it).
	 */
	storage: settings({
		driver: [
			'STORAGE_DRIVER',
			'disk',
			(d): 'disk' | 's3' => {
				if (d !== 'disk' && d !== 's3') {
					throw new Error(`STORAGE_DRIVER must be "disk" or "s3", not "${d}".`);
				}
				return d;
			}
		],
		endpoint: ['S3_ENDPOINT', 'http://127.0.0.1:4569'],
		bucket: ['S3_BUCKET', 'interstice-photos'],
		region: ['S3_REGION', 'us-east-1'],
		accessKeyId: ['S3_ACCESS_KEY_ID', 'S3RVER'],
		secretAccessKey: ['S3_SECRET_ACCESS_KEY', 'S3RVER'],
		/** Bucket in the path (http://host/bucket/key), as local and most self-hosted stores want. */
		forcePathStyle: ['S3_FORCE_PATH_STYLE', '1', (v) => v !== '0']
	})
};

const isSet = (name: string) => (process.env[name] ?? '').trim() !== '';

/**
 * What keeps a production-mode server from starting, one line per setting (empty outside
 * production mode, and when everything is in place). Read by the server's init hook.
 */
export function productionProblems(): string[] {
	if (!config.production) return [];
	const problems: string[] = [];
	for (const [name, what] of [
		['PAYMENTS_SECRET_KEY', 'secret API key'],
		['PAYMENTS_WEBHOOK_SECRET', 'webhook signing secret']
	] as const) {
		if (!isSet(name)) {
			problems.push(`${name} is not set: the payment service's ${what} is required.`);
		} else if (BUILT_IN_SECRETS.includes(process.env[name]!.trim())) {
			problems.push(`${name} is the built-in development value; set the real one.`);
		}
	}
	if (!isSet('ORIGIN')) {
		problems.push(
			'ORIGIN is not set: the public address of the app (https://…), for links in mail and the form-post check.'
		);
	}
	if (!config.mailDisabled) {
		for (const name of ['SMTP_HOST', 'SMTP_PORT', 'MAIL_FROM']) {
			if (!isSet(name)) {
				problems.push(
					`${name} is not set: set the mail settings, or MAIL_DISABLED=1 to run without mail.`
				);
			}
		}
	}
	for (const name of ['INTERSTICE_DEV_TOOLS', 'INTERSTICE_BENCH_TOKEN']) {
		if (isSet(name)) {
			problems.push(
				`${name} is set: development tools are not allowed in production mode; unset it.`
			);
		}
	}
	return problems;
}
