/**
 * The engine's work in a worker thread (see pool.ts): a check, a sweep or a route search of a
 * scene that already passed the schema and the cost limits. Relative imports only: in development this file runs in
 * a worker under tsx, which knows no `$lib` alias.
 */
import {
	SceneError,
	checkScene,
	sweep,
	sweepGrid,
	type FitReport,
	type GapRequest,
	type Scene,
	type SweepControl,
	type SweepGridResult,
	type SweepResult
} from '../../geometry/index';
import { findRoute, type RouteInput, type RouteResult } from '../../geometry/route';

/** This module's own file, for the pool to start workers on (see pool.ts). */
export const workerUrl = import.meta.url;

export type EngineTask =
	| { kind: 'check'; scene: Scene }
	| {
			kind: 'sweep';
			scene: Scene;
			control: SweepControl;
			positions?: number[];
			gaps?: GapRequest[];
	  }
	| { kind: 'route'; input: RouteInput }
	| {
			kind: 'grid';
			scene: Scene;
			controlA: SweepControl;
			controlB: SweepControl;
			gaps?: GapRequest[];
	  };

/** A SceneError crosses the thread as a value (a class does not survive the structured clone). */
export type EngineAnswer =
	| { ok: true; value: FitReport | SweepResult | SweepGridResult | RouteResult }
	| { ok: false; path: string; message: string };

export default function run(task: EngineTask): EngineAnswer {
	try {
		if (task.kind === 'check') return { ok: true, value: checkScene(task.scene) };
		if (task.kind === 'route') return { ok: true, value: findRoute(task.input) };
		if (task.kind === 'sweep') {
			return {
				ok: true,
				value: sweep(task.scene, {
					control: task.control,
					positions: task.positions,
					gaps: task.gaps
				})
			};
		}
		return {
			ok: true,
			value: sweepGrid(task.scene, task.controlA, task.controlB, { gaps: task.gaps })
		};
	} catch (e) {
		if (e instanceof SceneError) return { ok: false, path: e.path, message: e.message };
		throw e;
	}
}
