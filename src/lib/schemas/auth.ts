import { z } from 'zod';

export const MIN_PASSWORD = 10;

export const signInSchema = z.object({
	email: z.email({ error: 'Enter your e-mail address.' }).trim().toLowerCase().max(254),
	password: z.string().min(1, { error: 'Enter your password.' }).max(128),
	next: z.string().max(500).optional().default('')
});

export const signUpSchema = z.object({
	name: z.string().trim().min(2, { error: 'Tell us your name or your band’s name.' }).max(120),
	email: z.email({ error: 'Enter a valid e-mail address.' }).trim().toLowerCase().max(254),
	password: z
		.string()
		.min(MIN_PASSWORD, { error: `Use at least ${MIN_PASSWORD} characters.` })
		.max(128, { error: 'Use at most 128 characters.' })
		.refine((p) => new Set(p).size >= 5, { error: 'Use a less repetitive password.' }),
	next: z.string().max(500).optional().default('')
});

/** Only same-site paths are followed after signing in (no open redirects). */
export function safeNext(next: string | undefined | null): string | null {
	if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return null;
	return next;
}
