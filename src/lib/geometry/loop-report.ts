/** Joins the coolant loops' checks (loop.ts) into the fit report: runs count like bodies. */

import { STATUS_ORDER, type FitReport, type FitStatus, type ResolvedScene } from './types';
import { checkLoops, partsHitByRuns, type RunCache } from './loop';
import { checkCables } from './cables';
import type { Scene } from './schema';

/**
 * The report with `loops` added when the scene has any; a part a tube or fitting collides with
 * or blocks takes that status (and the counts follow), as it would for another part's body.
 */
export function withLoops(
	scene: Scene,
	resolved: ResolvedScene,
	cache: RunCache | undefined,
	report: FitReport
): FitReport {
	// Power cables are checked like runs, clear of the runs too; they change no part's status.
	if (!scene.loops?.length) {
		if (scene.cables?.length) report.cables = checkCables(scene, resolved);
		return report;
	}
	const loops = checkLoops(scene, resolved, cache);
	const hit = partsHitByRuns(loops);
	for (const part of report.parts) {
		const kind = hit.get(part.placementId);
		if (!kind) continue;
		const worse: FitStatus =
			STATUS_ORDER.indexOf(kind) < STATUS_ORDER.indexOf(part.status) ? kind : part.status;
		if (worse !== part.status) {
			report.totals.counts[part.status]--;
			report.totals.counts[worse]++;
			part.status = worse;
		}
	}
	report.loops = loops;
	if (scene.cables?.length) report.cables = checkCables(scene, resolved, loops);
	return report;
}
