import { seedAccounts } from './accounts';
import { seedBuilds } from './builds';
import { seedCatalog } from './catalog';
import { seedLoopCatalogue } from './loop';
import { seedSharing } from './sharing';

/** Seeds the demo; safe to run on every start. Each area adds its own step here. */
export async function seedDemo() {
	await seedAccounts();
	await seedCatalog();
	await seedLoopCatalogue();
	await seedBuilds();
	await seedSharing();
}
