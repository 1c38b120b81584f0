/**
 * One-time move of photo files from the disk store (STORAGE_DIR) into the S3-compatible bucket
 * (S3_* settings). Copies every object, checks each copy byte for byte, and leaves the disk files
 * in place: delete the folder yourself once the app runs with STORAGE_DRIVER=s3. Safe to repeat.
 * Usage: npx tsx scripts/storage-to-s3.ts
 */
import { listObjects, putObject, readObject } from '../src/lib/server/storage';

const use = (driver: 'disk' | 's3') => (process.env.STORAGE_DRIVER = driver);

use('disk');
const { objects } = await listObjects();
let moved = 0;
for (const { key } of objects) {
	use('disk');
	const bytes = await readObject(key);
	if (!bytes) continue; // deleted while we listed
	use('s3');
	await putObject(key, bytes);
	const back = await readObject(key);
	if (!back || !back.equals(bytes)) {
		throw new Error(`${key}: the copy in the bucket does not match the file on disk.`);
	}
	moved++;
}
console.log(
	`copied ${moved} of ${objects.length} photo files to the bucket; the disk copies are untouched`
);
