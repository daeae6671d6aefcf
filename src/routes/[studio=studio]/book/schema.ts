// The booking form's schema is the one the API's shares its fields with (src/lib/schemas/booking.ts):
// the browser's checks and the action's, through superforms with zod 4.
export { bookFormSchema, typedBilling, type BookForm } from '$lib/schemas/booking';

/** What the action says besides field errors. */
export type BookMessage =
	{ kind: 'error'; text: string } | { kind: 'taken'; text: string; nearestStarts: { date: string; time: string }[] };
