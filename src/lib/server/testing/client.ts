/**
 * A small HTTP client with a cookie jar, for tests against the running app. It never follows
 * redirects, so a test reads the status and `location` itself.
 */
import { request, type IncomingHttpHeaders } from 'node:http';
import { randomInt } from 'node:crypto';
import * as devalue from 'devalue';

export type Fields = Record<string, string | number | boolean | null | undefined>;

export class TestResponse {
	constructor(
		readonly status: number,
		readonly headers: IncomingHttpHeaders,
		readonly text: string
	) {}

	get location(): string | null {
		const l = this.headers.location;
		return typeof l === 'string' ? l : null;
	}

	header(name: string): string | undefined {
		const v = this.headers[name.toLowerCase()];
		return Array.isArray(v) ? v.join(', ') : v;
	}

	json<T = unknown>(): T {
		return JSON.parse(this.text) as T;
	}
}

/**
 * What a form action answers to `use:enhance` (SvelteKit's ActionResult), with `data` decoded.
 * `status` is the action's own status: SvelteKit sends failures and redirects with HTTP 200 and the
 * real status in the body.
 */
export type ActionResult = {
	type: 'success' | 'failure' | 'redirect' | 'error';
	status: number;
	// eslint-disable-next-line @typescript-eslint/no-explicit-any -- each action returns its own shape
	data?: any;
	location?: string;
	error?: { message: string };
};

type StoredCookie = { value: string; attributes: string };

/**
 * A loopback address of its own for each client (127.1.0.1 to 127.254.255.254; the browser in the
 * Playwright tests comes from 127.0.0.1). The app limits sign-in and reset attempts per client
 * address, so separate clients behave like separate people on separate networks; pass the same
 * `address` to two clients to make them one.
 */
export function randomLoopback(): string {
	return `127.${randomInt(1, 255)}.${randomInt(0, 256)}.${randomInt(1, 255)}`;
}

export class Client {
	readonly address: string;
	private jar = new Map<string, StoredCookie>();
	private lastSet = new Map<string, string>();

	constructor(
		readonly baseURL: string,
		opts: { address?: string } = {}
	) {
		this.address = opts.address ?? randomLoopback();
	}

	/** The current value of a cookie, or undefined once it was cleared or expired. */
	cookie(name: string): string | undefined {
		return this.jar.get(name)?.value;
	}

	/** The attributes (`Path=/; HttpOnly; …`) of the last Set-Cookie for this name. */
	cookieAttributes(name: string): string | undefined {
		return this.lastSet.get(name);
	}

	setCookie(name: string, value: string) {
		this.jar.set(name, { value, attributes: '' });
	}

	clearCookies() {
		this.jar.clear();
	}

	get sessionId(): string | undefined {
		return this.cookie('interstice_session');
	}

	/** Acts as the holder of this session (see factories' `createSession`), skipping the sign-in form. */
	useSession(sessionId: string) {
		this.setCookie('interstice_session', sessionId);
		return this;
	}

	private remember(setCookie: string[] | undefined) {
		for (const line of setCookie ?? []) {
			const [pair, ...attrs] = line.split(';');
			const eq = pair.indexOf('=');
			const name = pair.slice(0, eq).trim();
			const value = decodeURIComponent(pair.slice(eq + 1).trim());
			const attributes = attrs.map((a) => a.trim()).join('; ');
			this.lastSet.set(name, attributes);
			const maxAge = /max-age=(-?\d+)/i.exec(attributes)?.[1];
			const expires = /expires=([^;]+)/i.exec(attributes)?.[1];
			const gone =
				value === '' ||
				(maxAge !== undefined && Number(maxAge) <= 0) ||
				(expires !== undefined && Date.parse(expires) <= Date.now());
			if (gone) this.jar.delete(name);
			else this.jar.set(name, { value, attributes });
		}
	}

