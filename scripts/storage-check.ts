/**
 * npm run storage:check [-- --delete-orphans]: compares the photo store with the photo rows.
 * Lists files with no row (left by a crash between a delete's commit and its file clean-up, or an
 * upload that never got its row) and rows with no file. Exits 1 when it finds either.
 * --delete-orphans removes files with no row that are older than ORPHAN_AGE_MIN minutes (default
 * 15), because an upload writes its files a moment before its row.
 */
import { closeDb, db } from '../src/lib/server/db';
import { photos } from '../src/lib/server/db/schema';
import { deleteObjects, deleteStray, listObjects, storeLocation } from '../src/lib/server/storage';

const remove = process.argv.includes('--delete-orphans');
const minAgeMs = Number(process.env.ORPHAN_AGE_MIN ?? 15) * 60_000;

const rows = await db
	.select({
		id: photos.id,
		buildId: photos.buildId,
		storageKey: photos.storageKey,
		thumbKey: photos.thumbKey
	})
	.from(photos);
const named = new Map<string, { id: string; buildId: string }>();
for (const r of rows) {
	named.set(r.storageKey, r);
	named.set(r.thumbKey, r);
}
const { objects, strays } = await listObjects();
const present = new Set(objects.map((o) => o.key));
const orphans = objects.filter((o) => !named.has(o.key));
const missing = [...named.entries()].filter(([key]) => !present.has(key));

console.log(`storage: ${objects.length} files in ${storeLocation()}, ${rows.length} photo rows`);
console.log(`files with no row: ${orphans.length + strays.length}`);
for (const o of orphans) console.log(`  ${o.key}  ${o.bytes} bytes  ${o.modifiedAt.toISOString()}`);
for (const s of strays) console.log(`  ${s}  (not a storage key)`);
console.log(`rows with no file: ${missing.length}`);
for (const [key, r] of missing) console.log(`  photo ${r.id} of build ${r.buildId}: ${key}`);

let left = orphans.length + strays.length;
if (remove) {
	const old = orphans.filter((o) => Date.now() - o.modifiedAt.getTime() >= minAgeMs);
	await deleteObjects(old.map((o) => o.key));
	for (const s of strays) await deleteStray(s);
	left -= old.length + strays.length;
	console.log(
		`deleted ${old.length + strays.length} files with no row${left ? `; ${left} newer than ${minAgeMs / 60_000} min kept` : ''}`
	);
}
await closeDb();
process.exit(left + missing.length > 0 ? 1 : 0);
