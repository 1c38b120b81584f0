/**
 * Variants and the comparison through the built app: who may fork, rename, reorder, delete and
 * compare, and what a bad request gets.
 */
import { describe, expect, it } from 'vitest';
import { demoBuildIn } from './testing/builds';
import { runAccessMatrix } from './testing/access-matrix';
import { studioMember } from './testing/factories';
import { useApp } from './testing/suite';
import { variantRows } from './testing/variants-access-rows';

const app = useApp();

runAccessMatrix(variantRows, app);

describe('variants over HTTP', () => {
	it('refuses to delete the last variant and says why', async () => {
		const { studio, member: designer } = await studioMember('designer');
		const b = await demoBuildIn(studio.id, designer.id);
		const client = app.client();
		await client.signIn(designer.email, designer.password);
		const res = await client.action(`/builds/${b.buildId}/variants?/delete`, {
			variantId: b.variantId,
			confirm: 'yes'
		});
		expect(res.status).toBe(409);
		expect(JSON.stringify(res.data)).toContain('last one');
	});

	it('answers 400 for a comparison of one variant, 404 for a variant of another build', async () => {
		const { studio, member: designer } = await studioMember('designer');
		const b = await demoBuildIn(studio.id, designer.id);
		const other = await demoBuildIn(studio.id, designer.id);
		const client = app.client();
		await client.signIn(designer.email, designer.password);
		expect((await client.get(`/builds/${b.buildId}/compare?variants=${b.variantId}`)).status).toBe(
			400
		);
		expect(
			(await client.get(`/builds/${b.buildId}/compare?variants=${b.variantId},${other.variantId}`))
				.status
		).toBe(404);
	});
});
