import { closeDb } from '../src/lib/server/db';
import { seedDemo } from '../src/lib/server/seed';

await seedDemo();
await closeDb();
console.log('db: demo data seeded');
