// Shapes shared by the server and the pages about a booking's money. Amounts are integer minor
// units of `currency`; instants are ISO 8601 strings.

export type PaymentKind = 'deposit' | 'balance';

export interface MoneyPanelPayment {
	id: string;
	kind: PaymentKind;
	amount: number;
	/** 'open', 'processing', 'paid', 'failed', 'expired' */
	status: string;
	paidAt: string | null;
	createdAt: string;
	/** Why a payment did not go through (another amount reported by Stripe, a failed bank payment): owner only. */
	problem: string | null;
}

export interface MoneyPanelRefund {
	id: string;
	amount: number;
	/** 'pending', 'succeeded', 'failed' */
	status: string;
	/** 'cancellation', 'slot_unavailable', 'cancelled_before_payment', 'duplicate' */
	reason: string;
	/** Stripe's reason, shown to the owner only. */
	failureReason: string | null;
	/** A failed refund nobody has tried again yet. */
	unresolved: boolean;
	createdAt: string;
}

export interface MoneyPanelDocument {
	id: string;
	number: string;
	/** UNTDID 1001: 380 invoice, 381 credit note, 386 deposit invoice. */
	typeCode: number;
	kind: string;
	issuedAt: string;
	/** Total incl. VAT as the customer reads it. */
	total: number;
	amountDue: number;
	/** Null for a viewer who may know the document exists but not open it (an engineer). */
	pdfUrl: string | null;
}

/** A payment the owner recorded by hand (cash, bank transfer), or its reversal (a negative amount). */
export interface MoneyPanelRecorded {
	id: string;
	amount: number;
	/** 'cash' or 'bank_transfer' */
	method: string;
	/** 'YYYY-MM-DD' in the studio's calendar. */
	paidOn: string;
	note: string;
	reversesId: string | null;
	reason: string | null;
	reversed: boolean;
}

/** What the booking page shows about money: payments, refunds, documents and what the viewer may do. */
export interface MoneyPanelData {
	bookingId: string;
	status: string;
	currency: string;
	timeZone: string;
	viewerRole: 'owner' | 'engineer' | 'accountant' | 'artist';
	/** The quoted total and deposit. */
	total: number;
	deposit: number;
	/** Σ paid payments; Σ refunds under way or done; what the studio holds. */
	paid: number;
	refunded: number;
	held: number;
	/** Σ payments recorded by hand, less their reversals. */
	recordedTotal: number;
	/** From the final invoice once the session is closed. */
	invoicedTotal: number | null;
	/** Still owed: once the final invoice is issued, or before it once a payment was recorded by hand. */
	balanceDue: number | null;
	/** A delayed deposit payment is on its way. */
	awaitingPayment: boolean;
	payments: MoneyPanelPayment[];
	refunds: MoneyPanelRefund[];
	recorded: MoneyPanelRecorded[];
	invoices: MoneyPanelDocument[];
	actions: {
		/** checkoutUrl: the open Checkout page, when one is ready. */
		payDeposit: { amount: number; checkoutUrl: string | null } | null;
		payBalance: { amount: number; checkoutUrl: string | null } | null;
		/** onArrival: a deposit still on its way and what of it goes back when it arrives. */
		cancel: {
			refund: number;
			rule: string;
			noticeHours: number;
			paid: number;
			onArrival: { amount: number; refund: number } | null;
		} | null;
		/** bookedEnd: a datetime-local value in the studio's zone. */
		recordEnd: {
			bookedEnd: string;
			/** The session's start (ISO): its end can be recorded from then on, not before. */
			opensAt: string;
			/** Whether the session has begun, so its end may be recorded now. */
			open: boolean;
			gear: { id: string; name: string; booked: boolean; hireFee: number }[];
		} | null;
		/**
		 * Recording that nobody came (owner, engineer), offered once the session's start has passed:
		 * what the cancellation terms at zero notice give back (`refund`) and keep (`keeps`).
		 */
		noShow: { refund: number; keeps: number; rule: string } | null;
		retryRefunds: boolean;
		/** The owner records a payment taken outside Checkout: at most `owed`, on a day from `earliest` to `today`. */
		recordPayment: { owed: number; today: string; earliest: string } | null;
		/** The owner reverses a recorded payment. */
		reverseRecorded: boolean;
	};
}
