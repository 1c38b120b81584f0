/**
 * The build sheet against a real PostgreSQL: the PDF is made, is a PDF, and says what the sheet
 * says (text pulled out with unpdf, a general-purpose PDF library); ticks are stored per variant
 * and only studio members who edit may set them; the quote shows when there is one.
 * Page sizes: ISO 216 (A4, 210 × 297 mm) and ANSI/ASME Y14.1 (Letter, 8.5 × 11 in), 72 pt to the inch.
 */
import { isHttpError } from '@sveltejs/kit';
import { extractText, getDocumentProxy } from 'unpdf';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_SPINE_OFFSETS } from '$lib/geometry/standard-library';
import { closeDb } from './db';
import sharp from 'sharp';
import { createShareLink } from './sharing/links';
import { addPhoto } from './sharing/photos';
import { ensureQuote } from './sharing/quotes';
import { TickRejected, loadSheet, setTick } from './sheet';
import { renderSheetPdf } from './sheet-pdf';
import { createSheetBuild, type SheetTestBuild } from './testing/sheet-build';
import { shareWithClient } from './testing/sharing';
import { createMember, createStudio, type TestMember } from './testing/factories';

type Who = TestMember;
const localsOf = (u: Who) => ({
	user: { id: u.id, email: u.email, name: u.name, activeStudioId: null }
});
const urlOf = (b: SheetTestBuild, query = '') =>
	new URL(`http://127.0.0.1/builds/${b.buildId}/sheet?variant=${b.variantId}${query}`);

async function pdfText(pdf: Buffer) {
	const doc = await getDocumentProxy(new Uint8Array(pdf));
	const { text } = await extractText(doc, { mergePages: true });
	const page = await doc.getPage(1);
	// Thin spaces and line breaks come out in different ways; compare words, not whitespace.
	return { text: text.replace(/[\s\u2009\u202f]+/g, ' '), pages: doc.numPages, view: page.view };
}

let designer: Who;
let client: Who;
let outsider: Who;
let build: SheetTestBuild;

beforeAll(async () => {
	const studio = await createStudio();
	const other = await createStudio();
	[designer, client, outsider] = await Promise.all([
		createMember(studio.id, 'designer'),
		createMember(studio.id, 'client'),
		createMember(other.id, 'owner')
	]);
	build = await createSheetBuild({
		studioId: studio.id,
		userId: designer.id,
		name: 'Bench sheet build'
	});
	// A client sees a build through the variants shared with them (access.ts).
	await shareWithClient({ studio, designer, client }, build);
});

afterAll(async () => {
	await closeDb();
});

describe('the PDF', () => {
	it('is a PDF with the divider position and a known gap in its text', async () => {
		const pdf = await renderSheetPdf(
			await loadSheet(localsOf(designer), build.buildId, urlOf(build))
		);
		expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
		expect(pdf.subarray(-6).toString('latin1')).toMatch(/%%EOF\s*$/);
		const { text, pages } = await pdfText(pdf);
		expect(pages).toBeGreaterThanOrEqual(4);
		expect(text).toContain('Spine at position 3 slots, x = 86.0 mm');
		// The CPU block's top at 11 mm standoff + 1.6 mm board + 26 mm block = 38.6 mm; spine at 86 mm.
		// With the block's ±0.5 mm taken off for the worst case.
		expect(text).toContain('47.4 mm (46.9 worst case) to the right (Spine)');
		// The card's far face at 107.36 + 2 × 20.32 mm (PCI Express CEM slot pitch) = 148 mm, 2 mm short of the right panel.
		expect(text).toContain('2.0 mm (1.0 worst case) to the right (Right panel)');
		expect(text).toContain('Leak-test with only the pump powered');
		expect(text).toContain('local codes or licensed practice');
	});

	it('embeds Space Grotesk', async () => {
		const pdf = await renderSheetPdf(
			await loadSheet(localsOf(designer), build.buildId, urlOf(build))
		);
		expect(pdf.toString('latin1')).toMatch(/\/BaseFont \/[A-Z]{6}\+SpaceGrotesk/);
	});

	it.each([
		['', 'A4', 595.28, 841.89],
		['&paper=letter', 'Letter', 612, 792]
	])('is laid out for the paper asked for (%s → %s)', async (query, _name, w, h) => {
		const { view } = await pdfText(
			await renderSheetPdf(await loadSheet(localsOf(designer), build.buildId, urlOf(build, query)))
		);
		expect(view[2]).toBeCloseTo(w, 1);
		expect(view[3]).toBeCloseTo(h, 1);
	});

	it('lists the collision of the two-slot variant with its numbers', async () => {
		const two = await createSheetBuild({
			studioId: (await loadSheetStudio()).studioId,
			adjust: (s) => (s.dividerPositions.spine = DEMO_SPINE_OFFSETS['2 slots'])
		});
		const { text } = await pdfText(
			await renderSheetPdf(await loadSheet(localsOf(designer), two.buildId, urlOf(two)))
		);
		expect(text).toContain('Not ready to build');
		// The spine (106.32–108.32 mm) reaches 0.96 mm into the card standing from 107.36 mm.
		expect(text).toContain('Compact graphics card, two slots, 185 mm collides with Spine');
		expect(text).toContain('0.96 mm');
	});

	it('is refused to someone outside the studio, and to a client it was not shared with', async () => {
		const err = await loadSheet(localsOf(outsider), build.buildId, urlOf(build)).catch((e) => e);
		expect(isHttpError(err) && err.status).toBe(404);
		const { studioId } = await loadSheetStudio();
		const unshared = await createSheetBuild({ studioId });
		const hidden = await loadSheet(localsOf(client), unshared.buildId, urlOf(unshared)).catch(
			(e) => e
		);
		expect(isHttpError(hidden) && hidden.status).toBe(404);
	});
});

