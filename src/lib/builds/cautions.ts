/**
 * The cautions every build sheet carries as checklist items (docs/safety.md). Interstice plans; it does not replace the manufacturers' instructions, local
 * codes or licensed practice, and says so wherever it guides the work.
 */

export interface Caution {
	/** Stable: ticks are stored against it. */
	id: string;
	text: string;
	detail: string;
}

export const CAUTIONS: readonly Caution[] = [
	{
		id: 'unplug',
		text: 'Unplug from the mains before working inside. Never open the power supply.',
		detail:
			'Mains voltage. Switching off is not enough: pull the plug, every time you reach inside.'
	},
	{
		id: 'edges',
		text: 'Mind sheet-metal edges: they cut.',
		detail: 'Wear gloves when handling panels, brackets and radiator fins.'
	},
	{
		id: 'heat-bending',
		text: 'Heat-bending tubing: heat guns burn. Ventilate and wear gloves.',
		detail: 'Let bent tubing cool on a surface that does not mind the heat.'
	},
	{
		id: 'coolant',
		text: 'Coolants can be toxic (glycol): keep them away from children and pets.',
		detail: 'Follow the coolant’s safety data sheet for handling, spills and disposal.'
	},
	{
		id: 'fill',
		text: 'Fill with the reservoir at or above the pump inlet, so the pump never runs dry.',
		detail: 'Common practice: keep topping up while the pump is on; a pump must never run dry.'
	},
	{
		id: 'leak-test',
		text: 'Leak-test with only the pump powered, everything else unpowered, over absorbent paper, for hours, before the first full power-on.',
		detail: 'Check every fitting and the paper beneath it before powering anything else.'
	},
	{
		id: 'drain',
		text: 'Drain the loop before opening a fitting or moving a part a run goes through.',
		detail: 'Unplug first; catch the coolant in a tray and dry every drop before power returns.'
	},
	{
		id: 'rules',
		text: 'Selling the system to a client? Check the local electrical-safety and product rules that apply to it.',
		detail:
			'An assembled system sold to a client may fall under them; this sheet claims nothing about compliance.'
	}
];

export const PLANNING_NOTE =
	'Interstice is a planning aid. This sheet does not replace the manufacturers’ instructions, local codes or licensed practice: where they say otherwise, follow them.';
