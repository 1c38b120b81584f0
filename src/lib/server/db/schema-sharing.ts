/**
 * Clients: share links, the comment thread, approvals, quotes, deposits and photos.
 * Money is always integer minor units (cents) beside an ISO 4217 currency code.
 */
import { sql } from 'drizzle-orm';
import {
	check,
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	text,
	uniqueIndex
} from 'drizzle-orm/pg-core';
import { createdAt, looseRef, ownerRef, revision, timestamps, ts } from './columns';
import { studios, users } from './schema-auth';
import { builds, variants } from './schema-builds';
import { parts } from './schema-catalog';

/** One link to one variant. The token in the link is never stored, only its SHA-256. */
export const shareLinks = pgTable(
	'share_link',
	{
		id: text('id').primaryKey(),
		studioId: ownerRef('studio_id', () => studios.id),
		buildId: ownerRef('build_id', () => builds.id),
		variantId: ownerRef('variant_id', () => variants.id),
		tokenHash: text('token_hash').notNull(),
		/** Lower-case; a client member of the studio with this address sees the variant in the app. */
		recipientEmail: text('recipient_email'),
		recipientName: text('recipient_name').notNull().default(''),
		createdBy: looseRef('created_by', () => users.id),
		expiresAt: ts('expires_at'),
		revokedAt: ts('revoked_at'),
		sentAt: ts('sent_at'),
		lastOpenedAt: ts('last_opened_at'),
		openCount: integer('open_count').notNull().default(0),
		createdAt: createdAt()
	},
	(t) => [
		uniqueIndex('share_link_token_key').on(t.tokenHash),
		index('share_link_variant_idx').on(t.variantId),
		index('share_link_recipient_idx').on(t.recipientEmail)
	]
);

export const commentKind = pgEnum('comment_kind', ['comment', 'approved', 'changes']);

/** One thread per variant, written from the client page and from the editor. */
export const comments = pgTable(
	'build_comment',
	{
		id: text('id').primaryKey(),
		buildId: ownerRef('build_id', () => builds.id),
		variantId: ownerRef('variant_id', () => variants.id),
		/** The variant's version the writer was looking at. */
		variantVersion: integer('variant_version').notNull(),
		kind: commentKind('kind').notNull().default('comment'),
		/** Pinned to a placed part; null is about the whole build. */
		placementId: text('placement_id'),
		/** The part's name when written, so the comment reads the same after the part is moved out. */
		partLabel: text('part_label'),
		body: text('body').notNull(),
		authorUserId: looseRef('author_user_id', () => users.id),
		shareLinkId: looseRef('share_link_id', () => shareLinks.id),
		authorName: text('author_name').notNull(),
		/** 'studio' for owners and designers, 'client' for clients and link holders. */
		authorSide: text('author_side').notNull(),
		createdAt: createdAt()
	},
	(t) => [
		index('build_comment_variant_idx').on(t.variantId, t.createdAt),
		check('build_comment_body_length', sql`char_length(${t.body}) between 1 and 4000`),
		check('build_comment_side', sql`${t.authorSide} in ('studio', 'client')`)
	]
);

/**
 * A client's approval of one version of a variant. The scene as approved is frozen here, so the
 * approval keeps meaning the same thing after the variant or its parts change.
 */
export const approvals = pgTable(
	'variant_approval',
	{
		id: text('id').primaryKey(),
		buildId: ownerRef('build_id', () => builds.id),
		variantId: ownerRef('variant_id', () => variants.id),
		variantVersion: integer('variant_version').notNull(),
		/** The composed engine scene (enclosure, parts, settings) of that version. */
		scene: jsonb('scene').notNull(),
		commentId: looseRef('comment_id', () => comments.id),
		byUserId: looseRef('by_user_id', () => users.id),
		byShareLinkId: looseRef('by_share_link_id', () => shareLinks.id),
		byName: text('by_name').notNull(),
		createdAt: createdAt()
	},
	(t) => [uniqueIndex('variant_approval_version_key').on(t.variantId, t.variantVersion)]
);

export const quoteStatus = pgEnum('quote_status', ['draft', 'sent']);
export const depositKind = pgEnum('deposit_kind', ['amount', 'percent']);

/** One quote per shared variant. */
export const quotes = pgTable(
	'quote',
	{
		id: text('id').primaryKey(),
		studioId: ownerRef('studio_id', () => studios.id),
		buildId: ownerRef('build_id', () => builds.id),
		variantId: ownerRef('variant_id', () => variants.id),
		currency: text('currency').notNull().default('EUR'),
		labourMinor: integer('labour_minor').notNull().default(0),
		labourNote: text('labour_note').notNull().default('Assembly, leak test and cable work'),
		/** Basis points: 2000 = 20.00 %. */
		taxRateBp: integer('tax_rate_bp').notNull().default(0),
		depositKind: depositKind('deposit_kind').notNull().default('percent'),
		/** Minor units for 'amount', basis points of the total for 'percent'. */
		depositValue: integer('deposit_value').notNull().default(3000),
		notes: text('notes').notNull().default(''),
		status: quoteStatus('status').notNull().default('draft'),
		sentAt: ts('sent_at'),
		revision: revision(),
		...timestamps()
	},
	(t) => [
		uniqueIndex('quote_variant_key').on(t.variantId),
		check('quote_currency_code', sql`${t.currency} ~ '^[A-Z]{3}$'`),
		check('quote_labour_nonnegative', sql`${t.labourMinor} >= 0`),
		check('quote_tax_rate_range', sql`${t.taxRateBp} between 0 and 10000`),
		check('quote_deposit_nonnegative', sql`${t.depositValue} >= 0`),
		check(
			'quote_deposit_percent_range',
			sql`${t.depositKind} <> 'percent' or ${t.depositValue} <= 10000`
		)
	]
);

