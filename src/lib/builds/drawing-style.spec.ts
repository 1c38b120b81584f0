/**
 * The status marks survive grey-scale: each fill's lightness differs from every other's by at
 * least 15 L*. Lightness is CIE 1976 L*a*b* L* from sRGB (IEC 61966-2-1 transfer curve, D65 white,
 * Y from the sRGB primaries' luminance row), computed here from the formula, not looked up.
 */
import { describe, expect, it } from 'vitest';
import { STATUS_ORDER } from '$lib/geometry';
import { STATUS_STYLE } from '$lib/scene/palette';
import { STATUS_FILL, STATUS_INK, thirdAngleSymbol } from './drawing-style';

/** sRGB hex → CIE 1976 L* (0 black … 100 white), D65. */
function lightness(hex: string): number {
	const channel = (i: number) => {
		const c = parseInt(hex.slice(i, i + 2), 16) / 255;
		return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
	};
	const [r, g, b] = [channel(1), channel(3), channel(5)];
	// Relative luminance Y (Yn = 1 for D65): the middle row of the sRGB → XYZ matrix.
	const y = 0.2126729 * r + 0.7151522 * g + 0.072175 * b;
	const eps = 216 / 24389;
	const kappa = 24389 / 27;
	const f = y > eps ? Math.cbrt(y) : (kappa * y + 16) / 116;
	return 116 * f - 16;
}

describe('status marks in grey-scale', () => {
	it('the formula: white is 100, black 0, mid grey #777777 about 50 (worked value 50.0)', () => {
		expect(lightness('#ffffff')).toBeCloseTo(100, 5);
		expect(lightness('#000000')).toBeCloseTo(0, 5);
		// #777777: c = 119/255 = 0.4667 → linear 0.1845 → f = 0.5692 → L* = 116·0.5692 − 16 = 50.03.
		expect(lightness('#777777')).toBeCloseTo(50.03, 1);
	});

	it('every status differs from every other by at least 15 L*', () => {
		const ls = STATUS_ORDER.map((s) => [s, lightness(STATUS_FILL[s])] as const);
		for (const [a, la] of ls) {
			for (const [b, lb] of ls) {
				if (a !== b) expect(Math.abs(la - lb), `${a} vs ${b}`).toBeGreaterThanOrEqual(15);
			}
		}
	});

	it('screen, sheet and PDF use the same fills, and each status its own pattern', () => {
		for (const s of STATUS_ORDER) {
			expect(STATUS_STYLE[s].color).toBe(STATUS_FILL[s]);
			expect(STATUS_INK[s].fill).toBe(STATUS_FILL[s]);
		}
		const patterns = STATUS_ORDER.map((s) => STATUS_INK[s].pattern);
		expect(new Set(patterns).size).toBe(STATUS_ORDER.length);
		expect(STATUS_INK.collides.pattern).toBe('crosshatch');
	});
});

describe('the third-angle symbol (ISO 128 / ISO 5456-2 proportions, from memory)', () => {
	const h = 2.5;
	const s = thirdAngleSymbol(h);
	const [outer, inner] = s.circles;
	const [smallTop, largeTop, largeBottom, smallBottom] = s.outline;

	it("a truncated cone: the end view's circles are the side view's two ends", () => {
		// H = 2h = 5 mm: the large end 5 mm across, the small end 2.5 mm, lines h/10 = 0.25 mm.
		expect(outer.r * 2).toBeCloseTo(2 * h, 9);
		expect(inner.r * 2).toBeCloseTo(h, 9);
		expect(largeBottom[1] - largeTop[1]).toBeCloseTo(outer.r * 2, 9);
		expect(smallBottom[1] - smallTop[1]).toBeCloseTo(inner.r * 2, 9);
		expect(largeTop[0] - smallTop[0]).toBeCloseTo(2 * h, 9);
		expect(s.lineMm).toBeCloseTo(h / 10, 9);
		expect(outer.cx).toBe(inner.cx);
		// One axis through both views' centres.
		expect(s.axis[1]).toBe(outer.cy);
		expect((smallTop[1] + smallBottom[1]) / 2).toBeCloseTo(s.axis[1], 9);
	});

	it("third-angle: the end view seen from the small end sits on the small end's side", () => {
		// Two full circles: the view from the small end (from the large end the small one is hidden).
		expect(outer.cx + outer.r).toBeLessThan(smallTop[0]);
		expect(smallTop[0]).toBeLessThan(largeTop[0]);
		// Everything inside the stated box, the axis past both views.
		expect(s.axis[0]).toBeLessThan(outer.cx - outer.r);
		expect(s.axis[2]).toBeGreaterThan(largeTop[0]);
		expect(s.axis[2]).toBeCloseTo(s.widthMm, 9);
		expect(s.heightMm).toBeCloseTo(2 * h, 9);
	});
});
