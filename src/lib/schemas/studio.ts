// A new studio, as the set-up form and POST /api/studios send it. This part runs in the browser
// too (the short name as typed, src/lib/domain/studio-slug.ts); new-studio.ts adds the server's
// checks of the country, zone and currency, which need data too large for the browser.
import { z } from 'zod';
import { slugProblem } from '$lib/domain/studio-slug';
import { lineText } from './input';

/** A check as a zod refinement whose message is the problem the rule names. */
export function ruled(problem: (text: string) => string | null, missing = 'Fill this in.') {
	return z.string({ error: missing }).superRefine((text, ctx) => {
		const found = problem(text);
		if (found) ctx.addIssue({ code: 'custom', message: found });
	});
}

export const studioFormFields = {
	name: lineText({ error: 'Name the studio.' })
		.trim()
		.min(2, { error: 'Name the studio (at least two characters).' })
		.max(80, { error: 'Keep the name under 80 characters.' }),
	slug: ruled(slugProblem, 'Choose a short name.'),
	country: z.string({ error: 'Choose a country.' }).min(1, { error: 'Choose a country.' }),
	timeZone: z.string({ error: 'Choose a time zone.' }).min(1, { error: 'Choose a time zone.' }),
	currency: z.string({ error: 'Choose a currency.' }).min(1, { error: 'Choose a currency.' })
};

/** What the browser checks as the person types. */
export const studioFormSchema = z.object(studioFormFields);

export type NewStudio = z.infer<typeof studioFormSchema>;
