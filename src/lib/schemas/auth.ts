import { z } from 'zod';

export const loginSchema = z.object({
	email: z.string().trim().min(1, 'Enter your e-mail address.').max(254).email('Enter a valid e-mail address.'),
	password: z.string().min(1, 'Enter your password.').max(256)
});

export const userCreateSchema = z.object({
	name: z
		.string()
		.trim()
		.min(1, 'Enter a name.')
		.max(120)
		// eslint-disable-next-line no-control-regex
		.refine((v) => !/[\u0000-\u001f\u007f]/.test(v), 'Use plain text, without control characters.'),
	email: z.string().trim().toLowerCase().max(254).email('Enter a valid e-mail address.'),
	role: z.enum(['rep', 'manager', 'admin']),
	teamId: z.string().uuid().nullable().default(null),
	password: z.string().min(12, 'Use at least 12 characters.').max(256)
});

export const userUpdateSchema = z.object({
	id: z.string().uuid(),
	role: z.enum(['rep', 'manager', 'admin']),
	teamId: z.string().uuid().nullable().default(null),
	active: z.boolean()
});
