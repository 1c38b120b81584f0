import { and, eq } from 'drizzle-orm';
import { db } from '../db';
import { memberships, studios, users, type Role } from '../db/schema';
import { hashPassword } from '../passwords';

/** Invented demo studio and accounts. Fixed ids make seeding idempotent. */
export const DEMO_STUDIO = { id: 'demo-studio', name: 'Tallow Lane Workshop' };
export const DEMO_PASSWORD = 'demo-password-1';
export const DEMO_USERS: { id: string; email: string; name: string; role: Role }[] = [
	{ id: 'demo-owner', email: 'owner@demo.interstice.test', name: 'Demo Owner', role: 'owner' },
	{
		id: 'demo-designer',
		email: 'designer@demo.interstice.test',
		name: 'Demo Designer',
		role: 'designer'
	},
	{ id: 'demo-client', email: 'client@demo.interstice.test', name: 'Demo Client', role: 'client' }
];

export async function seedAccounts() {
	const passwordHash = await hashPassword(DEMO_PASSWORD);
	await db.insert(studios).values(DEMO_STUDIO).onConflictDoNothing();
	for (const u of DEMO_USERS) {
		await db
			.insert(users)
			.values({
				id: u.id,
				email: u.email,
				name: u.name,
				passwordHash,
				activeStudioId: DEMO_STUDIO.id,
				emailVerifiedAt: new Date()
			})
			.onConflictDoNothing();
		const [m] = await db
			.select()
			.from(memberships)
			.where(and(eq(memberships.studioId, DEMO_STUDIO.id), eq(memberships.userId, u.id)));
		if (!m) {
			await db.insert(memberships).values({ studioId: DEMO_STUDIO.id, userId: u.id, role: u.role });
		}
	}
}
