/**
 * Account mail after the response. A sign-up or reset request adds one row here, the same row
 * whether or not the address has an account, and the answer goes out at once; a background drain
 * (in whichever server process claims the row first: `for update skip locked`, then a lease) looks
 * the address up and sends what fits. A link's token is committed before its mail goes out, so a
 * link opened the moment it arrives works. So neither the answer nor how long it takes tells a known address from an
 * unknown one, and a slow mail server never holds up a page.
 */
import { and, asc, eq, inArray, isNull, lt, lte } from 'drizzle-orm';
import { db, type Tx } from './db';
import { emailVerifications, mailOutbox, passwordResets, users } from './db/schema';
import { link, sendMail } from './mail';
import { hashToken, newToken } from './tokens';

export const RESET_TTL_MS = 60 * 60 * 1000;
export const VERIFY_TTL_MS = 24 * 60 * 60 * 1000;
/** Rows per drain round. */
const BATCH = 20;
/** How long a claimed row stays out of other drains' reach while this one sends it. */
const LEASE_MS = 5 * 60_000;
/** After a failed send: 30 s, 1 min, 2 min, … capped at 1 h; given up after 12 tries. */
const MAX_ATTEMPTS = 12;
/** The periodic sweep picks up rows a crashed process left, and retries. */
const SWEEP_MS = 15_000;
/** Done rows (payload already emptied) are kept this long for the studio's questions, then deleted. */
const KEEP_DONE_MS = 7 * 24 * 60 * 60 * 1000;

export type SignUpPayload = { name: string; passwordHash: string; next: string | null };
export type OutboxKind = (typeof mailOutbox.kind.enumValues)[number];

/** Adds a row; inside a transaction (`tx`) the caller schedules the drain after it commits. */
export async function enqueue(
	kind: OutboxKind,
	recipient: string,
	payload: Record<string, unknown> = {},
	tx?: Tx
) {
	await (tx ?? db).insert(mailOutbox).values({ kind, recipient: recipient.toLowerCase(), payload });
	if (!tx) scheduleDrain();
}

// Process-local scheduling flags, not user data: the rows themselves live in PostgreSQL.
let draining: Promise<void> | null = null;
let again = false;
let sweeper: ReturnType<typeof setInterval> | null = null;

/** Starts a drain soon after the current request (never inside it), and the periodic sweep. */
export function scheduleDrain() {
	sweeper ??= setInterval(() => scheduleDrain(), SWEEP_MS);
	sweeper.unref?.();
	if (draining) {
		again = true;
		return;
	}
	draining = new Promise<void>((done) => setImmediate(done))
		.then(async () => void (await drainOutbox()))
		.catch((e) => console.error('mail outbox:', e))
		.finally(() => {
			draining = null;
			if (again) {
				again = false;
				scheduleDrain();
			}
		});
}

/** Sends everything due; returns how many rows it finished. Safe to run in several processes. */
export async function drainOutbox(): Promise<number> {
	let finished = 0;
	for (;;) {
		// Claim the due rows: the lease keeps every other drain off them while this one sends, and
		// brings them back if this process dies before it is done.
		const rows = await db.transaction(async (tx) => {
			const due = await tx
				.select()
				.from(mailOutbox)
				.where(and(isNull(mailOutbox.doneAt), lte(mailOutbox.notBefore, new Date())))
				.orderBy(asc(mailOutbox.id))
				.limit(BATCH)
				.for('update', { skipLocked: true });
			if (due.length) {
				await tx
					.update(mailOutbox)
					.set({ notBefore: new Date(Date.now() + LEASE_MS) })
					.where(
						inArray(
							mailOutbox.id,
							due.map((r) => r.id)
						)
					);
			}
			return due;
		});
		for (const row of rows) {
			try {
				await deliver(row);
				await db
					.update(mailOutbox)
					.set({ doneAt: new Date(), payload: {}, lastError: null })
					.where(eq(mailOutbox.id, row.id));
			} catch (e) {
				// A token written for a mail that did not go out reaches nobody and expires.
				const attempts = row.attempts + 1;
				const delayMs = Math.min(60 * 60_000, 30_000 * 2 ** (attempts - 1));
				await db
					.update(mailOutbox)
					.set({
						attempts,
						lastError: String(e instanceof Error ? e.message : e).slice(0, 500),
						notBefore: new Date(Date.now() + delayMs),
						...(attempts >= MAX_ATTEMPTS ? { doneAt: new Date(), payload: {} } : {})
					})
					.where(eq(mailOutbox.id, row.id));
			}
		}
		finished += rows.length;
		if (rows.length < BATCH) break;
	}
	await db.delete(mailOutbox).where(lt(mailOutbox.doneAt, new Date(Date.now() - KEEP_DONE_MS)));
	return finished;
}

type Row = typeof mailOutbox.$inferSelect;

/** Writes the link's token (committed at once), then sends the mail that fits the row. */
async function deliver(row: Row) {
	const [user] = await db.select().from(users).where(eq(users.email, row.recipient));
	if (row.kind === 'password-reset') {
		// An unknown address gets nothing; the request that asked looked exactly the same.
		if (!user) return;
		const token = newToken();
		await db.insert(passwordResets).values({
			tokenHash: hashToken(token),
			userId: user.id,
			expiresAt: new Date(Date.now() + RESET_TTL_MS)
		});
		await sendMail({
			to: user.email,
			subject: 'Reset your Interstice password',
			text: `Someone asked to reset the password for ${user.email}.\n\nChoose a new password here (the link works once, for one hour):\n${link(`/reset/${token}`)}\n\nIf it wasn't you, ignore this mail; nothing changes.`
		});
		return;
	}
	const p = row.payload as SignUpPayload;
	if (!user) return; // the account was deleted before the mail went out
	if (user.emailVerifiedAt) {
		await sendMail({
			to: user.email,
			subject: 'Someone tried to sign up with your address',
			text: `Someone tried to make a new Interstice account with ${user.email}, which already has one. Nothing changed.\n\nIf it was you, sign in here:\n${link('/signin')}\n\nForgot the password? Choose a new one here:\n${link('/reset')}\n\nIf it wasn't you, ignore this mail.`
		});
		return;
	}
	const token = newToken();
	await db.insert(emailVerifications).values({
		tokenHash: hashToken(token),
		userId: user.id,
		name: p.name,
		passwordHash: p.passwordHash,
		next: p.next,
		expiresAt: new Date(Date.now() + VERIFY_TTL_MS)
	});
	await sendMail({
		to: user.email,
		subject: 'Confirm your address for Interstice',
		text: `Someone (${p.name}, we hope you) made an Interstice account with ${user.email}.\n\nConfirm the address here to start (the link works once, for 24 hours):\n${link(`/verify/${token}`)}\n\nIf it wasn't you, ignore this mail; the account stays closed.`
	});
}

/** Rows for one address, oldest first (tests and support questions). */
export function outboxOf(recipient: string) {
	return db
		.select({
			id: mailOutbox.id,
			kind: mailOutbox.kind,
			doneAt: mailOutbox.doneAt,
			attempts: mailOutbox.attempts,
			lastError: mailOutbox.lastError
		})
		.from(mailOutbox)
		.where(eq(mailOutbox.recipient, recipient.toLowerCase()))
		.orderBy(asc(mailOutbox.id));
}
