/** Words of the power cable form (docs/words.md): the presets' names and the form's labels. */

/** Preset id → the cable's name as a builder orders it. */
export const CABLE_PRESET_WORDS = {
	atx24: '24-pin',
	eps8: '8-pin processor',
	card8: 'Card power'
} as const;

export const CABLE_FORM_WORDS = {
	add: 'Add a power cable',
	form: 'New power cable',
	from: 'From power port',
	to: 'To power port',
	preset: 'Cable',
	name: 'Name on the order',
	where: 'Where it runs (optional)',
	submit: 'Add the cable',
	cancel: 'Cancel',
	remove: 'Remove',
	pickPorts: 'Pick the power port it starts at and the one it ends at',
	noPorts: 'No placed part has a power port.'
} as const;

/** "24-pin, 22 × 6 mm, bends no tighter than 24 mm". */
export function presetWords(p: {
	label: string;
	widthMm: number;
	thicknessMm: number;
	minBendRadiusMm: number;
}): string {
	return `${p.label}, ${p.widthMm} × ${p.thicknessMm}\u2009mm, bends no tighter than ${p.minBendRadiusMm}\u2009mm`;
}
