import { error, fail, redirect } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { studioPath } from '$lib/studio-paths';
import { bookPath, type BookingKind } from '$lib/components/booking/choices';
import { requireUser } from '$lib/server/guard';
import * as payments from '$lib/server/payments';
import { formFields } from '$lib/server/payments/http';
import type { QuoteView } from '$lib/types/quote';
import { readFileField } from '$lib/server/multipart';
import * as uploads from '$lib/server/uploads';
import { messagesOf } from '$lib/server/messages';
import { messageLabel } from '$lib/domain/messages';
import { localDateOf, wallClock } from '$lib/domain/time';
import type { Role } from '$lib/roles';
import { formText, readFormData } from '$lib/server/api';
import { holdGone } from '$lib/domain/lifecycle';
import * as moves from '$lib/server/bookings/move';
import { moveTerms } from '$lib/domain/move';
import { listRooms } from '$lib/server/studio';
import { CheckoutError, startCheckout } from '$lib/server/payments/checkout';
import type { SessionUser } from '$lib/server/auth';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { recordPaymentSchema, type RecordPaymentForm } from '$lib/schemas/recorded-payment';
import { parseMoney, toDecimalString } from '$lib/domain/money';
import type { MoneyPanelData } from '$lib/types/money';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const me = requireUser(locals);
	const b = await bookings.getForViewer(me, params.id);
	// Another artist's booking, or another studio's, is a 404, not a 403: its existence is not theirs to know.
	if (!b) error(404, { error: 'not_found', message: 'There is no booking at this address, or it is not yours to see.' });
	// The booking itself matters more than its payment panel: if payments cannot be read, the
	// page still shows the booking and says so.
	let moneyUnavailable = false;
	const [money, listed, scheduled] = await Promise.all([
		payments.loadMoneyPanel(me, b).catch((e: unknown) => {
			console.error('[booking page] could not load the payment panel', b.id, e);
			moneyUnavailable = true;
			return null;
		}),
		uploads.listForViewer(me, b.id),
		messagesOf(b.id)
	]);
	const q = b.quote;
	// The booking is read through its own studio: its zone, and the viewer's role there (the
	// engineer of one studio is an artist at another).
	const { studio } = b;
	const { timeZone } = studio;
	const role = b.viewerRole;

	// A hold that ran out (swept or not yet): say so, and offer the same time again if it is free.
	const now = new Date();
	let rebook: { free: boolean; taken: 'room' | 'engineer' | 'gear' | null; bookHref: string; calendarHref: string } | null = null;
	if (holdGone(b, now)) {
		// The booking's own studio: its booking page and calendar are where the time is offered again.
		const { slug } = studio;
		const outcome = await bookings.rebookable(b, b.studioId, now);
		const at = wallClock(b.startsAt, timeZone);
		const minutes = q.durationMinutes;
		const kind: BookingKind = minutes === studio.halfDayMinutes ? 'half' : minutes === studio.fullDayMinutes ? 'full' : 'hourly';
		rebook = {
			free: outcome.free,
			taken: outcome.free ? null : outcome.taken,
			bookHref: bookPath(slug, {
				room: b.roomSlug,
				date: at.date,
				start: at.time,
				kind,
				hours: minutes / 60,
				engineer: !!b.engineerId,
				gear: b.gear.map((g) => g.id),
				project: b.project
			}),
			calendarHref: `${studioPath(slug, 'calendar')}?room=${encodeURIComponent(b.roomSlug)}&date=${at.date}`
		};
	}
	const move = await moveSection(me, b, url.searchParams, now);
	const quote: QuoteView = {
		currency: q.currency,
		pricesIncludeVat: q.pricesIncludeVat,
		lines: q.lines.map((l) => ({ key: l.key, label: l.label, amount: l.amount })),
		vat: q.vat.map((v) => ({ ratePercent: v.ratePercent, base: v.base, amount: v.amount })),
		rounding: q.rounding,
		total: q.total,
		deposit: q.deposit,
		balance: q.balance,
		vatTreatment: q.vatTreatment
	};
	return {
		recordForm: await recordFormFor(money),
		booking: {
			id: b.id,
			reference: b.reference,
			status: b.status,
			startsAt: b.startsAt,
			endsAt: b.endsAt,
			holdExpiresAt: b.holdExpiresAt,
			roomName: b.roomName,
			roomSlug: b.roomSlug,
			engineerName: b.engineerName,
			engineerBooked: !!b.engineerId,
			artistName: b.artistName,
			project: b.project,
			notes: b.notes,
			billedTo: bookings.billedTo(b),
			cancelledAt: b.cancelledAt,
			cancelReason: b.cancelReason,
			noShowAt: b.noShowAt,
			durationMinutes: q.durationMinutes,
			gear: b.gear.map((g) => ({ id: g.id, name: g.name, category: g.category, hireFee: g.hireFee, caution: g.caution }))
		},
		quote,
		rebook,
		move,
		money,
		moneyUnavailable,
		// The session's scheduled e-mails, sent or still to come; those no longer wanted are left out.
		messages: scheduled
			.filter((m) => !m.cancelledAt)
			.map((m) => ({ key: m.key, label: messageLabel(m.kind, m.key), dueAt: m.dueAt, sentAt: m.sentAt })),
		files: listed.ok
			? {
					items: listed.uploads.map((u) => ({
						id: u.id,
						name: u.name,
						typeLabel: u.typeLabel,
						sizeBytes: u.sizeBytes,
						createdAt: u.createdAt,
						href: u.href
					})),
					limits: listed.limits,
					usage: listed.usage,
					open: listed.open,
					mayChange: listed.mayChange
				}
			: null,
		// The booking's studio, not the one its viewer works in now (the layout's).
		studio: { name: studio.name, timeZone, currency: studio.currency, locale: studio.locale },
		viewerIsArtist: role === 'artist',
		// The accountant goes back to the month of the booking's latest document (its session's month without one).
		back: backLink(
			role,
			localDateOf(b.startsAt, timeZone),
			localDateOf(money?.invoices.at(-1)?.issuedAt ?? b.startsAt, timeZone)
		),
		// The accountant reads what the accounts need: the session, its price and its money.
		showDetails: role !== 'accountant'
	};
};

