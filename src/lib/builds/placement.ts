/**
 * Where a part lands when the builder adds it, and the small moves the editor makes. Pure: the
 * browser and tests call it alike. Millimetres, Y up, inner-origin coordinates.
 */
import {
	EPSILON_MM,
	FACE_AXES,
	allowedPositions,
	boundsOf,
	boxSize,
	mountAccepts,
	stackPlate,
	placePart,
	rotateBox,
	rotationMap,
	type AxisIndex,
	type BracketDef,
	type Box,
	type DividerDef,
	type MountDef,
	type PartDef,
	type Placement,
	type ResolvedScene,
	type Rotation,
	type Vec3
} from '$lib/geometry';

/** The 24 quarter-turn orientations, fewest turns first, so the simplest one wins a tie. */
const ORIENTATIONS: Rotation[] = (() => {
	const seen = new Set<string>();
	const out: Rotation[] = [];
	const all: Rotation[] = [];
	for (let x = 0; x < 4; x++) {
		for (let y = 0; y < 4; y++) for (let z = 0; z < 4; z++) all.push({ x, y, z });
	}
	all.sort((a, b) => a.x + a.y + a.z - (b.x + b.y + b.z));
	for (const r of all) {
		const m = rotationMap(r);
		const key = `${m.from.join()}|${m.sign.join()}`;
		if (!seen.has(key)) {
			seen.add(key);
			out.push(r);
		}
	}
	return out;
})();
const ORIENTATION_MAPS = ORIENTATIONS.map(rotationMap);

function turnedSize(part: PartDef, rotation: Rotation): Vec3 {
	const map = rotationMap(rotation);
	return boxSize(boundsOf(part.bodies.map((b) => rotateBox(map, b.box))));
}

function overlaps(a: Box, b: Box): boolean {
	for (let i = 0; i < 3; i++) {
		if (a.max[i] - b.min[i] <= EPSILON_MM || b.max[i] - a.min[i] <= EPSILON_MM) return false;
	}
	return true;
}

function inside(inner: Box, b: Box): boolean {
	for (let i = 0; i < 3; i++) {
		if (b.min[i] < inner.min[i] - EPSILON_MM || b.max[i] > inner.max[i] + EPSILON_MM) return false;
	}
	return true;
}

function boxAt(position: Vec3, size: Vec3): Box {
	return {
		min: [...position],
		max: [position[0] + size[0], position[1] + size[1], position[2] + size[2]]
	};
}

/**
 * Boxes a new part must not overlap: dividers, brackets, every placed body and keep-out (a part
 * dropped into a fitting's access room would land blocked).
 */
function obstacles(resolved: ResolvedScene, ignore?: string): Box[] {
	return [
		...resolved.dividers.map((d) => d.box),
		...resolved.brackets.map((b) => b.box),
		...resolved.placements
			.filter((p) => p.placement.id !== ignore)
			.flatMap((p) => [...p.bodies, ...p.keepouts].map((b) => b.box))
	];
}

/**
 * The lowest, front-most, left-most spot in `room` where a box of `size` overlaps nothing.
 * Candidates are the room's corner and the far faces of every obstacle (the corner-point method),
 * so the search is exact without a grid. Null when nothing fits.
 */
export function freeSpot(room: Box, size: Vec3, blocked: Box[]): Vec3 | null {
	// Nothing in the way (an empty mount): the room's corner is the only candidate.
	if (blocked.length === 0) {
		const corner: Vec3 = [room.min[0], room.min[1], room.min[2]];
		return inside(room, boxAt(corner, size)) ? corner : null;
	}
	const coords = [0, 1, 2].map((a) => {
		const values = new Set<number>([room.min[a]]);
		for (const b of blocked) {
			if (b.max[a] >= room.min[a] && b.max[a] + size[a] <= room.max[a] + EPSILON_MM) {
				values.add(b.max[a]);
			}
		}
		return [...values].sort((p, q) => p - q);
	});
	const near = blocked.filter((b) => overlaps(b, room));
	for (const y of coords[1]) {
		for (const z of coords[2]) {
			for (const x of coords[0]) {
				const candidate = boxAt([x, y, z], size);
				if (!inside(room, candidate)) continue;
				if (!near.some((b) => overlaps(b, candidate))) return [x, y, z];
			}
		}
	}
	return null;
}

/** The orientation that lays the part's thinnest side along `axis` (a radiator flat on its panel). */
export function flatAlong(part: PartDef, axis: AxisIndex): Rotation {
	let best = ORIENTATIONS[0];
	let bestThickness = Infinity;
	// Quarter turns take boxes to boxes, so the turned bodies' bounds are the turned bounds: one box
	// to turn, and a turn only permutes the box's sizes (along `axis` it has the size along from[axis]).
	const size = boxSize(boundsOf(part.bodies.map((b) => b.box)));
	for (let k = 0; k < ORIENTATIONS.length; k++) {
		const t = size[ORIENTATION_MAPS[k].from[axis]];
		if (t < bestThickness - EPSILON_MM) {
			best = ORIENTATIONS[k];
			bestThickness = t;
		}
	}
	return best;
}

