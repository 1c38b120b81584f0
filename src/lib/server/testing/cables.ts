/**
 * Test data for power cables: the demo card's cable as the editor's form drafts it. Pure (no
 * database), so engine specs use it too.
 */
import type { CableDraft } from '../../loop/cables';

/** Supply pcie socket → card power, the "Card power" preset, routed across to the card side. */
export const CARD_CABLE_DRAFT: CableDraft = {
	from: { placementId: 'psu', portId: 'pcie' },
	to: { placementId: 'card', portId: 'power' },
	presetId: 'card8',
	where: 'across to the card side'
};
