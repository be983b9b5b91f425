import { z } from 'zod';
import { ROLES } from '$lib/roles';
import { noNul, NUL_MESSAGE } from './form';

export const email = z
	.string({ error: 'Enter an e-mail address.' })
	.trim()
	.toLowerCase()
	.max(254, 'That e-mail address is too long.')
	.pipe(z.email({ error: 'Enter a valid e-mail address.' }));

/** ASVS 6.2: at least 12 characters here, up to 128, no composition rules. */
export const newPassword = z
	.string({ error: 'Enter a password.' })
	.min(12, 'Use at least 12 characters.')
	.max(128, 'Use at most 128 characters.');

export const signInSchema = z.object({
	email,
	password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(256)
});

export const inviteSchema = z.object({
	name: z
		.string()
		.trim()
		.min(1, 'Enter a name.')
		.max(120, 'Keep the name under 120 characters.')
		.refine(noNul, NUL_MESSAGE),
	email,
	role: z.enum(ROLES, { error: `Choose a role: ${ROLES.join(', ')}.` }),
	password: newPassword
});

export const setRoleSchema = z.object({
	userId: z.uuid({ error: 'Unknown user.' }),
	role: z.enum(ROLES, { error: `Choose a role: ${ROLES.join(', ')}.` })
});

export const userIdSchema = z.object({ userId: z.uuid({ error: 'Unknown user.' }) });

export const changePasswordSchema = z
	.object({
		current: z.string().min(1, 'Enter your current password.').max(256),
		next: newPassword,
		confirm: z.string()
	})
	.refine((v) => v.next === v.confirm, { path: ['confirm'], message: 'The passwords differ.' });

export const tokenSchema = z.object({
	name: z
		.string()
		.trim()
		.min(1, 'Name the token.')
		.max(80, 'Keep the name under 80 characters.')
		.refine(noNul, NUL_MESSAGE)
});