export type LandingError = { reason: string };

/**
 * Where a part goes on a mount: thinnest side along the mount's normal, against its panel (past
 * the adapter plate and the standoffs), or on top of the stack already there; side by side with
 * parts in the same layer (two fans on a 240).
 */
export function landOnMount(
	resolved: ResolvedScene,
	mount: MountDef,
	part: PartDef
): Landing | LandingError {
	if (!mountAccepts(mount, part)) {
		return {
			reason: `${mount.label} does not take this part (it takes ${mount.accepts.join(', ') || 'anything'}).`
		};
	}
	const { axis, high } = FACE_AXES[mount.face];
	const rotation = mount.kind === 'psu-bay' ? { x: 0, y: 0, z: 0 } : flatAlong(part, axis);
	const size = turnedSize(part, rotation);
	const inner = resolved.innerBox;
	const mounted = resolved.placements.filter((p) => p.placement.mountId === mount.id);
	// The adapter plate sits under the stack only for the classes that need it, as the engine counts it.
	const plate = stackPlate(mount, [...mounted, { part }]);
	// Depth from the panel inward already used by the stack.
	let used = plate + mount.standoffMm;
	const layers = mounted.map((p) =>
		high ? inner.max[axis] - p.bounds.min[axis] : p.bounds.max[axis] - inner.min[axis]
	);
	const region = mount.region;
	const tryLayer = (depth: number) => {
		const room: Box = { min: [...region.min], max: [...region.max] };
		room.min[axis] = high ? inner.max[axis] - depth - size[axis] : inner.min[axis] + depth;
		room.max[axis] = room.min[axis] + size[axis];
		const blocked = mounted.map((p) => p.bounds);
		return freeSpot(room, size, blocked);
	};
	if (mounted.length > 0) {
		const outer = Math.max(...layers);
		const outerLayer = mounted.filter((_p, i) => Math.abs(layers[i] - outer) <= EPSILON_MM);
		// A fan joins the outermost layer when that layer holds fans and has room beside them.
		const sameKind = outerLayer.every((p) => p.part.category === part.category);
		if (sameKind) {
			const layerDepth = Math.min(
				...outerLayer.map((p) =>
					high ? inner.max[axis] - p.bounds.max[axis] : p.bounds.min[axis] - inner.min[axis]
				)
			);
			const spot = tryLayer(layerDepth);
			if (spot) return { position: spot, rotation, turn: turnWords(rotation) };
		}
		used = outer;
	}
	const spot = tryLayer(used);
	if (spot) return { position: spot, rotation, turn: turnWords(rotation) };
	const fallback: Vec3 = [region.min[0], region.min[1], region.min[2]];
	fallback[axis] = high ? inner.max[axis] - used - size[axis] : inner.min[axis] + used;
	return { position: fallback, rotation, turn: turnWords(rotation) };
}

/** A landing and, in words, the quarter turn it used ("as in the catalogue", "a quarter turn about Y"). */
export type Landing = {
	position: Vec3;
	rotation: Rotation;
	turn: string;
	/** Dropped into a room: the free mm left on its tightest axis there (placeInRoom). */
	roomToMoveMm?: number;
};

const TURN_WORDS = ['', 'a quarter turn', 'a half turn', 'three quarter turns'];

/** A rotation in words, in the order the engine applies it (X, then Y, then Z). */
export function turnWords(rotation: Rotation): string {
	const parts = (['x', 'y', 'z'] as const)
		.filter((a) => rotation[a] % 4 !== 0)
		.map((a) => `${TURN_WORDS[rotation[a] % 4]} about ${a.toUpperCase()}`);
	return parts.length === 0 ? 'as in the catalogue' : parts.join(', then ');
}

function isCard(part: PartDef): boolean {
	return part.category === 'gpu' || part.specs.cardSlots !== undefined;
}

/**
 * The turns a part may take when it is dropped into free space, the catalogue's own first. A card
 * with a slot mount in the enclosure must run its length along that mount's normal (its bracket on
 * the slot panel) and its thickness across the slots; anything else may take any of the 24.
 */
