// Setup for `npm run mutation` only (vitest.mutation.config.ts), never for `npm test`.
// Stryker reruns the specs once per mutant, and the domain's property specs are most of their
// time: here each property runs a fifth of its cases, from one fixed seed, so that a run is
// repeatable and fits on a small machine. A mutant that only the rarer cases would catch then
// shows as surviving: the score can only come out lower than with the full runs, never higher.
import type * as FastCheck from 'fast-check';
import { vi } from 'vitest';

vi.mock('fast-check', async (importOriginal) => {
	const original = await importOriginal<typeof FastCheck>();
	const assert = ((property: FastCheck.IRawProperty<unknown>, params?: FastCheck.Parameters<unknown>) =>
		original.assert(property, {
			...params,
			seed: 20270302,
			numRuns: Math.max(10, Math.ceil((params?.numRuns ?? 100) / 5))
		})) as typeof original.assert;
	return { ...original, assert, default: { ...original, assert } };
});
