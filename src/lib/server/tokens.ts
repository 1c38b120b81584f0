import { createHash, randomBytes } from 'node:crypto';

/** 32 random bytes (256 bits), URL-safe. Links carry the token; the database keeps only its hash. */
export function newToken(): string {
	return randomBytes(32).toString('base64url');
}

export function hashToken(token: string): string {
	return createHash('sha256').update(token, 'utf8').digest('hex');
}

export function newId(): string {
	return randomBytes(15).toString('base64url').replace(/[-_]/g, 'x');
}
