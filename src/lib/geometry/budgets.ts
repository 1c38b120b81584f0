/**
 * Budgets that are not geometry: radiator capacity against heat, supply rating against draw.
 * Both rules of thumb are common practice (from memory) and settable per scene; the heat one is
 * always reported as an estimate.
 */

import { EPSILON_MM } from './box';
import type { Scene } from './schema';
import type { HeatBudget, PowerBudget, ResolvedScene } from './types';

/**
 * Heat of every placed part against radiator capacity: wattsPer120mm for each 120 mm of radiator
 * length, the length being the class (a 280 counts 280 mm; its end tanks do not cool).
 */
export function heatBudget(scene: Scene, resolved: ResolvedScene): HeatBudget {
	let heatW = 0;
	let radiatorLengthMm = 0;
	for (const rp of resolved.placements) {
		heatW += rp.part.specs.heatW ?? 0;
		if (rp.part.category === 'radiator' && rp.part.specs.radiatorClass !== undefined) {
			radiatorLengthMm += rp.part.specs.radiatorClass;
		}
	}
	const wattsPer120mm = scene.budgets.wattsPer120mm;
	const capacityW = (radiatorLengthMm / 120) * wattsPer120mm;
	const status =
		radiatorLengthMm === 0 ? 'unknown' : heatW > capacityW + EPSILON_MM ? 'over' : 'clear';
	return { heatW, capacityW, radiatorLengthMm, wattsPer120mm, isEstimate: true, status };
}

/**
 * Sustained draw of every placed part but the supplies, against the supplies' rating: tight when
 * the rating covers the draw but not the headroom above it, over when it does not cover the draw.
 */
export function powerBudget(scene: Scene, resolved: ResolvedScene): PowerBudget {
	let drawW = 0;
	let ratingW = 0;
	for (const rp of resolved.placements) {
		if (rp.part.category === 'psu') {
			ratingW += rp.part.specs.psuRatingW ?? 0;
		} else {
			drawW += rp.part.specs.powerDrawW ?? 0;
		}
	}
	const headroomPct = scene.budgets.psuHeadroomPct;
	const requiredW = drawW * (1 + headroomPct / 100);
	const status =
		ratingW === 0
			? 'unknown'
			: drawW > ratingW + EPSILON_MM
				? 'over'
				: requiredW > ratingW + EPSILON_MM
					? 'tight'
					: 'clear';
	return { drawW, ratingW, headroomPct, requiredW, status };
}
