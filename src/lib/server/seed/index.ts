import { seedAccounts } from './accounts';

/** Seeds the demo; safe to run on every start. Each area adds its own step here. */
export async function seedDemo() {
	await seedAccounts();
}
