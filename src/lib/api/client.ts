/**
 * The few fetch calls the browser makes. Components never call fetch directly; they go through
 * here, so the request and response shapes live in one place.
 */
import type {
	FieldIssue,
	FitReport,
	PartDef,
	SweepGridResult,
	SweepResult,
	SceneInput
} from '$lib/geometry';
import type { VariantSettings } from '$lib/builds/settings';
import type { FitRow, FitTarget, PartsByPositions, RadiatorCombination } from '$lib/builds/fits';

export type Problem = { message: string; issues: FieldIssue[] };

/** A refusal in one line: its message and the first field it names. */
export function problemText(problem: Problem): string {
	const first = problem.issues[0];
	return first ? `${problem.message} ${first.path}: ${first.message}` : problem.message;
}

export type SaveOutcome =
	| { kind: 'saved'; version: number; report: FitReport }
	| { kind: 'conflict'; version: number; settings: VariantSettings; updatedAt: string }
	| { kind: 'rejected'; status: number; problem: Problem };

type Fetch = typeof fetch;

async function problemOf(res: Response): Promise<Problem> {
	try {
		const body = (await res.json()) as Partial<Problem>;
		return { message: body.message ?? res.statusText, issues: body.issues ?? [] };
	} catch {
		return { message: `${res.status} ${res.statusText}`, issues: [] };
	}
}

export async function saveVariant(
	f: Fetch,
	buildId: string,
	variantId: string,
	version: number,
	settings: VariantSettings
): Promise<SaveOutcome> {
	const res = await f(
		`/api/builds/${encodeURIComponent(buildId)}/variants/${encodeURIComponent(variantId)}`,
		{
			method: 'PUT',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ version, settings })
		}
	);
	if (res.status === 409) {
		const body = (await res.json()) as {
			message?: string;
			conflict?: { version: number; settings: VariantSettings; updatedAt: string };
		};
		// A 409 without a newer scene is a refusal (the variant is read-only), not a conflict.
		if (body.conflict) return { kind: 'conflict', ...body.conflict };
		return {
			kind: 'rejected',
			status: 409,
			problem: { message: body.message ?? 'Not saved.', issues: [] }
		};
	}
	if (!res.ok) return { kind: 'rejected', status: res.status, problem: await problemOf(res) };
	const body = (await res.json()) as { version: number; report: FitReport };
	return { kind: 'saved', ...body };
}

export async function checkOnServer(
	f: Fetch,
	buildId: string,
	settings: VariantSettings
): Promise<FitReport | Problem> {
	const res = await f(`/api/builds/${encodeURIComponent(buildId)}/check`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify({ settings })
	});
	if (!res.ok) return problemOf(res);
	return (await res.json()) as FitReport;
}

export async function sweepOnServer(
	f: Fetch,
	body: {
		scene: SceneInput;
		control: { kind: 'divider' | 'bracket'; id: string };
		controlB?: { kind: 'divider' | 'bracket'; id: string };
	}
): Promise<SweepResult | SweepGridResult | Problem> {
	const res = await f('/api/sweep', {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify(body)
	});
	if (!res.ok) return problemOf(res);
	return res.json();
}

export type PartHit = {
	id: string;
	name: string;
	category: string;
	widthMm: number;
	heightMm: number;
	depthMm: number;
	isStandard: boolean;
	def: PartDef;
};

export async function searchParts(f: Fetch, q: string, category = ''): Promise<PartHit[]> {
	const params = new URLSearchParams({ search: '1', q, limit: '20' });
	if (category) params.set('category', category);
	const res = await f(`/api/parts?${params}`);
	if (!res.ok) return [];
	const body = (await res.json()) as { parts: PartHit[] };
	return body.parts;
}

export type FitsRequest = {
	scene: SceneInput;
	target: FitTarget;
	filters?: { category?: string; q?: string; partIds?: string[] };
	sort?: 'spare' | 'price' | 'name';
	limit?: number;
	positions?: { kind: 'divider' | 'bracket'; id: string };
	combinations?: boolean;
	stream?: boolean;
};
export type FitsAnswer = {
	label: string;
	counts: { fits: number; left: number };
	fits: FitRow[];
	left: FitRow[];
	parts: Record<string, PartDef>;
	partsByPositions?: PartsByPositions;
	combinations?: RadiatorCombination[];
};

/** What fits at a target: the studio's parts and the standard library, ranked by the server. */
export async function fitsOnServer(f: Fetch, body: FitsRequest): Promise<FitsAnswer | Problem> {
	const res = await f('/api/fits', {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify(body)
	});
	if (!res.ok) return problemOf(res);
	return (await res.json()) as FitsAnswer;
}

/** One line of a streamed "what fits here": a chunk of candidates, ranked within it. */
export type FitsChunk = {
	label: string;
	fits: FitRow[];
	left: FitRow[];
	parts: Record<string, PartDef>;
	done: number;
	total: number;
};

/**
 * What fits at a target for a large catalogue: the server answers a line per chunk of parts
 * checked, and `onChunk` gets each as it arrives (the caller merges and ranks them).
 */
export async function fitsStreamed(
	f: Fetch,
	body: Omit<FitsRequest, 'stream' | 'positions' | 'combinations'>,
	onChunk: (chunk: FitsChunk) => void
): Promise<Problem | null> {
	const res = await f('/api/fits', {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify({ ...body, stream: true })
	});
	if (!res.ok) return problemOf(res);
	if (!res.body) {
		for (const line of (await res.text()).split('\n')) if (line) onChunk(JSON.parse(line));
		return null;
	}
	const reader = res.body.pipeThrough(new TextDecoderStream()).getReader();
	let rest = '';
	for (;;) {
		const { value, done } = await reader.read();
		if (value) rest += value;
		let nl = rest.indexOf('\n');
		while (nl >= 0) {
			const line = rest.slice(0, nl);
			rest = rest.slice(nl + 1);
			if (line) onChunk(JSON.parse(line) as FitsChunk);
			nl = rest.indexOf('\n');
		}
		if (done) break;
	}
	if (rest.trim()) onChunk(JSON.parse(rest) as FitsChunk);
	return null;
}
