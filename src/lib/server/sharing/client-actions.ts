/**
 * The client page's form actions (comment, approve, ask for changes, pay the deposit), shared by
 * the share-link page and the in-app page for client members. Each route resolves who is asking
 * and what they may do; this module does the rest the same way for both.
 */
import { fail, type RequestEvent } from '@sveltejs/kit';
import { approveForm, changesForm, commentForm } from '$lib/schemas/sharing';
import { formatMoney } from '$lib/quotes/money';
import type { BuildRow, VariantRow } from '../db/schema';
import { forPage, ServiceError } from '../errors';
import { readForm } from '../forms';
import { enforce } from '../limits';
import { link, sendOrLog } from '../mail';
import { startCheckout } from '../payments';
import { limits } from '../rate-limit';
import { notifyDepositPaid, notifyStudio } from './notify';
import { quoteOfVariant } from './quotes';
import { addComment, approveVersion, requestChanges, type Author } from './thread';
import type { ClientPageData } from '$lib/sharing/types';
import { clientView, type ViewerKind } from './view';

export type ClientActor = {
	build: BuildRow;
	variant: VariantRow;
	studioName: string;
	sharedBy: string | null;
	/** Who hears about it in the studio: the link's sender, else the build's maker. */
	linkCreatedBy: string | null;
	viewer: ViewerKind;
	author: Omit<Author, 'name'> & { defaultName: string; fixedName: boolean };
	may: { comment: boolean; approve: boolean; pay: boolean };
	customerEmail: string | null;
	/** The page to come back to after paying, and the limiter key for this viewer. */
	pagePath: string;
	limitKey: string;
};

/** The load both client pages return for this actor; photoBase is the page's photo path. */
export async function clientPageData(
	actor: ClientActor,
	photoBase: string,
	url: URL
): Promise<ClientPageData> {
	const { view } = await forPage(() => clientView(actor));
	return {
		view,
		may: actor.may,
		defaultName: actor.author.defaultName,
		fixedName: actor.author.fixedName,
		photoBase,
		deposit: url.searchParams.get('deposit')
	};
}

function nameOf(actor: ClientActor, typed: string) {
	return actor.author.fixedName
		? actor.author.defaultName
		: typed || actor.author.defaultName || 'Client';
}

/** Where a comment lands and who wrote it, for the thread. */
function target(actor: ClientActor, version: number, typedName: string) {
	const name = nameOf(actor, typedName);
	return {
		name,
		buildId: actor.build.id,
		variantId: actor.variant.id,
		variantVersion: version,
		author: {
			userId: actor.author.userId,
			shareLinkId: actor.author.shareLinkId,
			side: actor.author.side,
			name
		}
	};
}

async function limitComments(event: RequestEvent, actor: ClientActor) {
	await enforce(event, 'comment', limits.comment, actor.limitKey);
}

async function safeNotify(input: Parameters<typeof notifyStudio>[0]) {
	await sendOrLog('could not tell the studio', () => notifyStudio(input));
}

export async function commentAction(event: RequestEvent, actor: ClientActor) {
	if (!actor.may.comment) throw new ServiceError('forbidden', 'You may not comment here.');
	await limitComments(event, actor);
	const parsed = await readForm(event.request, commentForm);
	if (!parsed.ok) return parsed.failure;
	const { view, placementIds } = await clientView(actor);
	let placementId: string | null = null;
	let partLabel: string | null = null;
	if (parsed.data.part) {
		placementId = placementIds.get(parsed.data.part) ?? null;
		const placed = view.placed.find((p) => p.ref === parsed.data.part);
		if (!placementId || !placed) {
			return fail(400, {
				values: parsed.values,
				errors: { part: 'That part is no longer in the build; reload the page.' }
			});
		}
		partLabel = `${placed.short} (${placed.name})`;
	}
	const { name, ...where } = target(actor, parsed.data.version, parsed.data.name);
	await addComment({
		...where,
		placementId,
		partLabel,
		body: parsed.data.body
	});
	if (actor.author.side === 'client') {
		await safeNotify({
			buildId: actor.build.id,
			linkCreatedBy: actor.linkCreatedBy,
			subject: `New comment on ${actor.build.name}`,
			lines: [
				`${name} commented on ${actor.variant.name} (version ${parsed.data.version})${partLabel ? `, about ${partLabel}` : ''}:`,
				'',
				parsed.data.body
			]
		});
	}
	return { done: 'comment' as const };
}

