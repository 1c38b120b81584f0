import { runMigrations } from '../src/lib/server/db/migrate';

await runMigrations();
console.log('db: migrations applied');
