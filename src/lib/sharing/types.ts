/** What the client page receives from the server (see $lib/server/sharing/view.ts). Plain data only. */
import type { FitStatus, Scene, Vec3 } from '$lib/geometry';

export type FitSummary = {
	/** 'fits' when nothing collides, is blocked or is outside; tight gaps still fit. */
	verdict: 'fits' | 'tight' | 'problems';
	headline: string;
	details: string[];
	budgets: string[];
};

export type PlacedPart = {
	ref: string;
	short: string;
	/** The short name as a list entry starts: "Fan 2", "Graphics card". */
	label: string;
	name: string;
	category: string;
	sizeMm: Vec3;
	status: FitStatus;
};
export type PartLine = {
	name: string;
	category: string;
	quantity: number;
	sizeMm: Vec3;
	unitPriceMinor: number | null;
	currency: string | null;
};
export type ClientQuote = {
	currency: string;
	lines: { description: string; quantity: number; unitPriceMinor: number; totalMinor: number }[];
	labourNote: string;
	labourMinor: number;
	subtotalMinor: number;
	taxRateBp: number;
	taxMinor: number;
	totalMinor: number;
	depositMinor: number;
	depositKind: 'amount' | 'percent';
	depositValue: number;
	notes: string;
	sentAt: Date | null;
};
export type ClientComment = {
	kind: 'comment' | 'approved' | 'changes';
	body: string;
	authorName: string;
	side: 'studio' | 'client';
	partLabel: string | null;
	partRef: string | null;
	at: Date;
	version: number;
};
export type ClientPhoto = { ref: string; caption: string; width: number; height: number };
export type DepositState = {
	paid: { amountMinor: number; currency: string; paidAt: Date } | null;
	dueMinor: number | null;
	currency: string | null;
	canPay: boolean;
	reason: string | null;
};
/** `reopened`: the client asked for changes after approving, so the studio may change it again. */
export type ApprovalState = {
	version: number;
	at: Date;
	byName: string;
	current: boolean;
	reopened?: boolean;
} | null;

export type ClientView = {
	studioName: string;
	buildName: string;
	clientName: string;
	variantName: string;
	/** The version the client is shown (the latest the studio saved), its date and note. */
	version: number;
	updatedAt: Date;
	versionNote: string;
	/** What changed since the version before it (or the one it was started from), in words. */
	changes: { since: number; lines: string[] } | null;
	sharedBy: string | null;
	enclosure: { name: string; outerMm: Vec3; innerLitres: number };
	summary: FitSummary;
	placed: PlacedPart[];
	lines: PartLine[];
	scene: Scene;
	quote: ClientQuote | null;
	approval: ApprovalState;
	deposit: DepositState;
	comments: ClientComment[];
	photos: ClientPhoto[];
};

export type ClientMay = { comment: boolean; approve: boolean; pay: boolean };

/** What both client pages (share link, in-app) load for the one client view. */
export type ClientPageData = {
	view: ClientView;
	may: ClientMay;
	defaultName: string;
	fixedName: boolean;
	photoBase: string;
	/** `?deposit=` after the payment page sends the viewer back: paid or cancelled. */
	deposit: string | null;
};

/** A comment as the thread shows it, from the client view or from the studio's own list. */
export type ThreadItem = Pick<
	ClientComment,
	'kind' | 'body' | 'authorName' | 'partLabel' | 'version'
> & {
	side: string;
	at: Date | string;
};

/** One variant's standing with the client, for the studio's pages. */
export type ClientStatus = {
	id: string;
	name: string;
	version: number;
	approval: ApprovalState;
	quote: {
		status: 'draft' | 'sent';
		currency: string;
		totalMinor: number;
		depositMinor: number;
	} | null;
	deposit: { amountMinor: number; currency: string; paidAt: Date | null } | null;
	/** Active links only. */
	links: number;
};
