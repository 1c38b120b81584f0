// s3rver ships no types; only what scripts/s3-fake.ts uses.
declare module 's3rver' {
	type Options = {
		address?: string;
		port?: number;
		silent?: boolean;
		directory?: string;
		configureBuckets?: { name: string; configs: (string | Buffer)[] }[];
	};
	export default class S3rver {
		constructor(options: Options);
		run(): Promise<{ address: string; port: number }>;
		close(): Promise<void>;
	}
}
