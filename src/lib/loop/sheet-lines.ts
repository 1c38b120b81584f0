/**
 * The build sheet's loop lines: the cut list per run, the tube to buy per kind and the fittings
 * per thread from the loop's bill (replacing the count from ports alone), and the loop checks.
 */
import { loopBill, type FitReport, type LoopBill, type Scene } from '$lib/geometry';

export interface LoopSheet {
	bill: LoopBill;
	/** "Run 3: 142.0 mm of 16 mm hard tube, bends at 35.0 and 98.0 mm from the pump end". */
	cutList: { key: string; text: string }[];
	/** "Hard tube 16 mm: 0.84 m cut over 2 runs, buy 0.92 m (10 % allowance)". */
	tubes: { key: string; text: string }[];
	/** Per thread: "4 × G 1/4: 4 × Straight compression fitting, 16 mm hard tube; 1 × Stop plug". */
	fittings: { key: string; thread: string; count: number; text: string }[];
	checks: { key: string; text: string; detail: string }[];
}

const STATUS_WORDS = { pass: 'Passes', fail: 'Fails', warn: 'Check', advice: 'Advice' } as const;

function metres(mm: number): string {
	return `${(mm / 1000).toFixed(2)} m`;
}

/** Null when the scene has no loop (the sheet then counts fittings from the ports, as before). */
export function loopSheet(
	scene: Scene,
	report: FitReport,
	cutAllowancePct: number
): LoopSheet | null {
	if (!report.loops?.length) return null;
	const bill = loopBill(scene, report.loops, cutAllowancePct);
	const threads = new Map<string, LoopBill['fittings']>();
	for (const f of bill.fittings) threads.set(f.thread, [...(threads.get(f.thread) ?? []), f]);
	return {
		bill,
		cutList: bill.cutList.map((c) => ({ key: `loop:cut:${c.runNumber}`, text: `${c.text}.` })),
		tubes: bill.tubes.map((t) => ({
			key: `loop:tube:${t.tubeKindId}`,
			text: `${t.name}: ${metres(t.cutMm)} cut over ${t.runs} ${t.runs === 1 ? 'run' : 'runs'}, buy ${metres(t.withAllowanceMm)} (${bill.cutAllowancePct} % allowance).`
		})),
		fittings: [...threads.entries()].map(([thread, list]) => {
			const count = list.reduce((n, f) => n + f.count, 0);
			return {
				key: `fittings:${thread}`,
				thread,
				count,
				text: `${count} × ${thread}: ${list.map((f) => `${f.count} × ${f.name}`).join('; ')}.`
			};
		}),
		checks: report.loops.flatMap((loop) =>
			loop.checks.map((c) => ({
				key: `loop:check:${loop.loopId}:${c.id}`,
				text: `${STATUS_WORDS[c.status]}: ${c.title}.`,
				detail: c.reason
			}))
		)
	};
}