/**
 * "Move this session", for the artist of the booking and its studio's owner while it is confirmed
 * and ahead: the moving policy in words, a move waiting for its payment, and the outcome of the
 * time asked for in the address (?moveDate=&moveStart=&moveEnd=&moveRoom=&moveEngineer=), priced
 * by the server before anyone confirms.
 */
async function moveSection(me: SessionUser, b: bookings.BookingDetail, q: URLSearchParams, now: Date) {
	const role = b.viewerRole;
	const mayMove = role === 'owner' || (role === 'artist' && b.artistId === me.id);
	const waiting = mayMove ? await moves.waitingMove(b.id) : null;
	if (!mayMove || (b.status !== 'confirmed' && !waiting)) return null;
	const { studio: s } = await bookings.pricingContext(b.studioId);
	const policy = { freeHours: s.moveFreeHours, minHours: s.moveMinHours, fee: s.moveFee };
	const terms = moveTerms({
		mover: role === 'owner' ? 'owner' : 'artist',
		own: b.artistId === me.id,
		status: b.status,
		startsAt: b.startsAt,
		now,
		policy
	});
	const tz = s.timeZone;
	const at = wallClock(b.startsAt, tz);
	const endAt = wallClock(b.endsAt, tz);
	const asked = {
		date: q.get('moveDate') ?? '',
		start: q.get('moveStart') ?? '',
		end: q.get('moveEnd') ?? '',
		room: q.get('moveRoom') ?? b.roomSlug,
		engineer: q.get('moveEngineer') ?? (b.engineerId ? 'yes' : 'no')
	};
	let outcome = null;
	let problem: { message: string; fields?: Record<string, string[]> } | null = null;
	if (asked.date && asked.start && asked.end) {
		const previewed = await moves.previewMove(me, b.id, moveInput(asked, role === 'owner'), now);
		if (previewed.ok) outcome = previewed.body;
		else problem = { message: previewed.message, fields: 'fields' in previewed ? previewed.fields : undefined };
	}
	const rooms = role === 'owner' ? (await listRooms(b.studioId)).map((r) => ({ slug: r.slug, name: r.name })) : [];
	return {
		mover: role === 'owner' ? ('owner' as const) : ('artist' as const),
		policy,
		terms,
		current: { date: at.date, start: at.time, end: endAt.time },
		asked,
		outcome,
		problem,
		rooms,
		waiting: waiting
			? {
					startsAt: waiting.m.toStartsAt,
					endsAt: waiting.m.toEndsAt,
					roomName: waiting.roomName,
					amount: waiting.m.settlement,
					checkoutUrl: waiting.paymentStatus === 'open' ? waiting.checkoutUrl : null
				}
			: null
	};
}

/** The move form's fields as the move API's request: the artist moves the time, the owner also the room and engineer. */
function moveInput(f: Record<string, unknown>, owner: boolean) {
	const text = (k: string) => (typeof f[k] === 'string' ? f[k] : '');
	const date = text('date') || text('moveDate');
	const endDate = text('endDate') || date;
	return {
		start: `${date}T${text('start') || text('moveStart')}`,
		end: `${endDate}T${text('end') || text('moveEnd')}`,
		...(owner
			? {
					room: text('room') || text('moveRoom') || undefined,
					engineer: (text('engineer') || text('moveEngineer')) === 'no' ? false : undefined
				}
			: {})
	};
}

