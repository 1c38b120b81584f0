/** Form schemas of the client page and the share page; the browser and the server use the same ones. */
import { z } from 'zod';
import { email, line, paragraph } from '$lib/schemas/common';

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