	async request(
		method: string,
		path: string,
		init: { headers?: Record<string, string | null>; body?: Buffer | string } = {}
	): Promise<TestResponse> {
		const url = new URL(path, this.baseURL);
		if (url.origin !== new URL(this.baseURL).origin) {
			throw new Error(`${url} is not on ${this.baseURL}`);
		}
		const headers: Record<string, string> = {};
		const cookies = [...this.jar].map(([k, c]) => `${k}=${encodeURIComponent(c.value)}`).join('; ');
		if (cookies) headers.cookie = cookies;
		for (const [k, v] of Object.entries(init.headers ?? {})) {
			if (v === null) delete headers[k.toLowerCase()];
			else headers[k.toLowerCase()] = v;
		}
		if (init.body !== undefined) headers['content-length'] = String(Buffer.byteLength(init.body));
		return new Promise((done, fail) => {
			const req = request(
				url,
				{ method, headers, agent: false, localAddress: this.address },
				(res) => {
					const chunks: Buffer[] = [];
					res.on('data', (c: Buffer) => chunks.push(c));
					res.on('end', () => {
						const setCookie = res.headers['set-cookie'];
						this.remember(setCookie);
						done(
							new TestResponse(
								res.statusCode ?? 0,
								res.headers,
								Buffer.concat(chunks).toString('utf8')
							)
						);
					});
					res.on('error', fail);
				}
			);
			req.on('error', fail);
			if (init.body !== undefined) req.write(init.body);
			req.end();
		});
	}

	get(path: string, headers: Record<string, string> = {}) {
		return this.request('GET', path, { headers: { accept: 'text/html', ...headers } });
	}

	/**
	 * A form post as a browser without JavaScript sends it: the HTTP status is the answer (200 page,
	 * 303 redirect, 400 form shown again, 403/404 error page). `origin` is set so SvelteKit's CSRF
	 * check passes; override it in `headers` (or set it to null) to test that check.
	 * A FormData body is sent as multipart, e.g. to put a file where text belongs.
	 */
	async postForm(
		path: string,
		fields: Fields | FormData = {},
		headers: Record<string, string | null> = {}
	) {
		const { body, contentType } = await encode(fields);
		return this.request('POST', path, {
			body,
			headers: { origin: this.origin, 'content-type': contentType, accept: 'text/html', ...headers }
		});
	}

	/** The same post as `use:enhance` sends it; answers SvelteKit's ActionResult with `data` decoded. */
	async action(
		path: string,
		fields: Fields | FormData = {}
	): Promise<ActionResult & { response: TestResponse }> {
		const { body, contentType } = await encode(fields);
		const response = await this.request('POST', path, {
			body,
			headers: {
				origin: this.origin,
				'content-type': contentType,
				accept: 'application/json',
				'x-sveltekit-action': 'true'
			}
		});
		if (!(response.header('content-type') ?? '').includes('application/json')) {
			throw new Error(
				`POST ${path} answered ${response.status} ${response.header('content-type')}: ${response.text.slice(0, 300)}`
			);
		}
		const result = response.json<ActionResult>();
		if (typeof result.data === 'string') result.data = devalue.parse(result.data);
		if (result.type === 'error') result.status = response.status;
		return { ...result, response };
	}

	private get origin() {
		return new URL(this.baseURL).origin;
	}

	/** Signs in through the form; resolves to the response (303 on success, 400 or 429 otherwise). */
	signIn(email: string, password: string) {
		return this.postForm('/signin', { email, password });
	}

	async signUp(fields: { name: string; email: string; password: string; next?: string }) {
		return this.postForm('/signup', fields);
	}

	signOut() {
		return this.postForm('/signout');
	}
}

async function encode(fields: Fields | FormData): Promise<{ body: Buffer; contentType: string }> {
	if (fields instanceof FormData) {
		// The platform's own multipart encoder, boundary included.
		const r = new Response(fields);
		return {
			body: Buffer.from(await r.arrayBuffer()),
			contentType: r.headers.get('content-type') ?? ''
		};
	}
	const params = new URLSearchParams();
	for (const [k, v] of Object.entries(fields)) {
		if (v !== undefined && v !== null) params.append(k, String(v));
	}
	return { body: Buffer.from(params.toString()), contentType: 'application/x-www-form-urlencoded' };
}
