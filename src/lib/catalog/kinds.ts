/**
 * The two kinds of catalogue item, as their pages name them: the list (at `/${kind}`), one item
 * (`noun`), and how the item page's Archive button looks (an enclosure's is the danger one).
 */
export const CATALOG_KINDS = {
	enclosures: { label: 'Enclosures', noun: 'enclosure', archive: 'btn-danger' },
	parts: { label: 'Parts', noun: 'part', archive: 'btn-quiet' }
} as const;

export type CatalogKind = keyof typeof CATALOG_KINDS;
