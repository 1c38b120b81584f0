import { z } from 'zod';
import { email, line, password, roleSchema } from './common';

export const signUpSchema = z.object({
	name: line('Name', 80),
	email,
	password
});

export const signInSchema = z.object({
	email,
	password: z
		.string({ error: 'Password is required.' })
		.min(1, 'Password is required.')
		.max(200, 'Password can be at most 200 characters.')
});

export const resetRequestSchema = z.object({ email });
export const resetSchema = z.object({ password });

export const studioSchema = z.object({ name: line('Studio name', 80) });
export const inviteSchema = z.object({ email, role: roleSchema });
export const roleChangeSchema = z.object({ userId: line('Member', 64), role: roleSchema });
export const memberSchema = z.object({ userId: line('Member', 64) });
export const switchStudioForm = z.object({ studioId: line('Studio', 64) });
export const revokeInviteForm = z.object({ inviteId: line('Invitation', 64) });
