/**
 * Where each variant of a build stands with the client: approval, quote, deposit, links. The share
 * page shows it in full; the editor can show the same next to the variant (ClientStatus.svelte).
 */
import { variantsOf } from '../builds';
import { paymentsOfQuotes } from '../payments';
import type { ClientStatus } from '$lib/sharing/types';
import { linksOfBuild } from './links';
import { quoteOfVariant } from './quotes';
import { approvalState, latestApproval } from './thread';
import { latestVersions } from '../versions';

export async function clientStatusOf(buildId: string): Promise<ClientStatus[]> {
	const [variants, links] = await Promise.all([variantsOf(buildId), linksOfBuild(buildId)]);
	const versions = await latestVersions(variants.map((v) => v.id));
	return Promise.all(
		variants.map(async (v) => {
			const [approval, quote] = await Promise.all([latestApproval(v.id), quoteOfVariant(v.id)]);
			const paid = quote
				? ((await paymentsOfQuotes([quote.quote.id])).find((p) => p.status === 'paid') ?? null)
				: null;
			return {
				id: v.id,
				name: v.name,
				// The version the client sees (0: none saved yet).
				version: versions.get(v.id)?.number ?? 0,
				approval: approvalState(approval, versions.get(v.id)?.number ?? 0),
				quote: quote
					? {
							status: quote.quote.status,
							currency: quote.quote.currency,
							totalMinor: quote.totals.totalMinor,
							depositMinor: quote.totals.depositMinor
						}
					: null,
				deposit: paid
					? { amountMinor: paid.amountMinor, currency: paid.currency, paidAt: paid.paidAt }
					: null,
				links: links.filter((l) => l.variantId === v.id && l.state === 'active').length
			};
		})
	);
}
