// The set-up's own form: the studio's address and VAT ID (EN 16931 BT-35, BT-38, BT-37, BT-40 and
// BT-31). The other steps use the Rates & policy and Rooms & gear schemas.
import { z } from 'zod';
import { lineText } from '$lib/schemas/input';
import type { PolicySection, SettingsForm } from '../settings/schema';
import type { SetupStep } from '$lib/domain/setup';

export const addressSchema = z.object({
	street: lineText({ error: 'Give the street and number.' })
		.trim()
		.min(1, { error: 'Give the street and number.' })
		.max(120, { error: 'Keep the street under 120 characters.' }),
	postalCode: lineText().trim().max(20, { error: 'Keep the postal code under 20 characters.' }).default(''),
	city: lineText({ error: 'Give the town or city.' })
		.trim()
		.min(1, { error: 'Give the town or city.' })
		.max(80, { error: 'Keep the city under 80 characters.' }),
	country: z.string().regex(/^[A-Z]{2}$/, { error: 'Choose a country from the list.' }),
	vatId: lineText()
		.trim()
		.max(30, { error: 'Keep the VAT ID under 30 characters.' })
		.regex(/^(?:[A-Za-z]{2}[0-9A-Za-z+*.-]{2,28})?$/, { error: 'Write the VAT ID with its country prefix, e.g. FI12345678.' })
		.default('')
});

export type AddressForm = z.infer<typeof addressSchema>;

/** The Rates & policy sections each policy step shows. */
export const STEP_SECTIONS: Partial<Record<SetupStep, PolicySection[]>> = {
	vat: ['vat'],
	engineer: ['engineer'],
	hours: ['hours'],
	rules: ['rules', 'deposit', 'ladder'],
	holidays: ['holidays']
};

/** The settings form's fields in each section: what a step posts and saves. */
export const SECTION_FIELDS: Record<PolicySection, (keyof SettingsForm)[]> = {
	vat: ['vatPercent', 'pricesIncludeVat'],
	engineer: ['engineerHourly', 'engineerHalfDay', 'engineerFullDay'],
	deposit: ['depositPercent', 'depositMinimum'],
	ladder: ['noticeHours', 'refundPercents'],
	rules: [
		'minBookingMinutes',
		'incrementMinutes',
		'turnaroundMinutes',
		'minNoticeHours',
		'horizonDays',
		'holdMinutes',
		'overtimeIncrementMinutes'
	],
	hours: ['openDays', 'opens', 'closes'],
	holidays: ['closedOnPublicHolidays']
};