type RecordNote = { kind: 'saved' | 'error'; text: string };

/** The owner's "Record a payment" form, filled with what is owed and today; null for anyone else. */
async function recordFormFor(money: MoneyPanelData | null) {
	const offer = money?.actions.recordPayment;
	if (!money || !offer) return null;
	return superValidate<RecordPaymentForm, RecordNote>(
		{ amount: toDecimalString(offer.owed, money.currency), method: 'cash', paidOn: offer.today, note: '' },
		zod4(recordPaymentSchema(money.currency)),
		{ id: RECORD_FORM_ID, errors: false }
	);
}

const RECORD_FORM_ID = 'record-payment';

/** Back to the list each role may open: every link on the page leads somewhere its viewer may go. */
function backLink(role: Role, day: string, accountsDay: string): { href: string; label: string } {
	switch (role) {
		case 'owner':
			return { href: '/studio/bookings', label: 'All bookings' };
		case 'engineer':
			return { href: `/plan?date=${day}`, label: 'Day plan' };
		case 'accountant':
			return { href: `/accounts?month=${accountsDay.slice(0, 7)}`, label: 'Accounts' };
		default:
			return { href: '/bookings', label: 'My bookings' };
	}
}

/** Back to this page's money panel with a notice code it turns into words. */
function backWith(bookingId: string, notice: string): never {
	redirect(303, `/bookings/${bookingId}?money=${encodeURIComponent(notice)}#money`);
}

/** A refusal that is not a notice on the panel: the page's own 403 or 404. */
function refuse(status: 403 | 404, code: string, message: string): never {
	error(status, { error: code, message });
}

async function formOf(request: Request, listFields: string[] = []) {
	const form = await readFormData(request);
	if (!form) error(400, { error: 'bad_request', message: 'The form could not be read.' });
	return formFields(form, listFields);
}