async function loadSheetStudio() {
	const data = await loadSheet(localsOf(designer), build.buildId, urlOf(build));
	const { db } = await import('./db');
	const { builds } = await import('./db/schema');
	const { eq } = await import('drizzle-orm');
	const [row] = await db
		.select({ studioId: builds.studioId })
		.from(builds)
		.where(eq(builds.id, data.build.id));
	return row;
}

describe('ticks', () => {
	it('are saved per variant and item, and come back on the next load', async () => {
		await setTick(localsOf(designer), build.buildId, {
			variantId: build.variantId,
			key: 'caution:leak-test',
			ticked: '1'
		});
		await setTick(localsOf(designer), build.buildId, {
			variantId: build.variantId,
			key: 'part:board',
			ticked: '1'
		});
		let data = await loadSheet(localsOf(client), build.buildId, urlOf(build));
		expect(Object.keys(data.ticks).sort()).toEqual(['caution:leak-test', 'part:board']);
		expect(data.ticks['part:board']).toMatchObject({ by: designer.name, earlierVersion: false });
		expect(data.canTick).toBe(false);
		await setTick(localsOf(designer), build.buildId, {
			variantId: build.variantId,
			key: 'part:board',
			ticked: '0'
		});
		data = await loadSheet(localsOf(designer), build.buildId, urlOf(build));
		expect(Object.keys(data.ticks)).toEqual(['caution:leak-test']);
		expect(data.canTick).toBe(true);
	});

	it('show ticked boxes in the PDF', async () => {
		const { text } = await pdfText(
			await renderSheetPdf(await loadSheet(localsOf(designer), build.buildId, urlOf(build)))
		);
		expect(text).toContain(`Ticked by ${designer.name}`);
	});

	it('refuse a key the sheet does not have', async () => {
		await expect(
			setTick(localsOf(designer), build.buildId, {
				variantId: build.variantId,
				key: 'part:no-such-part',
				ticked: '1'
			})
		).rejects.toBeInstanceOf(TickRejected);
	});

	it('are not the client’s to set', async () => {
		const err = await setTick(localsOf(client), build.buildId, {
			variantId: build.variantId,
			key: 'caution:unplug',
			ticked: '1'
		}).catch((e) => e);
		expect(isHttpError(err) && err.status).toBe(403);
	});
});

describe('photos on the sheet', () => {
	it('lists the build’s photos and embeds their thumbnails in the PDF', async () => {
		const { studioId } = await loadSheetStudio();
		const pictured = await createSheetBuild({ studioId });
		const bytes = await sharp({
			create: { width: 64, height: 48, channels: 3, background: '#2e9d83' }
		})
			.jpeg()
			.toBuffer();
		await addPhoto({
			buildId: pictured.buildId,
			uploadedBy: designer.id,
			bytes,
			caption: 'Loop filled'
		});
		const data = await loadSheet(localsOf(designer), pictured.buildId, urlOf(pictured));
		expect(data.photos.map((p) => p.caption)).toEqual(['Loop filled']);
		const pdf = await renderSheetPdf(data);
		expect(pdf.toString('latin1')).toMatch(/\/Subtype \/Image/);
		expect((await pdfText(pdf)).text).toContain('Loop filled');
	});
});

describe('the quote on the sheet', () => {
	it('shows a draft to the studio only, and its lines reach the PDF', async () => {
		const { studioId } = await loadSheetStudio();
		const quoted = await createSheetBuild({ studioId });
		const data0 = await loadSheet(localsOf(designer), quoted.buildId, urlOf(quoted));
		expect(data0.quote).toBeNull();
		const { variantsOf } = await import('./builds');
		const [variant] = await variantsOf(quoted.buildId);
		await ensureQuote({
			studioId,
			buildId: quoted.buildId,
			variantId: quoted.variantId,
			settings: variant.settings,
			currency: 'EUR'
		});
		const data = await loadSheet(localsOf(designer), quoted.buildId, urlOf(quoted));
		expect(data.quote?.draft).toBe(true);
		expect(data.quote?.lines.map((l) => l.description)).toContain('Mini-ITX board');
		await createShareLink({
			studioId,
			buildId: quoted.buildId,
			variantId: quoted.variantId,
			createdBy: designer.id,
			recipientEmail: client.email
		});
		expect((await loadSheet(localsOf(client), quoted.buildId, urlOf(quoted))).quote).toBeNull();
		const { text } = await pdfText(await renderSheetPdf(data));
		expect(text).toContain('Quote');
		expect(text).toContain('Draft: not yet sent to the client.');
	});
});
