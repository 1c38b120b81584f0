/** The part of autocannon's programmatic API that scripts/bench-http.ts uses (it ships no types). */
declare module 'autocannon' {
	type Histogram = {
		average: number;
		mean: number;
		stddev: number;
		min: number;
		max: number;
		total: number;
		p50: number;
		p90: number;
		p97_5: number;
		p99: number;
	};
	export type Result = {
		url: string;
		duration: number;
		requests: Histogram;
		latency: Histogram;
		errors: number;
		timeouts: number;
		non2xx: number;
		statusCodeStats: Record<string, { count: number }>;
	};
	export type Options = {
		url: string;
		method?: 'GET' | 'POST' | 'PUT';
		headers?: Record<string, string>;
		body?: string;
		/** Per-request hooks; setupRequest may change the request (here: a different body each time). */
		requests?: { setupRequest?: (req: { body?: string | Buffer }) => { body?: string | Buffer } }[];
		connections?: number;
		/** Requests per second over all connections (a paced load, not as fast as possible). */
		overallRate?: number;
		duration?: number;
		timeout?: number;
	};
	/** An event emitter ('response': client, statusCode, resBytes, responseTimeMs) that is also the result's promise. */
	export type Instance = import('node:events').EventEmitter & PromiseLike<Result>;
	export default function autocannon(opts: Options): Instance;
}
