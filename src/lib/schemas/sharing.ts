/**
 * Form schemas of the client page, the share page and the build's photos; the browser and the
 * server use the same ones.
 */
import { z } from 'zod';
import { email, idField, line, paragraph } from '$lib/schemas/common';

const version = z.coerce
	.number({ error: 'The page is out of date; reload it.' })
	.int()
	.min(1)
	.max(2_147_483_647);

/** A placed part as the client page names it (`part-001`), or empty for the whole build. */
export const partRef = z
	.string()
	.trim()
	.regex(/^(part-\d{3})?$/, 'Choose a part from the list.')
	.default('');

export const commentForm = z.object({
	body: paragraph('Comment', 4000).min(1, 'Write something first.'),
	part: partRef,
	name: z.union([line('Your name', 80), z.literal('')]).default(''),
	version
});

export const approveForm = z.object({
	version,
	message: paragraph('Message', 2000).default(''),
	name: z.union([line('Your name', 80), z.literal('')]).default('')
});

export const changesForm = z.object({
	version,
	message: paragraph('What should change', 2000).min(1, 'Say what you would like changed.'),
	name: z.union([line('Your name', 80), z.literal('')]).default('')
});

export const EXPIRY_CHOICES = { never: null, '7': 7, '30': 30, '90': 90 } as const;

export const shareForm = z.object({
	variantId: z.string().trim().min(1, 'Choose a variant.').max(64),
	recipientEmail: z.union([email, z.literal('')]).default(''),
	recipientName: z.union([line('Name', 120), z.literal('')]).default(''),
	expires: z
		.enum(['never', '7', '30', '90'], { error: 'Choose when the link stops working.' })
		.default('30'),
	send: z.enum(['on', '']).default(''),
	message: paragraph('Message', 2000).default('')
});

/** Withdrawing a share link. */
export const revokeLinkForm = z.object({ linkId: idField('Link') });

/** A comment written as the studio on the share page (clients write on their own page). */
export const studioCommentForm = z.object({
	body: commentForm.shape.body,
	variantId: z.string().min(1).max(64),
	part: z.string().max(120).default('')
});

/** A photo's caption: one line, or empty. */
export const photoCaption = z.union([line('Caption', 200), z.literal('')]).default('');
export const photoCaptionForm = z.object({ photoId: idField('Photo'), caption: photoCaption });
export const photoDeleteForm = z.object({ photoId: idField('Photo') });
/** The upload form's text fields (the file itself is checked by the service). */
export const photoUploadForm = z.object({ caption: photoCaption });
