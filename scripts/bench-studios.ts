// Adds studios to the benchmark's scratch database until it holds `total` (default 1,000), each a
// copy of the first studio's settings with two rooms and two sessions a weekday in each room over
// the same months as the first studio's bookings, so the tables a month of availability reads hold
// a thousand studios' rows. Set-based (generate_series), so it takes seconds, not minutes.
import { sql } from 'drizzle-orm';
import type { Database } from '../src/lib/server/db/client';

const ACCOUNT_COLUMNS = [
	'stripe_account_id',
	'charges_enabled',
	'payouts_enabled',
	'details_submitted',
	'account_requirements',
	'account_event_at'
];

export async function seedBenchStudios(db: Database, total: number): Promise<{ studios: number; bookings: number }> {
	const [{ n }] = (await db.execute(sql`select count(*)::int as n from studio`)) as unknown as [{ n: number }];
	const add = total - n;
	if (add <= 0) return { studios: 0, bookings: 0 };
	// Every column of the first studio's row but its id, its name and its payment account (an
	// account is one studio's alone): the new studios' settings.
	const columns = (
		(await db.execute(
			sql`select column_name from information_schema.columns where table_name = 'studio' and table_schema = current_schema() order by ordinal_position`
		)) as unknown as { column_name: string }[]
	)
		.map((c) => c.column_name)
		.filter((c) => !['id', 'name', ...ACCOUNT_COLUMNS].includes(c));
	const list = columns.map((c) => `"${c}"`).join(', ');
	const copied = columns.map((c) => `first."${c}"`).join(', ');
	await db.transaction(async (tx) => {
		await tx.execute(sql`
			create temporary table bench_new on commit drop as
			select gen_random_uuid()::text as id, 'Bench studio ' || g as name, 'bench-' || g as slug
			from generate_series(1, ${add}) g`);
		await tx.execute(
			sql`insert into organization (id, name, slug, created_at) select id, name, slug, now() + interval '1 second' from bench_new`
		);
		await tx.execute(
			sql.raw(`
			insert into studio (id, name, ${list})
			select n.id, n.name, ${copied}
			from bench_new n
			cross join (select * from studio order by (select created_at from organization o where o.id = studio.id) limit 1) first`)
		);
		await tx.execute(sql`
			insert into room (studio_id, slug, name, hourly, half_day, full_day, sort_order)
			select n.id, r.slug, r.name, 4500, 16000, 30000, r.sort_order
			from bench_new n
			cross join (values ('big-room', 'Big room', 1), ('small-room', 'Small room', 2)) r(slug, name, sort_order)`);
	});
	const rows = await db.execute(sql`
		insert into booking (studio_id, reference, room_id, artist_id, starts_at, ends_at, busy_until, status, quote, currency, total, deposit)
		select r.studio_id,
		       'BENCH-' || r.slug || '-' || d::date || '-' || s.h,
		       r.id,
		       (select id from "user" where email = 'artist@slateroom.test'),
		       (d::date + make_interval(hours => s.h)) at time zone 'Europe/Helsinki',
		       (d::date + make_interval(hours => s.h + 4)) at time zone 'Europe/Helsinki',
		       (d::date + make_interval(hours => s.h + 4, mins => 30)) at time zone 'Europe/Helsinki',
		       'confirmed', '{}'::jsonb, 'EUR', 16000, 5000
		from room r
		join organization o on o.id = r.studio_id and o.slug like 'bench-%'
		cross join generate_series(now() - interval '30 days', now() + interval '60 days', interval '1 day') d
		cross join (values (9), (15)) s(h)
		where extract(isodow from d) < 6
		on conflict do nothing
		returning id`);
	// Vacuumed as well as analysed: the first reads after a bulk insert otherwise set every row's
	// hint bits and the autovacuum runs during the measurement, timing the insert, not the reads
	// (PostgreSQL manual, "Routine Vacuuming"; common benchmarking practice).
	await db.execute(sql`vacuum analyze`);
	return { studios: add, bookings: rows.length };
}
