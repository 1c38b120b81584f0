/** The one mapping from a service's refusal to HTTP: JSON problem, form failure, error page. */
import { isActionFailure, isHttpError } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import { ServiceError, forForm, forJson, forPage, jsonRoute, toHttp } from './errors';
import { SceneRejected, VariantRuleError } from './builds';
import { RuleError } from './accounts';
import { PhotoRejected } from './sharing/photos';
import { QuoteLocked } from './sharing/quotes';

async function thrown(fn: () => unknown): Promise<unknown> {
	try {
		await fn();
	} catch (e) {
		return e;
	}
	throw new Error('did not throw');
}

describe('ServiceError', () => {
	it.each([
		['invalid', 400],
		['forbidden', 403],
		['not-found', 404],
		['conflict', 409],
		['locked', 409],
		['gone', 410],
		['too-large', 413],
		['unsupported-type', 415],
		['over-limit', 422],
		['rate-limited', 429],
		['busy', 503]
	] as const)('%s answers %i', (kind, status) => {
		expect(new ServiceError(kind, 'x').status).toBe(status);
	});

	it('the services’ own classes are ServiceErrors with their old statuses', () => {
		expect(new VariantRuleError('No such variant in this build.', 'not-found').status).toBe(404);
		expect(new QuoteLocked().status).toBe(409);
		expect(new PhotoRejected('Too big', 'too-large')).toMatchObject({ status: 413, field: 'file' });
		const scene = new SceneRejected([{ path: 'placements[0].partId', message: 'Unknown part' }]);
		expect(scene).toBeInstanceOf(ServiceError);
		expect(scene).toMatchObject({ status: 400, message: 'placements[0].partId: Unknown part' });
	});
});

describe('toHttp', () => {
	it('JSON: {message, issues}, the headline only over issues, detail members kept', async () => {
		const scene = new SceneRejected([{ path: 'enclosureId', message: 'No such enclosure' }]);
		const res = toHttp(scene, { as: 'json', headline: 'The scene was not saved.' });
		expect(res.status).toBe(400);
		expect(await res.json()).toEqual({
			message: 'The scene was not saved.',
			issues: [{ path: 'enclosureId', message: 'No such enclosure' }]
		});
		const photo = toHttp(new PhotoRejected('The file is empty.'), { as: 'json', headline: 'x' });
		expect(await photo.json()).toEqual({
			message: 'The file is empty.',
			issues: [{ path: 'file', message: 'The file is empty.' }]
		});
		const limit = new ServiceError('over-limit', 'Too many boxes', {
			issues: [{ path: 'placements', message: 'Too many boxes' }],
			detail: { limit: 'boxes', max: 5000 }
		});
		expect(await toHttp(limit, { as: 'json' }).json()).toMatchObject({
			message: 'Too many boxes',
			limit: 'boxes',
			max: 5000
		});
	});

	it('form: the message on the error’s field, else the route’s, else the whole form', () => {
		const own = toHttp(new RuleError('No such member.', 'userId', 'not-found'), {
			as: 'form',
			field: 'x'
		});
		expect(own).toMatchObject({
			status: 404,
			data: { values: {}, errors: { userId: 'No such member.' } }
		});
		const routes = toHttp(new VariantRuleError('Read-only'), {
			as: 'form',
			field: 'startFrom',
			values: { variantId: 'v1' }
		});
		expect(routes).toMatchObject({
			status: 400,
			data: { values: { variantId: 'v1' }, errors: { startFrom: 'Read-only' } }
		});
		expect(toHttp(new QuoteLocked(), { as: 'form' }).data.errors).toEqual({
			_: 'The deposit on this quote is paid, so it can no longer change.'
		});
		// A page may answer a kind with another status (the members page: a refused rule is 400).
		const last = new RuleError('The last owner…', 'role', 'conflict');
		expect(toHttp(last, { as: 'form', statusFor: { conflict: 400 } }).status).toBe(400);
		expect(toHttp(last, { as: 'form', status: 422 }).status).toBe(422);
	});

	it('page: error(status, message)', async () => {
		const e = await thrown(() =>
			toHttp(new RuleError('Not yours.', 'studioId', 'not-found'), { as: 'page' })
		);
		expect(isHttpError(e, 404) && e.body.message).toBe('Not yours.');
	});
});

describe('the wrappers', () => {
	const refuse = async (): Promise<string> => {
		throw new VariantRuleError('A build keeps at least one variant.', 'conflict');
	};

	it('pass results and other errors through untouched', async () => {
		expect(await forForm(async () => 'ok')).toBe('ok');
		expect(await forPage(async () => 3)).toBe(3);
		const bug = new TypeError('a bug');
		expect(await thrown(() => forForm(() => Promise.reject(bug)))).toBe(bug);
		expect(await thrown(() => forJson(() => Promise.reject(bug)))).toBe(bug);
		expect(await thrown(() => jsonRoute(() => Promise.reject(bug))({}))).toBe(bug);
	});

	it('turn a ServiceError into the answer of their kind', async () => {
		const failed = await forForm(refuse);
		expect(isActionFailure(failed) && failed.status).toBe(409);
		const json = await forJson(refuse);
		expect(json instanceof Response && json.status).toBe(409);
		const routed = await jsonRoute(async () => new Response(await refuse()))({});
		expect(routed.status).toBe(409);
		expect(isHttpError(await thrown(() => forPage(refuse)), 409)).toBe(true);
	});
});
