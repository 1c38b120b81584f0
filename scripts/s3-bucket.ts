/**
 * Makes S3_BUCKET in the S3-compatible store when it is missing (npm test: the browser tests' own
 * bucket, which a local store left running from an earlier checkout may not have).
 */
import { ensureBucket } from '../src/lib/server/storage';
import { config } from '../src/lib/server/config';

const made = await ensureBucket();
console.log(`store: bucket ${config.storage.bucket} ${made ? 'created' : 'present'}`);
