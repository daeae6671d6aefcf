// Shapes shared by the server and the pages about a booking's money.
/** What the booking page shows about money: payments, refunds, invoices and what the viewer may do. */
export interface MoneyPanelData {
	bookingId: string;
	status: string;
	currency: string;
	total: number;
	deposit: number;
	paid: number;
	refunded: number;
	due: number;
	checkoutUrl: string | null;
	actions: { payDeposit: boolean; payBalance: boolean; cancel: boolean; recordEnd: boolean };
	invoices: { id: string; number: string; kind: string; gross: number; pdfUrl: string }[];
}

