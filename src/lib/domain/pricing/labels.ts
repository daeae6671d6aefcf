/** Wording of price lines (en-GB, the trade's words: block, half day, full day, overtime). */
import { basisPointsToPercent } from '../money';

/** Minutes as decimal hours for a quantity: 90 → "1.5", 15 → "0.25", 20 → "0.3333" (4 places at most). */
export function decimalHours(minutes: number): string {
	const tenThousandths = Math.round((minutes * 10_000) / 60);
	const whole = Math.floor(tenThousandths / 10_000);
	const fraction = String(tenThousandths % 10_000)
		.padStart(4, '0')
		.replace(/0+$/, '');
	return fraction ? `${whole}.${fraction}` : String(whole);
}

/** 2500 → "25 %", 2550 → "25.5 %": a space before the sign, as the SI Brochure (9th edition, 5.4.7) writes it. */
export function formatPercent(bp: number): string {
	return `${basisPointsToPercent(bp)} %`;
}
