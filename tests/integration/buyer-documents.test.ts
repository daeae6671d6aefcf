// The buyer on every document, against the real database, the running app and its export: the
// deposit invoice, the credit note, their PDFs and their EN 16931 e-invoices name the buyer of the
// booking's billing details (Directive 2006/112/EC, Article 226(4) and (5); EN 16931 BG-7 with
// BT-44, BG-8 with BT-50/52/53/55, BT-48), and a document issued before the booking had billing
// details keeps what it was issued with (Article 233; drizzle/0003). Each e-invoice is checked by
// tests/support/en16931.ts. Buyers and VAT IDs are invented; the VAT IDs have valid check digits.
import { afterAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { unzipSync, strFromU8 } from 'fflate';
import { signedIn, type Client } from '../support/http';
import { DEMO } from '../support/env';
import { studioIdOf, testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { holdFirstFree, payAndConfirm, type ApiQuote, type Held } from '../support/booking';
import { moveIntoPast } from '../support/started';
import { workdaysAhead, ymdInZone } from '../support/dates';
import { brokenRules, knownGaps, parser, text, type Node } from '../support/en16931';
import { pdfRows } from '../support/pdf-text';
import { parse } from 'csv-parse/sync';
import * as t from '../../src/lib/server/db/schema';
import type { BillingDetails } from '../../src/lib/domain/billing';

const { db, client } = testDb();
afterAll(() => client.end());

/** This file's days: working weekdays from 44 days ahead, late morning (no surcharge). */
const DAYS = workdaysAhead(44, 16);

const swedishLabel: BillingDetails = {
	kind: 'organisation',
	name: 'Grankotte Skivbolag AB',
	street: 'Tallstigen 4',
	postalCode: '791 31',
	city: 'Falun',
	country: 'SE',
	vatId: 'SE559218473201'
};
/** An invented German label: another EU member state than the studio's Finland. */
const germanLabel: BillingDetails = {
	kind: 'organisation',
	name: 'Nachtfalter Tonträger GmbH',
	street: 'Lindenhof 7',
	postalCode: '50667',
	city: 'Köln',
	country: 'DE',
	vatId: 'DE294817367'
};
const person: BillingDetails = {
	kind: 'person',
	name: 'Ilona Saarinen',
	street: 'Rantakatu 3 B 12',
	postalCode: '90100',
	city: 'Oulu',
	country: 'FI',
	vatId: ''
};

/** Holds a slot of this file's as `who`, gives the booking these billing details (as booking with them does), and pays. */
async function bookWithBilling(who: Client, billing: BillingDetails | null): Promise<Held> {
	const held = await holdFirstFree(who, { room: 'control-room', days: DAYS, slots: [['10:00', '12:00']] });
	if (billing) await db.update(t.booking).set({ billing }).where(eq(t.booking.id, held.id));
	await payAndConfirm(db, held);
	return held;
}

const docOf = (bookingId: string, typeCode: number) =>
	waitFor(async () => {
		const [row] = await db
			.select()
			.from(t.invoice)
			.where(and(eq(t.invoice.bookingId, bookingId), eq(t.invoice.typeCode, typeCode)));
		return row;
	}, `document ${typeCode} of ${bookingId}`);

async function cancelForCreditNote(who: Client, bookingId: string) {
	expect((await who.json(`/api/bookings/${bookingId}/cancel`, {})).status).toBe(200);
	return docOf(bookingId, 381);
}

/** The e-invoices of the month a document was issued in, from the real export, by number. */
async function ublOfMonth(issuedAt: Date): Promise<Record<string, string>> {
	const accountant = await signedIn(DEMO.accountant);
	const month = ymdInZone(issuedAt).slice(0, 7);
	const res = await accountant.fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=ubl`);
	expect(res.status).toBe(200);
	const files = unzipSync(new Uint8Array(await res.arrayBuffer()));
	return Object.fromEntries(Object.entries(files).map(([name, bytes]) => [name.replace(/^ubl\/|\.xml$/g, ''), strFromU8(bytes)]));
}

const buyerIn = (xml: string) => {
	const parsed = parser.parse(xml) as Node;
	return (((parsed.Invoice ?? parsed.CreditNote) as Node).AccountingCustomerParty as Node).Party as Node;
};

async function pdfText(who: Client, invoiceId: string): Promise<string> {
	const res = await who.fetch(`/invoices/${invoiceId}/pdf`);
	expect(res.status).toBe(200);
	return (await pdfRows(new Uint8Array(await res.arrayBuffer()))).map((r) => r.text).join('\n');
}

describe('the buyer on documents', () => {
	it('an organisation with a VAT ID abroad, the studio not opted in to reverse charge: its invoice and credit note name it, with VAT', async () => {
		const artist = await signedIn(DEMO.artist);
		const b = await bookWithBilling(artist, swedishLabel);
		const deposit = await docOf(b.id, 386);
		const buyer = {
			name: 'Grankotte Skivbolag AB',
			street: 'Tallstigen 4',
			postalCode: '791 31',
			city: 'Falun',
			country: 'SE',
			vatId: 'SE559218473201',
			email: DEMO.artist
		};
		expect(deposit.customer).toEqual(buyer);
		expect(deposit.vatBreakdown.map((g) => [g.rateBp, g.category])).toEqual([[2550, undefined]]); // the studio's VAT: the setting is off
		const credit = await cancelForCreditNote(artist, b.id);
		expect(credit.customer).toEqual(buyer); // the buyer of the invoice it corrects

		const ubl = await ublOfMonth(deposit.issuedAt);
		for (const doc of [deposit, credit.issuedAt.getMonth() === deposit.issuedAt.getMonth() ? credit : null]) {
			if (!doc) continue;
			const xml = ubl[doc.displayNumber]!;
			expect(brokenRules(xml), doc.displayNumber).toEqual([]);
			expect(knownGaps(xml), doc.displayNumber).toEqual([]);
			const party = buyerIn(xml);
			expect((party.PartyLegalEntity as Node).RegistrationName).toBe(buyer.name); // BT-44
			const address = party.PostalAddress as Node;
			expect([address.StreetName, address.CityName, text(address.PostalZone)]).toEqual([
				buyer.street,
				buyer.city,
				buyer.postalCode
			]);
			expect((address.Country as Node).IdentificationCode).toBe('SE'); // BT-55: the buyer's country, not the studio's FI
			expect((party.PartyTaxScheme as Node).CompanyID).toBe(buyer.vatId); // BT-48
		}

		const rows = await pdfText(artist, deposit.id);
		for (const words of ['Grankotte Skivbolag AB', 'Tallstigen 4', '791 31 Falun', 'Sweden', 'VAT ID SE559218473201']) {
			expect(rows).toContain(words);
		}
		expect(rows).not.toContain('Reverse charge');
		expect(await pdfText(artist, credit.id)).toContain('VAT ID SE559218473201');
	});

	it('a person with an address: named with it, no VAT ID, in the PDF, the e-invoice and the accountant’s register', async () => {
		const artist = await signedIn(DEMO.artist2);
		const b = await bookWithBilling(artist, person);
		const deposit = await docOf(b.id, 386);
		expect(deposit.customer).toEqual({
			name: 'Ilona Saarinen',
			street: 'Rantakatu 3 B 12',
			postalCode: '90100',
			city: 'Oulu',
			country: 'FI',
			email: DEMO.artist2
		});
		const xml = (await ublOfMonth(deposit.issuedAt))[deposit.displayNumber]!;
		expect(brokenRules(xml)).toEqual([]);
		expect(knownGaps(xml)).toEqual([]);
		const party = buyerIn(xml);
		expect(((party.PostalAddress as Node).Country as Node).IdentificationCode).toBe('FI');
		expect(party.PartyTaxScheme).toBeUndefined();
		const rows = await pdfText(artist, deposit.id);
		for (const words of ['Ilona Saarinen', 'Rantakatu 3 B 12', '90100 Oulu', 'Finland']) expect(rows).toContain(words);
		expect(rows).not.toMatch(/VAT ID (?!FI00000000)/); // only the studio's own

		const accountant = await signedIn(DEMO.accountant);
		const month = ymdInZone(deposit.issuedAt).slice(0, 7);
		const res = await accountant.fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=csv&register=documents`);
		expect(res.status).toBe(200);
		const register = parse<Record<string, string>>(await res.text(), { columns: true });
		const row = register.find((r) => r.Number === deposit.displayNumber)!;
		expect([row.Customer, row['Customer VAT ID'], row['Customer country']]).toEqual(['Ilona Saarinen', '', 'FI']);
	});

	it('a document issued before the booking had billing details keeps what it was issued with, and so does its credit note', async () => {
		const artist = await signedIn(DEMO.artist);
		const b = await bookWithBilling(artist, null);
		const deposit = await docOf(b.id, 386);
		const [artistRow] = await db.select().from(t.user).where(eq(t.user.email, DEMO.artist));
		expect(deposit.customer).toEqual({ name: artistRow!.name, email: DEMO.artist });
		// The artist gives billing details afterwards: the issued document does not change.
		await db.update(t.booking).set({ billing: swedishLabel }).where(eq(t.booking.id, b.id));
		const credit = await cancelForCreditNote(artist, b.id);
		const [again] = await db.select().from(t.invoice).where(eq(t.invoice.id, deposit.id));
		expect(again!.customer).toEqual(deposit.customer);
		expect(credit.customer).toEqual(deposit.customer);

		const xml = (await ublOfMonth(deposit.issuedAt))[deposit.displayNumber]!;
		expect(brokenRules(xml)).toEqual([]);
		// No address was given, so none is printed (no BT-55 borrowed from the studio): BR-10 stays open.
		expect(buyerIn(xml).PostalAddress).toBeUndefined();
		expect(knownGaps(xml)).toEqual(['BR-10']);
		expect(await pdfText(artist, deposit.id)).not.toContain('Grankotte');
	});
});

