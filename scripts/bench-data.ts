// A year of bookings for the benchmark: every room, most days, two sessions a day.
import { sql } from 'drizzle-orm';
import { createDb } from '../src/lib/server/db/client';

const { db, client } = createDb(process.env.DATABASE_URL!, { max: 1 });
try {
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
		cross join generate_series(now() - interval '180 days', now() + interval '180 days', interval '1 day') d
		cross join (values (9), (15)) s(h)
		where extract(isodow from d) <> 7
		on conflict do nothing
		returning id`);
	console.log(`seeded ${rows.length} bookings`);
} finally {
	await client.end();
}
