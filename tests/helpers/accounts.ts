/**
 * Accounts for browser tests, written straight to the test database (DATABASE_URL, as `npm test`
 * sets it). Signing a browser in by cookie skips the sign-in form, which has a test of its own.
 */
import type { BrowserContext } from '@playwright/test';
import { closeDb } from '../../src/lib/server/db';
import { clearRateLimits, createSession } from '../../src/lib/server/testing/factories';

export {
	TEST_PASSWORD,
	createInvite,
	createMember,
	createStudio,
	createUser,
	roleOf,
	studioWithMembers,
	uniqueEmail
} from '../../src/lib/server/testing/factories';
export { closeDb };

/** Puts a fresh session of this user into the browser context. */
export async function signInAs(context: BrowserContext, baseURL: string, userId: string) {
	const session = await createSession(userId);
	await context.addCookies([
		{ name: 'interstice_session', value: session, url: baseURL, httpOnly: true, sameSite: 'Lax' }
	]);
}

/**
 * The browser always comes from 127.0.0.1, so every browser test shares one rate-limit budget per
 * window. Tests that are not about rate limits start with a clean one.
 */
export function clearBrowserRateLimits() {
	return clearRateLimits('127.0.0.1');
}
