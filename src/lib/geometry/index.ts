/** The fit engine: pure TypeScript, no framework, DOM or Node imports. Millimetres, Y up. */
export * from './schema';
export * from './types';
export * from './box';
export * from './positions';
export * from './errors';
export { placePart, resolveScene } from './resolve';
export {
	FACE_AXES,
	innerSizeMm,
	innerBoxOf,
	innerVolumeLitres,
	wallBoxes,
	dividerBoxAt,
	bracketBoxAt,
	compartmentsFor
} from './enclosure';
export { rotationMap, rotateBox, rotatePoint, rotateDirection } from './rotation';
export { overlappingPairs, overlappingPairsFlat, overlapVolumes, flattenBoxes } from './broadphase';
export { pairKind, isObstacle } from './pairs';
export { checkScene, reportFor, compartmentOf, type ReportOptions } from './check';
export * from './cost';
export {
	mountReport,
	mountReports,
	mountAccepts,
	mountPlates,
	partClasses,
	plateNeeded,
	plateBoxes,
	stackPlate
} from './mounts';
export { unionVolume } from './union';
export { heatBudget, powerBudget } from './budgets';
export { sweep, sweepGrid, feasibleIntervals } from './sweep';
export * from './loop';
export { checkCables, cableBoxes, type CableReport, type CableProblem } from './cables';
