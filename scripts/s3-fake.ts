/**
 * A local S3-compatible store (s3rver) for photos, on 127.0.0.1 only, data in .data/s3. Started by
 * npm start, npm test and npm run start:cluster through lib.sh; the app reaches it with the same
 * endpoint, bucket and credential settings a hosted provider takes (S3_* in README.md).
 */
import S3rver from 's3rver';

const port = Number(process.env.S3_FAKE_PORT ?? '4569');
// The app's bucket and the test run's own, so a test never touches the app's photos.
const buckets = (process.env.S3_FAKE_BUCKETS ?? 'interstice-photos,interstice-photos-test').split(
	','
);
const server = new S3rver({
	address: '127.0.0.1',
	port,
	silent: true,
	directory: process.env.S3_FAKE_DIR ?? '.data/s3',
	configureBuckets: buckets.map((name) => ({ name, configs: [] }))
});
await server.run();
console.log(`S3-compatible store on http://127.0.0.1:${port}, buckets ${buckets.join(', ')}`);
for (const sig of ['SIGINT', 'SIGTERM'] as const) {
	process.on(sig, () => void server.close().then(() => process.exit(0)));
}