export function allowedTurns(part: PartDef, mounts: readonly MountDef[] = []): Rotation[] {
	const slots = isCard(part) ? mounts.find((m) => m.kind === 'slots') : undefined;
	if (!slots) return ORIENTATIONS;
	const normal = FACE_AXES[slots.face].axis;
	// Slots stack along the region's longer in-face axis (common practice: the pitch runs across the panel).
	const inFace = [0, 1, 2].filter((a) => a !== normal);
	const regionSize = boxSize(slots.region);
	const across = regionSize[inFace[0]] >= regionSize[inFace[1]] ? inFace[0] : inFace[1];
	const own = boxSize(boundsOf(part.bodies.map((b) => b.box)));
	const lengthAxis = own.indexOf(Math.max(...own));
	const thinAxis = own.indexOf(Math.min(...own));
	return ORIENTATIONS.filter((r) => {
		const from = rotationMap(r).from;
		return from[normal] === lengthAxis && from[across] === thinAxis;
	});
}

/**
 * Free millimetres on the tightest axis around `box` in `room`: along each axis, the span between
 * the nearest obstacle (or room wall) on either side, less the box's own size; the least of three.
 */
function roomAround(room: Box, box: Box, blocked: Box[]): number {
	let least = Infinity;
	for (let a = 0; a < 3; a++) {
		let lo = room.min[a];
		let hi = room.max[a];
		for (const b of blocked) {
			const across = [0, 1, 2].every(
				(k) => k === a || (b.max[k] - box.min[k] > EPSILON_MM && box.max[k] - b.min[k] > EPSILON_MM)
			);
			if (!across) continue;
			if (b.max[a] <= box.min[a] + EPSILON_MM) lo = Math.max(lo, b.max[a]);
			if (b.min[a] >= box.max[a] - EPSILON_MM) hi = Math.min(hi, b.min[a]);
		}
		least = Math.min(least, hi - lo - (box.max[a] - box.min[a]));
	}
	return least;
}

/**
 * The largest free box found in `room`: from every corner-point candidate, grown to the nearest
 * obstacle axis by axis in each of the six axis orders. Greedy, so it may miss a larger one, but
 * every box it reports is really free. Null when the room is full.
 */
export function largestFreeBox(room: Box, blocked: Box[]): Box | null {
	const near = blocked.filter((b) => overlaps(b, room));
	const coords = [0, 1, 2].map((a) => [
		...new Set([
			room.min[a],
			...near.map((b) => b.max[a]).filter((v) => v > room.min[a] && v < room.max[a])
		])
	]);
	const orders = [
		[0, 1, 2],
		[0, 2, 1],
		[1, 0, 2],
		[1, 2, 0],
		[2, 0, 1],
		[2, 1, 0]
	];
	let best: Box | null = null;
	let bestVolume = 0;
	for (const x of coords[0]) {
		for (const y of coords[1]) {
			for (const z of coords[2]) {
				// A sliver of 1 µm stands for "start here"; a start inside an obstacle gives nothing.
				const seed: Box = { min: [x, y, z], max: [x + 1e-3, y + 1e-3, z + 1e-3] };
				if (near.some((b) => overlaps(b, seed))) continue;
				for (const order of orders) {
					const grown: Box = { min: [x, y, z], max: [x, y, z] };
					for (const a of order) {
						// Other axes not yet grown count as the seed's sliver.
						const probe: Box = {
							min: [...grown.min],
							max: grown.max.map((v, k) => (v - grown.min[k] > 0 ? v : grown.min[k] + 1e-3)) as Vec3
						};
						let hi = room.max[a];
						for (const b of near) {
							const across = [0, 1, 2].every(
								(k) =>
									k === a ||
									(b.max[k] - probe.min[k] > EPSILON_MM && probe.max[k] - b.min[k] > EPSILON_MM)
							);
							if (
								across &&
								b.min[a] >= probe.min[a] - EPSILON_MM &&
								b.max[a] > probe.min[a] + EPSILON_MM
							) {
								hi = Math.min(hi, b.min[a]);
							}
						}
						grown.max[a] = hi;
					}
					const s = boxSize(grown);
					const volume = s[0] * s[1] * s[2];
					if (volume > bestVolume + EPSILON_MM) {
						best = grown;
						bestVolume = volume;
					}
				}
			}
		}
	}
	return best;
}

const size3 = (v: Vec3) => v.map((n) => `${Math.round(n * 10) / 10}`).join(' × ') + ' mm';

/**
 * Drops a part into `room` past the `blocked` boxes, trying each allowed turn (bodies and keep-outs
 * together need room), and keeps the one with the most free millimetres on its tightest axis; the
 * catalogue's own turn wins a tie. When none fits, the reason names the largest free space there and
 * the turn that came closest. `roomLabel` names the room in that sentence ("the card side").
 */
