/** The parts of a quote the booking pages show: POST /api/studios/STUDIO/quote's answer and a booking's stored snapshot both fit. */
export interface QuoteView {
	currency: string;
	pricesIncludeVat: boolean;
	lines: { key: string; label: string; amount: number }[];
	vat: { ratePercent: string; base: number; amount: number }[];
	rounding: number;
	total: number;
	deposit: number;
	balance: number;
	/** Absent on quotes kept before reverse charge existed: those are standard. */
	vatTreatment?: 'standard' | 'reverse-charge';
}