export const actions: Actions = {
	/** Stripe Checkout for the deposit or the balance: off to Stripe's page, or back with why not. */
	pay: async ({ request, locals, params, url }) => {
		const me = requireUser(locals);
		const found = await payments.payable(me, params.id);
		if (!found.ok) refuse(found.status === 404 ? 404 : 403, found.code, found.message);
		const body = await formOf(request);
		const paid = await payments.pay(found.booking, body.kind, url.origin);
		if (!paid.ok) backWith(params.id, paid.status === 503 ? 'pay-unavailable' : 'pay-refused');
		redirect(303, paid.checkoutUrl);
	},
	cancel: async ({ request, locals, params, getClientAddress }) => {
		const me = requireUser(locals);
		const body = await formOf(request);
		const outcome = await payments.cancel(me, params.id, body.reason, getClientAddress());
		if (!outcome.ok) {
			if (outcome.status === 409) backWith(params.id, 'cancel-refused');
			refuse(outcome.status, outcome.code, outcome.message);
		}
		backWith(params.id, 'cancelled');
	},
	/** The owner of the booking's studio sends failed refunds again. */
	retry: async ({ request, locals, params }) => {
		const me = requireUser(locals);
		await formOf(request);
		const result = await payments.retryFailedRefunds(me, params.id);
		if (!result.ok)
			refuse(result.status, result.status === 404 ? 'not_found' : 'forbidden', 'Only the owner may retry a refund.');
		backWith(params.id, result.retried ? 'refund-retried' : 'refund-nothing');
	},
	/** The owner or an engineer records the end of the session: overtime, final invoice, completed. */
	close: async ({ request, locals, params }) => {
		const me = requireUser(locals);
		const body = await formOf(request, ['gearUsed']);
		const outcome = await payments.closeBooking(me, params.id, body);
		if (!outcome.ok) {
			if (outcome.status === 403 || outcome.status === 404) refuse(outcome.status, outcome.code, outcome.message);
			backWith(params.id, `close-${outcome.code}`);
		}
		backWith(params.id, 'closed');
	},
	/** Moves the session to the time (and, for the owner, room and engineer) of the form: at once, or to Checkout for the difference. */
	move: async ({ request, locals, params, url }) => {
		const me = requireUser(locals);
		const body = await formOf(request);
		const found = await bookings.getRow(me, params.id);
		if (!found) refuse(404, 'not_found', 'No such booking.');
		const owner = found.as.role === 'owner';
		let outcome: Awaited<ReturnType<typeof moves.moveBooking>>;
		try {
			outcome = await moves.moveBooking(me, params.id, moveInput(body, owner), { origin: url.origin });
		} catch (e) {
			if (e instanceof CheckoutError) redirect(303, `/bookings/${params.id}#move`);
			throw e;
		}
		if (!outcome.ok) {
			if (outcome.status === 403 || outcome.status === 404) refuse(outcome.status, outcome.code, outcome.message);
			return fail(outcome.status, {
				move: {
					message: outcome.message,
					nearestStarts: 'nearestStarts' in outcome ? (outcome.nearestStarts ?? []) : [],
					fields: 'fields' in outcome ? outcome.fields : {}
				}
			});
		}
		if (outcome.state === 'awaiting_payment') redirect(303, outcome.body.checkoutUrl as string);
		redirect(303, `/bookings/${params.id}?moved=1#move`);
	},
	/** Pays for the move waiting for its payment: its Checkout again. */
	payMove: async ({ request, locals, params, url }) => {
		const me = requireUser(locals);
		await formOf(request);
		const found = await bookings.getRow(me, params.id);
		if (!found || (found.as.role !== 'owner' && found.booking.artistId !== me.id)) refuse(404, 'not_found', 'No such booking.');
		const checkout = await startCheckout(params.id, 'move', url.origin).catch(() => null);
		redirect(303, checkout?.url ?? `/bookings/${params.id}#move`);
	},
	/** The owner or an engineer records that nobody came, after the confirm step on the panel. */
	noShow: async ({ request, locals, params }) => {
		const me = requireUser(locals);
		await formOf(request);
		const outcome = await payments.recordNoShow(me, params.id);
		if (!outcome.ok) {
			if (outcome.status === 403 || outcome.status === 404) refuse(outcome.status, outcome.code, outcome.message);
			backWith(params.id, `no-show-${outcome.code}`);
		}
		backWith(params.id, 'no-show');
	},
	/** The owner records a payment taken outside Checkout (cash, bank transfer). */
	record: async ({ request, locals, params }) => {
		const me = requireUser(locals);
		const found = await bookings.getForViewer(me, params.id);
		if (!found) refuse(404, 'not_found', 'No such booking.');
		const schema = recordPaymentSchema(found.currency);
		const form = await superValidate<RecordPaymentForm, RecordNote>(request, zod4(schema), { id: RECORD_FORM_ID });
		if (!form.valid) return message(form, { kind: 'error', text: 'Not recorded: check the marked fields.' }, { status: 422 });
		const parsed = parseMoney(form.data.amount, found.currency);
		if (!parsed.ok) return setError(form, 'amount', 'Enter an amount, e.g. 45.00.', { status: 422 });
		const outcome = await payments.recordPayment(me, params.id, { ...form.data, amount: parsed.value });
		if (!outcome.ok) {
			if (outcome.status === 403 || outcome.status === 404) refuse(outcome.status, outcome.code, outcome.message);
			for (const [field, messages] of Object.entries(outcome.fields ?? {})) {
				if (field === 'amount' || field === 'paidOn' || field === 'method' || field === 'note') setError(form, field, messages);
			}
			return message(form, { kind: 'error', text: outcome.message }, { status: outcome.status });
		}
		backWith(params.id, 'recorded');
	},
	/** The owner reverses a recorded payment, giving a reason. */
	reverse: async ({ request, locals, params }) => {
		const me = requireUser(locals);
		const body = await formOf(request);
		const recordedId = typeof body.recordedId === 'string' ? body.recordedId : '';
		const outcome = await payments.reversePayment(me, params.id, recordedId, { reason: body.reason ?? '' });
		if (!outcome.ok) {
			if (outcome.status === 403 || outcome.status === 404) refuse(outcome.status, outcome.code, outcome.message);
			backWith(params.id, outcome.status === 422 ? 'reverse-reason' : 'reverse-refused');
		}
		backWith(params.id, 'reversed');
	},
	/** A file for the session, posted as multipart/form-data and stored as it streams in. */
	upload: async ({ request, locals, params, getClientAddress }) => {
		const me = requireUser(locals);
		const received = await readFileField(request, 'file', (file) => uploads.save(me, params.id, file));
		const outcome = received.ok ? received.value : received;
		if (!outcome.ok) return fail(outcome.status, { upload: { error: outcome.message } });
		await uploads.auditAdded(me, params.id, outcome.upload, getClientAddress());
		return { upload: { added: outcome.upload.originalName } };
	},
	remove: async ({ request, locals, params, getClientAddress }) => {
		const me = requireUser(locals);
		const form = await readFormData(request);
		if (!form) return fail(400, { remove: { error: 'The form could not be read.' } });
		const uploadId = formText(form.get('uploadId'));
		const removed = await uploads.remove(me, params.id, uploadId);
		if (!removed.ok) return fail(removed.status, { remove: { error: removed.message } });
		await uploads.auditRemoved(me, params.id, uploadId, getClientAddress());
		return { remove: { removed: removed.upload.originalName } };
	}
};