export function placeInRoom(
	room: Box,
	blocked: Box[],
	part: PartDef,
	options: { turns?: Rotation[]; roomLabel?: string } = {}
): Landing | LandingError {
	const turns = options.turns ?? ORIENTATIONS;
	let best: (Landing & { room: number }) | null = null;
	for (const rotation of turns) {
		const map = rotationMap(rotation);
		const bodies = boundsOf(part.bodies.map((b) => rotateBox(map, b.box)));
		const footprint = boundsOf(
			[...part.bodies, ...part.keepouts].map((b) => rotateBox(map, b.box))
		);
		const size = boxSize(footprint);
		const spot = freeSpot(room, size, blocked);
		if (!spot) continue;
		const spare = roomAround(room, boxAt(spot, size), blocked);
		if (best && spare <= best.room + EPSILON_MM) continue;
		best = {
			position: [0, 1, 2].map((a) => spot[a] + bodies.min[a] - footprint.min[a]) as Vec3,
			rotation,
			turn: turnWords(rotation),
			room: spare
		};
	}
	if (best) {
		return {
			position: best.position,
			rotation: best.rotation,
			turn: best.turn,
			roomToMoveMm: best.room
		};
	}
	const where = options.roomLabel ?? 'there';
	const free = largestFreeBox(room, blocked);
	const noun = isCard(part) ? 'this card' : 'this part';
	if (!free) {
		return {
			reason: `There is no free space ${where === 'there' ? 'there' : `in ${where}`}; make room first or choose another place.`
		};
	}
	const freeSize = boxSize(free);
	// The closest attempt: the turn whose worst overshoot of that free space is the least.
	let closest = turns[0];
	let closestOver = Infinity;
	for (const rotation of turns) {
		const size = boxSize(
			boundsOf(
				[...part.bodies, ...part.keepouts].map((b) => rotateBox(rotationMap(rotation), b.box))
			)
		);
		const over = Math.max(...size.map((v, a) => v - freeSize[a]));
		if (over < closestOver - EPSILON_MM) {
			closest = rotation;
			closestOver = over;
		}
	}
	const turnedSize = boxSize(
		boundsOf([...part.bodies, ...part.keepouts].map((b) => rotateBox(rotationMap(closest), b.box)))
	);
	const turn = turnWords(closest);
	return {
		reason: `Nothing fits: the largest free space ${where === 'there' ? 'there' : `in ${where}`} is ${size3(freeSize)}; ${noun} needs ${size3(turnedSize)} ${turn === 'as in the catalogue' ? 'as in the catalogue' : `turned ${turn}`} (with its keep-outs). Make room first or choose another place.`
	};
}

/**
 * A free spot for a part in a compartment (or anywhere inside), turned as it fits best (see
 * placeInRoom); a card turns only as the enclosure's slot mount needs. The position is where its
 * bodies' min corner lands.
 */
export function landInRoom(
	resolved: ResolvedScene,
	room: Box,
	part: PartDef,
	options: { mounts?: readonly MountDef[]; roomLabel?: string } = {}
): Landing | LandingError {
	return placeInRoom(room, obstacles(resolved), part, {
		turns: allowedTurns(part, options.mounts),
		roomLabel: options.roomLabel
	});
}

/** A placement id not yet used in the scene: `p1`, `p2`, … */
export function nextPlacementId(placements: readonly Placement[]): string {
	const used = new Set(placements.map((p) => p.id));
	let n = placements.length + 1;
	while (used.has(`p${n}`)) n++;
	return `p${n}`;
}

/** The nearest allowed position to a free value (for dragging), in the definition's order. */
export function snapToAllowed(
	def: DividerDef | BracketDef,
	offsetMm: number
): { index: number; offsetMm: number; label: string } {
	const options = allowedPositions(def);
	let index = 0;
	for (let i = 1; i < options.length; i++) {
		if (Math.abs(options[i].offsetMm - offsetMm) < Math.abs(options[index].offsetMm - offsetMm)) {
			index = i;
		}
	}
	return { index, ...options[index] };
}

/** The allowed position `delta` steps away in offset order, held at the ends. */
export function stepAllowed(def: DividerDef | BracketDef, offsetMm: number, delta: number): number {
	const sorted = allowedPositions(def)
		.map((p) => p.offsetMm)
		.sort((a, b) => a - b);
	let i = 0;
	for (let k = 1; k < sorted.length; k++) {
		if (Math.abs(sorted[k] - offsetMm) < Math.abs(sorted[i] - offsetMm)) i = k;
	}
	return sorted[Math.max(0, Math.min(sorted.length - 1, i + delta))];
}

/** One more quarter turn about an axis, keeping the part's min corner where it was. */
export function turnQuarter(rotation: Rotation, axis: 'x' | 'y' | 'z'): Rotation {
	return { ...rotation, [axis]: (rotation[axis] + 1) % 4 };
}

/** A placement's world bounds, as the engine resolves them. */
export function placedBounds(part: PartDef, placement: Placement): Box {
	return placePart(part, placement).bounds;
}
