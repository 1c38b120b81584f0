/**
 * Power cables in the editor: the section presets a builder picks from, the power ports a cable may
 * join, and adding or removing a cable in a variant's settings. Millimetres.
 */
import type { CableDef, PortRef, ResolvedScene } from '$lib/geometry';
import type { VariantSettings } from '$lib/builds/settings';
import { CABLE_PRESET_WORDS } from '$lib/words/cables';

export interface CablePreset {
	id: keyof typeof CABLE_PRESET_WORDS;
	/** The cable's name as ordered ("24-pin"). */
	label: string;
	widthMm: number;
	thicknessMm: number;
	minBendRadiusMm: number;
}

/**
 * Flat bundles of 18 AWG wires sleeved or taped flat, about 2.2 mm a wire in two rows: 24-pin about
 * 22 × 6 mm, 8-pin about 10 × 5 mm; a bundle bends no tighter than about four times its thickness
 * (common practice).
 */
export const CABLE_PRESETS: readonly CablePreset[] = [
	{
		id: 'atx24',
		label: CABLE_PRESET_WORDS.atx24,
		widthMm: 22,
		thicknessMm: 6,
		minBendRadiusMm: 24
	},
	{ id: 'eps8', label: CABLE_PRESET_WORDS.eps8, widthMm: 10, thicknessMm: 5, minBendRadiusMm: 20 },
	{ id: 'card8', label: CABLE_PRESET_WORDS.card8, widthMm: 10, thicknessMm: 5, minBendRadiusMm: 20 }
];

export interface PowerPortOption extends PortRef {
	label: string;
}

/** Every power port of the placed parts, named "part · port". */
export function powerPortOptions(resolved: ResolvedScene): PowerPortOption[] {
	return resolved.placements.flatMap((rp) =>
		rp.part.ports
			.filter((p) => p.kind === 'power')
			.map((p) => ({
				placementId: rp.placement.id,
				portId: p.id,
				label: `${rp.part.name} · ${p.id}`
			}))
	);
}

/** What the form holds: two ports, a preset (its section and bend radius), a name, where it runs. */
export interface CableDraft {
	from: PortRef;
	to: PortRef;
	presetId: CablePreset['id'];
	label?: string;
	where?: string;
}

/** A new cable from the draft, with an id no other cable has; null for an unknown preset. */
export function cableFromDraft(
	settings: VariantSettings,
	draft: CableDraft,
	waypoints: CableDef['waypoints'] = []
): CableDef | null {
	const preset = CABLE_PRESETS.find((p) => p.id === draft.presetId);
	if (!preset) return null;
	const taken = new Set((settings.cables ?? []).map((c) => c.id));
	let n = 1;
	while (taken.has(`cable-${n}`)) n++;
	const where = draft.where?.trim();
	return {
		id: `cable-${n}`,
		label: draft.label?.trim() || preset.label,
		from: { ...draft.from },
		to: { ...draft.to },
		widthMm: preset.widthMm,
		thicknessMm: preset.thicknessMm,
		minBendRadiusMm: preset.minBendRadiusMm,
		clearanceMm: 2,
		...(where ? { where } : {}),
		waypoints: [...waypoints]
	};
}

export function addCable(settings: VariantSettings, cable: CableDef): VariantSettings {
	return { ...settings, cables: [...(settings.cables ?? []), cable] };
}

/** The cable taken out; the last one out leaves no empty list behind (older settings' shape). */
export function removeCable(settings: VariantSettings, cableId: string): VariantSettings {
	const cables = (settings.cables ?? []).filter((c) => c.id !== cableId);
	const { cables: _drop, ...rest } = settings;
	void _drop;
	return cables.length ? { ...rest, cables } : rest;
}
