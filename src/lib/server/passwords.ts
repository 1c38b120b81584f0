import { hash, verify } from '@node-rs/argon2';

/** argon2id (the library's default algorithm) with the OWASP-recommended minimum cost. */
const options = { memoryCost: 19456, timeCost: 2, outputLen: 32, parallelism: 1 };

export function hashPassword(password: string): Promise<string> {
	return hash(password, options);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
	try {
		return await verify(passwordHash, password);
	} catch {
		return false;
	}
}

/** A fixed hash to verify against when the e-mail is unknown, so both answers take as long. */
let dummy: Promise<string> | undefined;
export async function verifyDummy(password: string) {
	dummy ??= hashPassword('not-a-real-password-0');
	await verifyPassword(await dummy, password);
	return false;
}
