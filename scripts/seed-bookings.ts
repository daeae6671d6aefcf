// Demo bookings for the seeded studio. Filled in once the pricing engine can price them.
import type { Database } from '../src/lib/server/db/client';

export async function seedDemoBookings(
	_db: Database,
	_ids: { roomIds: Record<string, string>; userIds: Record<string, string> }
): Promise<void> {}