export async function approveAction(event: RequestEvent, actor: ClientActor) {
	if (!actor.may.approve) throw new ServiceError('forbidden', 'You may not approve this build.');
	await limitComments(event, actor);
	const parsed = await readForm(event.request, approveForm);
	if (!parsed.ok) return parsed.failure;
	const { frozenScene } = await clientView(actor);
	const { name, ...where } = target(actor, parsed.data.version, parsed.data.name);
	const result = await approveVersion({
		...where,
		message: parsed.data.message,
		scene: frozenScene
	});
	if (!result.ok && result.reason === 'changed') {
		return fail(409, {
			values: parsed.values,
			errors: {
				approve: `The studio changed the build while you were looking (now version ${result.currentVersion}). Look at the new version, then approve it.`
			}
		});
	}
	if (!result.ok) return { done: 'approved' as const };
	await safeNotify({
		buildId: actor.build.id,
		linkCreatedBy: actor.linkCreatedBy,
		subject: `Approved: ${actor.build.name}`,
		lines: [
			`${name} approved ${actor.variant.name}, version ${parsed.data.version}.`,
			...(parsed.data.message ? ['', parsed.data.message] : []),
			'',
			'The variant is now read-only in the editor. To change it, start a new variant from it (or wait until the client asks for changes).'
		]
	});
	return { done: 'approved' as const };
}

export async function changesAction(event: RequestEvent, actor: ClientActor) {
	if (!actor.may.approve) {
		throw new ServiceError('forbidden', 'You may not ask for changes here.');
	}
	await limitComments(event, actor);
	const parsed = await readForm(event.request, changesForm);
	if (!parsed.ok) return parsed.failure;
	const { name, ...where } = target(actor, parsed.data.version, parsed.data.name);
	await requestChanges({ ...where, message: parsed.data.message });
	await safeNotify({
		buildId: actor.build.id,
		linkCreatedBy: actor.linkCreatedBy,
		subject: `Changes asked for: ${actor.build.name}`,
		lines: [
			`${name} asked for changes to ${actor.variant.name} (version ${parsed.data.version}):`,
			'',
			parsed.data.message,
			'',
			'If the variant was approved, it is open for changes again.'
		]
	});
	return { done: 'changes' as const };
}

/**
 * The four actions of a client page, for a route that knows how to find its actor. What the viewer
 * may not do (403) and what the engine refuses show the error page.
 */
export function clientPageActions(actorOf: (event: RequestEvent) => Promise<ClientActor>) {
	return {
		comment: (event: RequestEvent) =>
			forPage(async () => commentAction(event, await actorOf(event))),
		approve: (event: RequestEvent) =>
			forPage(async () => approveAction(event, await actorOf(event))),
		changes: (event: RequestEvent) =>
			forPage(async () => changesAction(event, await actorOf(event))),
		pay: (event: RequestEvent) => forPage(async () => payAction(event, await actorOf(event)))
	};
}

/** Cookie that remembers which page to return to after the hosted checkout (never sent to the service). */
export const RETURN_COOKIE = 'interstice_checkout_return';

export async function payAction(event: RequestEvent, actor: ClientActor) {
	if (!actor.may.pay) throw new ServiceError('forbidden', 'Only the client can pay the deposit.');
	await enforce(event, 'checkout', limits.comment, actor.limitKey);
	const { view } = await clientView(actor);
	if (!view.deposit.canPay || !view.quote) {
		return fail(409, {
			errors: { pay: view.deposit.reason ?? 'The deposit is already paid.' },
			values: {}
		});
	}
	const quote = await quoteOfVariant(actor.variant.id);
	if (!quote) {
		return fail(409, { errors: { pay: 'The studio has not sent a quote yet.' }, values: {} });
	}
	// One checkout per quote, however many posts arrive at once (see payments.ts).
	const outcome = await startCheckout({
		quoteId: quote.quote.id,
		buildId: actor.build.id,
		variantId: actor.variant.id,
		describe: (amountMinor, currency) =>
			`Deposit for ${actor.build.name} (${formatMoney(amountMinor, currency)})`,
		customerEmail: actor.customerEmail,
		payerShareLinkId: actor.author.shareLinkId,
		payerUserId: actor.author.userId,
		successUrl: link('/s/return?session_id={CHECKOUT_SESSION_ID}'),
		cancelUrl: link('/s/return?cancelled=1')
	});
	if ('refused' in outcome) {
		if (outcome.newlyPaid) await notifyDepositPaid(outcome.newlyPaid);
		return fail(409, { errors: { pay: outcome.refused }, values: {} });
	}
	const url = outcome.url;
	event.cookies.set(RETURN_COOKIE, actor.pagePath, {
		path: '/s',
		httpOnly: true,
		sameSite: 'lax',
		secure: event.url.protocol === 'https:',
		maxAge: 60 * 60 * 24
	});
	// Not a redirect: the page's form-action policy allows only our own origin, so the browser is
	// sent on by the page itself (or, without JavaScript, follows the link it shows).
	return { checkoutUrl: url };
}
