/**
 * A canonical summary of a fit report, for telling whether the browser's and the server's checks
 * agree. Volumes and gaps are rounded to a micrometre so float noise never counts as a difference.
 */
import type { FitReport } from '$lib/geometry';

const r = (v: number | null) => (v === null ? 'null' : (Math.round(v * 1000) / 1000).toFixed(3));

export function reportDigest(report: FitReport): string {
	const overlaps = report.overlaps.map((o) => `${o.a.id}|${o.b.id}|${o.kind}|${r(o.volumeMm3)}`);
	const parts = report.parts.map(
		(p) =>
			`${p.placementId}:${p.status}:${Object.values(p.gaps)
				.map((g) => r(g.gapMm))
				.join(',')}`
	);
	const mounts = report.mounts.map((m) => `${m.mountId}:${m.status}:${r(m.spareMm)}`);
	const b = report.budgets;
	if (report.overlapsNotListed > 0) overlaps.push(`+${report.overlapsNotListed}`);
	return [
		overlaps.join(';'),
		parts.join(';'),
		mounts.join(';'),
		`${r(b.heat.heatW)}/${r(b.heat.capacityW)}`,
		`${r(b.power.drawW)}/${r(b.power.ratingW)}`
	].join('\n');
}