/** Holds a slot of this file's as `who` with the billing details chosen at booking (the JSON API's `billing`). */
const holdBilledTo = (who: Client, billing: BillingDetails) =>
	holdFirstFree(who, { room: 'control-room', days: DAYS, slots: [['14:00', '16:00']], extra: { billing } });

/** The owner's reverse-charge setting, through the Rates & policy page's form as the owner uses it. */
async function setReverseCharge(owner: Client, on: boolean) {
	const res = await owner.form('/studio/settings?/reverseCharge', on ? { reverseChargeAbroad: 'on' } : {});
	expect(res.status).toBe(200);
	const [row] = await db
		.select({ on: t.studio.reverseChargeAbroad })
		.from(t.studio)
		.where(eq(t.studio.id, await studioIdOf(db)));
	expect(row!.on).toBe(on);
}

describe('reverse charge for an EU business buyer abroad (Directive 2006/112/EC, Articles 44 and 196)', () => {
	it('is the owner’s setting alone, explained on Rates & policy', async () => {
		const owner = await signedIn(DEMO.owner);
		const html = await (await owner.fetch('/studio/settings', { headers: { accept: 'text/html' } })).text();
		expect(html).toContain('Reverse charge for business buyers abroad');
		expect(html).toContain('for your tax adviser to say');
		for (const who of [DEMO.accountant, DEMO.engineer, DEMO.artist]) {
			const res = await (await signedIn(who)).form('/studio/settings?/reverseCharge', { reverseChargeAbroad: 'on' });
			expect([303, 403], who).toContain(res.status);
		}
		const [row] = await db
			.select({ on: t.studio.reverseChargeAbroad })
			.from(t.studio)
			.where(eq(t.studio.id, await studioIdOf(db)));
		expect(row!.on).toBe(false);
	});

	it('prices the booking without VAT and every document of it follows: deposit invoice, final invoice, credit note', async () => {
		// The demo studio's setting is on only while these bookings are made (other specs book with no
		// billing details, or a Finnish buyer, whom it never touches).
		const owner = await signedIn(DEMO.owner);
		const artist = await signedIn(DEMO.artist);
		let first: Held;
		let second: Held;
		const quote = async (billing?: BillingDetails) => {
			const res = await artist.json('/api/studios/hollow-pine/quote', {
				room: 'control-room',
				start: `${DAYS[0]}T14:00`,
				end: `${DAYS[0]}T16:00`,
				billing
			});
			expect(res.status).toBe(200);
			return (await res.json()) as ApiQuote;
		};
		const standard = await quote();
		await setReverseCharge(owner, true);
		try {
			// The quote shown before booking already says what the buyer will pay.
			const reverse = await quote(germanLabel);
			expect(reverse.vatTotal).toBe(0);
			// The answer says why there is no VAT, so the booking form can say it too.
			expect(reverse.vatTreatment).toBe('reverse-charge');
			expect(standard.vatTreatment).toBe('standard');
			// A buyer in the studio's own country pays its VAT.
			const finnish = {
				...germanLabel,
				name: 'Kuusikko Äänite Oy',
				country: 'FI',
				postalCode: '33100',
				city: 'Tampere',
				vatId: 'FI28471939'
			};
			expect((await quote(finnish)).total).toBe(standard.total);
			first = await holdBilledTo(artist, germanLabel);
			second = await holdBilledTo(artist, germanLabel);
		} finally {
			await setReverseCharge(owner, false);
		}
		// Once it is off, the same buyer pays VAT on a new quote.
		expect((await quote(germanLabel)).total).toBe(standard.total);
		const standardNet = standard.net;
		// Prices include 25.5 % VAT: the buyer pays the nets, no VAT (vat.ts reverseChargeItems).
		expect(first.quote.vatTotal).toBe(0);
		expect(first.quote.total).toBe(standardNet);
		expect(first.quote.vat).toEqual([{ ratePercent: '0', base: standardNet, amount: 0 }]);
		const [kept] = await db.select().from(t.booking).where(eq(t.booking.id, first.id));
		expect((kept!.quote as { vatTreatment?: string }).vatTreatment).toBe('reverse-charge');
		expect(kept!.billing).toEqual(germanLabel);

		// The setting is off again; the bookings keep the treatment they were made with.
		await payAndConfirm(db, first);
		await payAndConfirm(db, second);
		const deposit = await docOf(first.id, 386);
		expect(deposit.vatBreakdown).toEqual([{ rateBp: 0, base: first.quote.deposit, amount: 0, category: 'AE' }]);
		expect(deposit.customer).toMatchObject({ name: germanLabel.name, country: 'DE', vatId: 'DE294817367' });
		expect(deposit.note).toMatch(/^Reverse charge/);

		const held = await moveIntoPast(db, first.id);
		const closed = await owner.json(`/api/bookings/${first.id}/close`, { actualEnd: held.end.replace('T16:00', 'T16:20') });
		expect(closed.status).toBe(200);
		const final = await docOf(first.id, 380);
		// Overtime is billed without VAT too: every line at 0 %, one AE group, nothing but the nets.
		expect(final.vatBreakdown.map((g) => [g.rateBp, g.amount, g.category])).toEqual([[0, 0, 'AE']]);
		expect(final.vatTotal).toBe(0);
		expect(final.prepaidVatBreakdown).toEqual(deposit.vatBreakdown);
		expect(final.lineNetTotal).toBeGreaterThan(first.quote.total); // the overtime's net on top

		const credit = await cancelForCreditNote(artist, second.id);
		expect(credit.vatBreakdown.map((g) => g.category)).toEqual(['AE']);
		expect(credit.customer).toEqual((await docOf(second.id, 386)).customer);

		for (const doc of [deposit, final, credit]) {
			const xml = (await ublOfMonth(doc.issuedAt))[doc.displayNumber]!;
			expect(brokenRules(xml), doc.displayNumber).toEqual([]);
			expect(knownGaps(xml), doc.displayNumber).toEqual([]);
			expect(xml).toContain('<cbc:TaxExemptionReasonCode>VATEX-EU-AE</cbc:TaxExemptionReasonCode>');
			expect(xml).not.toMatch(/<cbc:ID>[SZ]<\/cbc:ID>/);
			expect((buyerIn(xml).PartyTaxScheme as Node).CompanyID).toBe('DE294817367'); // BR-AE-02
			const rows = await pdfText(artist, doc.id);
			for (const words of ['Reverse charge', 'VAT ID DE294817367', 'VAT ID FI00000000', 'Germany'])
				expect(rows, words).toContain(words);
		}

		// The month's VAT keeps the reverse-charged supplies apart.
		const accountant = await signedIn(DEMO.accountant);
		const month = ymdInZone(deposit.issuedAt).slice(0, 7);
		const vat = parse<Record<string, string>>(
			await (await accountant.fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=csv&register=vat`)).text(),
			{ columns: true }
		);
		expect(vat.find((r) => r['VAT category'] === 'AE')).toMatchObject({ 'VAT rate %': '0', VAT: '0.00' });
	});
});
