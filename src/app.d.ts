import type { SessionUser } from '$lib/server/auth';

declare global {
	namespace App {
		interface Locals {
			user: SessionUser | null;
			session: { id: string; expiresAt: Date } | null;
		}
		interface Error {
			message: string;
		}
	}
}

export {};
