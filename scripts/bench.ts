// Measures a month of availability and GET /api/health in one run and prints the figures; then
// the studios figure: the first studio's month of availability with that one studio in the
// database, and again once the database holds 1,000 studios with rooms and bookings (added here,
// in the benchmark's own scratch database), as a ratio of one run. Asserts nothing.
import autocannon from 'autocannon';
import { createDb } from '../src/lib/server/db/client';
import { seedBenchStudios } from './bench-studios';

const base = process.env.ORIGIN ?? 'http://127.0.0.1:3200';
const seconds = Number(process.env.BENCH_SECONDS ?? 10);
const connections = Number(process.env.BENCH_CONNECTIONS ?? 10);
const studios = Number(process.env.BENCH_STUDIOS ?? 1000);

function ymd(offsetDays: number) {
	return new Date(Date.now() + offsetDays * 86_400_000).toISOString().slice(0, 10);
}

async function run(title: string, path: string) {
	const result = await autocannon({ url: base + path, connections, duration: seconds, title });
	const non2xx = result.non2xx + result.errors;
	return { title, rps: result.requests.average, p50: result.latency.p50, p99: result.latency.p99, non2xx };
}

type Figure = Awaited<ReturnType<typeof run>>;

function print(rows: Figure[]) {
	console.log('endpoint                              req/s      p50 ms   p99 ms   errors');
	for (const r of rows) {
		console.log(
			`${r.title.padEnd(36)} ${r.rps.toFixed(0).padStart(7)} ${String(r.p50).padStart(10)} ${String(r.p99).padStart(8)} ${String(r.non2xx).padStart(8)}`
		);
	}
}

// The demo studio's live room, a month from a week ahead.
const month = `/api/studios/hollow-pine/availability?room=live-room&from=${ymd(7)}&to=${ymd(37)}`;

await run('warm-up', month);
const availability = await run('GET availability (31 days)', month);
const health = await run('GET /api/health', '/api/health');

console.log(`\n${seconds} s each, ${connections} connections, production build on loopback, a year of bookings`);
console.log(`availability measured at ${month.split('?')[0]}\n`);
print([availability, health]);
console.log(`\navailability / health throughput ratio: ${(availability.rps / health.rps).toFixed(3)}`);

// The studios figure.
const { db, client } = createDb(process.env.DATABASE_URL!, { max: 2 });
try {
	const started = Date.now();
	const added = await seedBenchStudios(db, studios);
	console.log(
		`\nadded ${added.studios} studios (now ${studios}), ${added.bookings} bookings in ${((Date.now() - started) / 1000).toFixed(1)} s`
	);
} finally {
	await client.end();
}
await run('warm-up', month);
const many = await run(`GET availability, ${studios} studios`, month);
console.log();
print([{ ...availability, title: 'GET availability, 1 studio' }, many]);
console.log(`\n${studios} studios / 1 studio throughput ratio: ${(many.rps / availability.rps).toFixed(3)}`);
console.log(`${studios} studios / 1 studio p50 latency ratio: ${(many.p50 / Math.max(availability.p50, 1)).toFixed(3)}`);
