// The engineer's day plan over HTTP, on the seeded demo sessions (scripts/seed-bookings.ts puts
// The Lantern Static in the live room three days after the day of the seed, with a recall sheet
// from 14 days before it). The day is read from the seeded booking itself, not counted from the
// clock now: a run that crosses midnight still opens the day the seed chose.
import { beforeAll, describe, expect, it } from 'vitest';
import { Client, signedIn } from '../support/http';
import { DEMO } from '../support/env';
import { ymdInZone } from '../support/dates';
import { expectRefused, expectRefusedPage } from '../support/refusal';
import { DEMO_BOOKING_IDS } from '../../src/lib/domain/demo';

let day = '';
/** The references of the seeded sessions: the third is this day's, the first its recall sheet's. */
let ref3 = '';
let ref1 = '';
beforeAll(async () => {
	const res = await (await signedIn(DEMO.engineer)).fetch('/api/bookings?studio=hollow-pine');
	const { bookings } = (await res.json()) as { bookings: { id: string; reference: string; start: string }[] };
	const demo = bookings.find((b) => b.id === DEMO_BOOKING_IDS[2]);
	if (!demo) throw new Error('the third seeded session is missing');
	day = ymdInZone(new Date(demo.start));
	ref3 = demo.reference;
	ref1 = bookings.find((b) => b.id === DEMO_BOOKING_IDS[0])!.reference;
});

interface Plan {
	date: string;
	rooms: {
		slug: string;
		sessions: {
			reference: string;
			artist: { name: string };
			recall: { fromBooking: string; channels: { source: string }[] } | null;
		}[];
	}[];
}

describe('GET /api/studios/hollow-pine/plan', () => {
	it('gives the engineer each room’s sessions with the recall sheet carried over', async () => {
		const res = await (await signedIn(DEMO.engineer)).fetch(`/api/studios/hollow-pine/plan?date=${day}`);
		expect(res.status).toBe(200);
		const plan = (await res.json()) as Plan;
		expect(plan.rooms.map((r) => r.slug)).toEqual(['live-room', 'vocal-booth', 'control-room']);
		const live = plan.rooms.find((r) => r.slug === 'live-room')!.sessions.find((s) => s.reference === ref3);
		expect(live?.artist.name).toContain('The Lantern Static');
		expect(live?.recall?.fromBooking).toBe(ref1);
		expect(live?.recall?.channels.map((c) => c.source)).toContain('Kick drum');
	});

	it('is for engineers and the owner only', async () => {
		// Nothing of the day's plan in a refusal: not the session, its artist or its recall sheet.
		const secrets = [ref3, 'Lantern', 'Kick drum'];
		await expectRefused(await new Client().fetch(`/api/studios/hollow-pine/plan?date=${day}`), 401, { secrets });
		await expectRefused(await (await signedIn(DEMO.artist)).fetch(`/api/studios/hollow-pine/plan?date=${day}`), 403, { secrets });
		await expectRefused(await (await signedIn(DEMO.accountant)).fetch(`/api/studios/hollow-pine/plan?date=${day}`), 403, {
			secrets
		});
		const owner = await (await signedIn(DEMO.owner)).fetch(`/api/studios/hollow-pine/plan?date=${day}`);
		expect(owner.status).toBe(200);
		expect(await owner.text()).toContain(ref3);
	});

	it('answers 422 for a malformed date', async () => {
		const res = await (await signedIn(DEMO.engineer)).fetch('/api/studios/hollow-pine/plan?date=next-tuesday');
		expect(res.status).toBe(422);
		expect(((await res.json()) as { error: string }).error).toBe('invalid');
	});

	it('lets the engineer write this session’s recall sheet, which the plan then shows', async () => {
		const c = await signedIn(DEMO.engineer);
		const plan = (await (await c.fetch(`/api/studios/hollow-pine/plan?date=${day}`)).json()) as Plan & {
			rooms: { sessions: { id: string; ownRecall: unknown }[] }[];
		};
		const session = plan.rooms.flatMap((r) => r.sessions).find((s) => s.reference === ref3) as unknown as { id: string };
		const res = await c.form(`/plan?/recall`, {
			bookingId: session.id,
			rows: '1',
			'source-0': 'Rhythm guitar',
			'microphone-0': 'Dynamic, cardioid',
			'placement-0': 'Off-axis at the speaker cone edge',
			'preampGainDb-0': '45',
			'highPassHz-0': '80',
			'compressor-0': '',
			'notes-0': '',
			notes: 'Amp on the riser'
		});
		expect(res.status).toBe(200);
		const after = (await (await c.fetch(`/api/studios/hollow-pine/plan?date=${day}`)).json()) as {
			rooms: {
				sessions: { id: string; ownRecall: { channels: { source: string; preampGainDb: number }[]; notes: string } | null }[];
			}[];
		};
		const own = after.rooms.flatMap((r) => r.sessions).find((s) => s.id === session.id)!.ownRecall;
		expect(own).toMatchObject({ notes: 'Amp on the riser', channels: [{ source: 'Rhythm guitar', preampGainDb: 45 }] });
		const bad = await c.form(`/plan?/recall`, { bookingId: session.id, rows: '1', 'source-0': 'Vox', 'preampGainDb-0': '900' });
		expect(bad.status).toBe(422);
		await expectRefusedPage(
			await (await signedIn(DEMO.artist)).form(`/plan?/recall`, { bookingId: session.id, rows: '0' }),
			403,
			/Your role does not give access/,
			['Amp on the riser', 'Rhythm guitar']
		);
		// The artist's try changed nothing.
		const kept = (await (await c.fetch(`/api/studios/hollow-pine/plan?date=${day}`)).json()) as typeof after;
		expect(kept.rooms.flatMap((r) => r.sessions).find((s) => s.id === session.id)!.ownRecall).toEqual(own);
	});
});
