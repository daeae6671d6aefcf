// Measures GET /api/studios/hollow-pine/availability over a month and GET /api/health in one run and prints the figures.
import autocannon from 'autocannon';

const base = process.env.ORIGIN ?? 'http://127.0.0.1:3200';
const seconds = Number(process.env.BENCH_SECONDS ?? 10);
const connections = Number(process.env.BENCH_CONNECTIONS ?? 10);

function ymd(offsetDays: number) {
	return new Date(Date.now() + offsetDays * 86_400_000).toISOString().slice(0, 10);
}

async function run(title: string, path: string) {
	const result = await autocannon({ url: base + path, connections, duration: seconds, title });
	const non2xx = result.non2xx + result.errors;
	return { title, rps: result.requests.average, p50: result.latency.p50, p99: result.latency.p99, non2xx };
}

const month = `/api/studios/hollow-pine/availability?room=live-room&from=${ymd(7)}&to=${ymd(37)}`;
await run('warm-up', month);
const availability = await run('GET /api/studios/hollow-pine/availability (31 days)', month);
const health = await run('GET /api/health', '/api/health');

console.log(`\n${seconds} s each, ${connections} connections, production build on loopback, a year of bookings\n`);
console.log(`${'endpoint'.padEnd(52)}   req/s      p50 ms   p99 ms   errors`);
for (const r of [availability, health]) {
	console.log(
		`${r.title.padEnd(52)} ${r.rps.toFixed(0).padStart(7)} ${String(r.p50).padStart(10)} ${String(r.p99).padStart(8)} ${String(r.non2xx).padStart(8)}`
	);
}
console.log(`\navailability / health throughput ratio: ${(availability.rps / health.rps).toFixed(3)}`);
