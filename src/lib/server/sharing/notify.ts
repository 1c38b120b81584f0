/** E-mail to the studio about what a client did: comments, approvals, change requests, deposits. */
import { and, eq, inArray } from 'drizzle-orm';
import { db } from '../db';
import { formatMoney } from '$lib/quotes/money';
import { builds, memberships, shareLinks, users, type BuildRow } from '../db/schema';
import { link, sendMail, sendOrLog } from '../mail';

/**
 * Who hears about a client's action: the designer who sent the link, else whoever made the build,
 * else the studio's owners. Only people still in the studio as owner or designer.
 */
export async function studioRecipients(
	buildId: string,
	linkCreatedBy: string | null
): Promise<string[]> {
	const [build] = await db.select().from(builds).where(eq(builds.id, buildId));
	if (!build) return [];
	const staff = await db
		.select({ id: users.id, email: users.email, role: memberships.role })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(
			and(
				eq(memberships.studioId, build.studioId),
				inArray(memberships.role, ['owner', 'designer'])
			)
		);
	for (const candidate of [linkCreatedBy, build.createdBy]) {
		const hit = candidate && staff.find((s) => s.id === candidate);
		if (hit) return [hit.email];
	}
	return staff.filter((s) => s.role === 'owner').map((s) => s.email);
}

export async function notifyStudio(input: {
	buildId: string;
	linkCreatedBy: string | null;
	subject: string;
	lines: string[];
}) {
	const to = await studioRecipients(input.buildId, input.linkCreatedBy);
	const text = [
		...input.lines,
		'',
		`Open the build: ${link(`/builds/${input.buildId}/share`)}`
	].join('\n');
	for (const address of to) await sendMail({ to: address, subject: input.subject, text });
}

/** A short reply notice to the client. The link itself is not stored, so the mail points them back to the one they have. */
export async function notifyClient(input: {
	to: string;
	studioName: string;
	buildName: string;
	authorName: string;
	body: string;
}) {
	await sendMail({
		to: input.to,
		subject: `${input.studioName} replied about ${input.buildName}`,
		text: [
			`${input.authorName} wrote:`,
			'',
			input.body,
			'',
			'Open the share link the studio sent you to answer.'
		].join('\n')
	});
}

/** Who made the link the client paid through (they hear about its payments); null without one. */
async function linkCreator(linkId: string | null): Promise<string | null> {
	if (!linkId) return null;
	const [l] = await db
		.select({ createdBy: shareLinks.createdBy })
		.from(shareLinks)
		.where(eq(shareLinks.id, linkId));
	return l?.createdBy ?? null;
}

/**
 * Tells the studio about a payment for one of its builds (`what` names it in the log when the mail
 * fails; a mail failure is logged only).
 */
async function notifyPayment(
	payment: { buildId: string; payerShareLinkId: string | null },
	what: string,
	message: (build: BuildRow) => { subject: string; lines: string[] }
) {
	const [build] = await db.select().from(builds).where(eq(builds.id, payment.buildId));
	if (!build) return;
	const linkCreatedBy = await linkCreator(payment.payerShareLinkId);
	await sendOrLog(`could not tell the studio about ${what}`, () =>
		notifyStudio({ buildId: build.id, linkCreatedBy, ...message(build) })
	);
}

/** The studio hears once per deposit: called only by whichever path actually marked it paid. */
export async function notifyDepositPaid(payment: {
	buildId: string;
	amountMinor: number;
	currency: string;
	paidAt: Date | null;
	payerShareLinkId: string | null;
}) {
	await notifyPayment(payment, 'a deposit', (build) => ({
		subject: `Deposit paid: ${build.name}`,
		lines: [
			`The client paid the deposit of ${formatMoney(payment.amountMinor, payment.currency)} for ${build.name}${payment.paidAt ? ` on ${payment.paidAt.toISOString().replace('T', ' ').slice(0, 16)} UTC` : ''}.`
		]
	}));
}

/**
 * Money that came in for a deposit already paid (see payments.ts): never counted; refunded through
 * the service, or, when that failed, left for the studio to refund by hand.
 */
export async function notifyPaidTwice(
	payment: {
		buildId: string;
		variantId: string;
		amountMinor: number;
		currency: string;
		payerShareLinkId: string | null;
	},
	refunded: boolean
) {
	const amount = formatMoney(payment.amountMinor, payment.currency);
	await notifyPayment(payment, 'a second payment', (build) => ({
		subject: `Paid twice: ${build.name}`,
		lines: [
			`A second payment of ${amount} came in for the deposit of ${build.name}, which was already paid. It is not counted.`,
			refunded
				? 'It was refunded through the payment service; the client needs to do nothing.'
				: `The automatic refund failed: refund it with the payment service. The quote shows it: ${link(`/builds/${build.id}/quote/${payment.variantId}`)}`
		]
	}));
}
