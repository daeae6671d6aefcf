/** Wording of price lines (en-GB, the trade's words: block, half day, full day, overtime). */
import { basisPointsToPercent } from '../money';

/** 120 → "2 h", 150 → "2 h 30 min", 45 → "45 min", 0 → "0 min". */
export function formatDuration(minutes: number): string {
	const h = Math.floor(minutes / 60);
	const m = minutes % 60;
	if (h === 0) return `${m} min`;
	return m === 0 ? `${h} h` : `${h} h ${m} min`;
}

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