export const quoteLines = pgTable(
	'quote_line',
	{
		id: text('id').primaryKey(),
		quoteId: ownerRef('quote_id', () => quotes.id),
		sortOrder: integer('sort_order').notNull(),
		partId: looseRef('part_id', () => parts.id),
		description: text('description').notNull(),
		quantity: integer('quantity').notNull(),
		/** Null while the catalogue has no price in the quote's currency and nobody entered one. */
		unitPriceMinor: integer('unit_price_minor'),
		/** Lines of the coolant loop's group: `tube:<tube kind id>`, `fitting:<part id|plug>:<thread>`. */
		loopKey: text('loop_key'),
		createdAt: createdAt()
	},
	(t) => [
		index('quote_line_quote_idx').on(t.quoteId, t.sortOrder),
		check('quote_line_quantity_range', sql`${t.quantity} between 1 and 10000`),
		check(
			'quote_line_price_nonnegative',
			sql`${t.unitPriceMinor} is null or ${t.unitPriceMinor} >= 0`
		)
	]
);

/**
 * pending: an open checkout; paid: the quote's deposit; expired: a checkout that lapsed or was
 * replaced; duplicate: money that came in for a quote already paid, not counted and waiting for a
 * refund by hand (shown to the studio); refunded: such money sent back through the service.
 */
export const paymentStatus = pgEnum('payment_status', [
	'pending',
	'paid',
	'expired',
	'duplicate',
	'refunded'
]);

/**
 * A deposit checkout. Becomes 'paid' once, from the signed webhook or the confirmed return. A quote
 * has at most one payment that is open or paid (payment_quote_open_key), so it is never paid twice.
 */
export const payments = pgTable(
	'payment',
	{
		id: text('id').primaryKey(),
		quoteId: text('quote_id')
			.notNull()
			.references(() => quotes.id, { onDelete: 'restrict' }),
		buildId: ownerRef('build_id', () => builds.id),
		variantId: ownerRef('variant_id', () => variants.id),
		amountMinor: integer('amount_minor').notNull(),
		currency: text('currency').notNull(),
		checkoutSessionId: text('checkout_session_id'),
		checkoutUrl: text('checkout_url'),
		status: paymentStatus('status').notNull().default('pending'),
		paidAt: ts('paid_at'),
		payerShareLinkId: looseRef('payer_share_link_id', () => shareLinks.id),
		payerUserId: looseRef('payer_user_id', () => users.id),
		/** The service's refund of a duplicate payment. */
		refundId: text('refund_id'),
		refundedAt: ts('refunded_at'),
		createdAt: createdAt()
	},
	(t) => [
		uniqueIndex('payment_session_key').on(t.checkoutSessionId),
		uniqueIndex('payment_quote_open_key')
			.on(t.quoteId)
			.where(sql`${t.status} in ('pending', 'paid')`),
		index('payment_quote_idx').on(t.quoteId),
		check('payment_amount_positive', sql`${t.amountMinor} > 0`)
	]
);

/** Every webhook event handled, by the provider's event id: a replay finds its row and stops. */
export const paymentEvents = pgTable('payment_event', {
	id: text('id').primaryKey(),
	type: text('type').notNull(),
	checkoutSessionId: text('checkout_session_id'),
	receivedAt: ts('received_at').notNull().defaultNow()
});

/** Build photos. Files live in the storage module under random names; never a user-given path. */
export const photos = pgTable(
	'photo',
	{
		id: text('id').primaryKey(),
		buildId: ownerRef('build_id', () => builds.id),
		storageKey: text('storage_key').notNull(),
		thumbKey: text('thumb_key').notNull(),
		mime: text('mime').notNull(),
		byteSize: integer('byte_size').notNull(),
		width: integer('width').notNull(),
		height: integer('height').notNull(),
		caption: text('caption').notNull().default(''),
		uploadedBy: looseRef('uploaded_by', () => users.id),
		createdAt: createdAt()
	},
	(t) => [
		index('photo_build_idx').on(t.buildId, t.createdAt),
		check('photo_mime', sql`${t.mime} in ('image/jpeg', 'image/png', 'image/webp')`)
	]
);

export type ShareLinkRow = typeof shareLinks.$inferSelect;
export type CommentRow = typeof comments.$inferSelect;
export type ApprovalRow = typeof approvals.$inferSelect;
export type QuoteRow = typeof quotes.$inferSelect;
export type QuoteLineRow = typeof quoteLines.$inferSelect;
export type PaymentRow = typeof payments.$inferSelect;
export type PhotoRow = typeof photos.$inferSelect;
