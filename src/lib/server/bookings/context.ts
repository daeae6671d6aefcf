// What pricing and checking a booking need from its studio, read once per request and handed
// down to every step that needs it. The studio is always named: the one in the address, or the
// booking's own; there is no default studio.
import { publicHolidayChecker } from '$lib/domain/holidays';
import type { StudioPolicy } from '$lib/domain/types';
import { getPolicy, type StudioRow } from '../studio';

export interface PricingContext {
	studio: StudioRow;
	policy: StudioPolicy;
	holidays: (ymd: string) => boolean;
}

export async function pricingContext(studioId: string): Promise<PricingContext> {
	const { studio, policy } = await getPolicy(studioId);
	return { studio, policy, holidays: publicHolidayChecker(policy.country) };
}
