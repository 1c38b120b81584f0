/** Form schemas of the build pages (new build, versions, variants, moving on, the sheet's checklist). */
import { z } from 'zod';
import { idField, INT4_MAX, line, paragraph } from './common';

const variantId = line('Variant', 64);
const confirm = z.literal('yes', { error: 'Tick the box to confirm.' });

export const newBuildForm = z.object({
	name: line('Build name', 120),
	clientName: line('Client', 120, 0).default(''),
	notes: paragraph('Notes', 4000).default(''),
	enclosureId: line('Enclosure', 64)
});

/** "Save as version N — note", naming the revision the designer is looking at. */
export const saveVersionForm = z.object({
	variantId,
	revision: z.coerce.number({ error: 'Revision must be a number.' }).int().min(1).max(INT4_MAX),
	note: line('Note', 200, 0).default('')
});

export const variantForm = z.object({ variantId });
export const forkVariantForm = z.object({ variantId, name: line('Name', 80).optional() });
export const renameVariantForm = z.object({ variantId, name: line('Name', 80) });
export const moveVariantForm = z.object({
	variantId,
	by: z.enum(['-1', '1'], { error: 'Move by −1 or 1.' })
});
export const deleteVariantForm = z.object({ variantId, confirm });
export const deleteBuildForm = z.object({ confirm });

/** Moving the build on to a newer version of its enclosure. */
export const moveOnForm = z.object({ toVersionId: line('Version', 64) });

/** Ticking one item of the build sheet's checklist. */
export const tickForm = z.object({
	variantId: idField('Variant', 120),
	key: z.string().min(1, 'Required').max(300),
	ticked: z.enum(['1', '0'], { error: 'Must be 1 or 0' })
});
export type TickInput = z.infer<typeof tickForm>;
