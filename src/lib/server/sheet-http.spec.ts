/**
 * The build sheet through the built app (adapter-node, hooks, CSRF, cookies): who may open, tick
 * and download, and the answers a browser gets.
 */
import { describe, expect, it } from 'vitest';
import { createSheetBuild } from './testing/sheet-build';
import { sheetRows } from './testing/sheet-access-rows';
import { runAccessMatrix } from './testing/access-matrix';
import { studioMember } from './testing/factories';
import { useApp } from './testing/suite';

const app = useApp();

runAccessMatrix(sheetRows, app);

describe('over HTTP', () => {
	it('sends the PDF as a download, not to be cached', async () => {
		const { studio, member: designer } = await studioMember('designer');
		const b = await createSheetBuild({
			studioId: studio.id,
			userId: designer.id,
			name: 'Desk build'
		});
		const res = await app
			.client({ session: designer.session })
			.get(`/builds/${b.buildId}/sheet.pdf?variant=${b.variantId}&paper=letter`);
		expect(res.status).toBe(200);
		expect(res.header('content-type')).toBe('application/pdf');
		expect(res.header('content-disposition')).toBe(
			'attachment; filename="build-sheet-desk-build-spine-at-three-slots.pdf"'
		);
		expect(res.header('cache-control')).toBe('private, no-store');
		expect(res.text.startsWith('%PDF-')).toBe(true);
	});

	it('ticks with a plain form post and shows the tick in the page it sends back', async () => {
		const { studio, member: designer } = await studioMember('designer');
		const b = await createSheetBuild({ studioId: studio.id, userId: designer.id });
		const c = app.client({ session: designer.session });
		const res = await c.postForm(`/builds/${b.buildId}/sheet?variant=${b.variantId}&/tick`, {
			variantId: b.variantId,
			key: 'part:board',
			ticked: '1'
		});
		expect(res.status).toBe(200);
		expect(res.text).toMatch(/aria-checked="true"[^>]*aria-label="1\. Mini-ITX board/);
		const bad = await c.action(`/builds/${b.buildId}/sheet?/tick`, {
			variantId: b.variantId,
			key: 'part:nothing',
			ticked: '1'
		});
		expect(bad).toMatchObject({
			type: 'failure',
			status: 400,
			data: { errors: { key: 'This sheet has no such checklist item.' } }
		});
		const unknownVariant = await c.action(`/builds/${b.buildId}/sheet?/tick`, {
			variantId: 'no-such-variant',
			key: 'part:board',
			ticked: '1'
		});
		expect(unknownVariant.status).toBe(404);
	});
});
