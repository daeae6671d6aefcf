/**
 * The shared vocabulary of Slateroom's domain rules. Plain data, no framework.
 *
 * Money is always an integer number of the currency's minor units (cents for EUR).
 * Instants are JavaScript Dates (UTC instants); wall-clock rules (opening hours, surcharge
 * windows, holidays) are evaluated in the studio's IANA time zone.
 */

/** Integer minor units of the studio's currency. Never a float. */
export type Minor = number;

/** A rate card: the price of an hour, a half-day block and a full-day block. */
export interface BlockRates {
	hourly: Minor;
	halfDay: Minor;
	fullDay: Minor;
}

/** Lengths of the blocks the studio sells, in minutes (demo: 240 and 480). */
export interface BlockLengths {
	halfDayMinutes: number;
	fullDayMinutes: number;
}

/** A surcharge window in the studio's zone. */
export interface SurchargeRule {
	id: string;
	label: string;
	kind: 'window' | 'holiday';
	/** Percent in basis points of a percent: 2500 = 25 %. */
	percentBp: number;
	/** ISO weekdays 1 (Monday) .. 7 (Sunday) the window applies to; ignored for 'holiday'. */
	weekdays: number[];
	/** Local start minute of day, 0..1440; ignored for 'holiday'. */
	fromMinute: number;
	/** Local end minute of day, 0..1440 (1440 = midnight at the end of the day). */
	toMinute: number;
}

/** Opening hours per ISO weekday (1..7), local minutes of the day. toMinute may exceed 1440 for overnight. */
export interface OpeningHours {
	weekday: number;
	openMinute: number;
	closeMinute: number;
}

/** One rung of the cancellation ladder: with at least `minNoticeHours` notice, refund this share of the deposit. */
export interface CancellationRung {
	minNoticeHours: number;
	/** Share of what was paid that is refunded, in basis points: 10000 = all, 5000 = half. */
	refundBp: number;
}

export interface StudioPolicy {
	timeZone: string;
	currency: string;
	/** ISO 3166-1 alpha-2 of the studio's country, for public holidays (e.g. 'FI'). */
	country: string;
	/** VAT rate in basis points: 2550 = 25.5 %. */
	vatRateBp: number;
	/** true when the rate card prices include VAT. */
	pricesIncludeVat: boolean;
	blocks: BlockLengths;
	minBookingMinutes: number;
	incrementMinutes: number;
	turnaroundMinutes: number;
	minNoticeMinutes: number;
	horizonDays: number;
	holdMinutes: number;
	openingHours: OpeningHours[];
	surcharges: SurchargeRule[];
	/** Deposit share in basis points of the gross: 3000 = 30 %. */
	depositBp: number;
	/** The deposit is rounded up to whole currency units and is at least this much (minor units). */
	depositMinimum: Minor;
	cancellation: CancellationRung[];
	overtimeIncrementMinutes: number;
	engineerRates: BlockRates;
}

export interface RoomRates {
	slug: string;
	name: string;
	rates: BlockRates;
}

export interface GearHire {
	id: string;
	label: string;
	/** Hire fee per booking, minor units, priced as the rate card (incl. or excl. VAT per policy). */
	fee: Minor;
}
