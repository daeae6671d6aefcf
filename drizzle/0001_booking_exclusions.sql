-- No room, engineer or piece of gear is ever in two active bookings at once, turnaround included.
-- PostgreSQL manual, "Range Types" (exclusion constraints) and "Constraints": EXCLUDE USING gist
-- with btree_gist for the equality part. Half-open ranges '[)' let back-to-back bookings both fit.
CREATE EXTENSION IF NOT EXISTS btree_gist;
--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_room_no_overlap"
	EXCLUDE USING gist ("room_id" WITH =, tstzrange("starts_at", "busy_until", '[)') WITH &&)
	WHERE ("status" IN ('held', 'pending', 'confirmed', 'completed'));
--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_engineer_no_overlap"
	EXCLUDE USING gist ("engineer_id" WITH =, tstzrange("starts_at", "busy_until", '[)') WITH &&)
	WHERE ("engineer_id" IS NOT NULL AND "status" IN ('held', 'pending', 'confirmed', 'completed'));
--> statement-breakpoint
ALTER TABLE "booking_gear" ADD CONSTRAINT "booking_gear_no_overlap"
	EXCLUDE USING gist ("gear_item_id" WITH =, tstzrange("starts_at", "busy_until", '[)') WITH &&)
	WHERE ("active");
--> statement-breakpoint
-- Gear rows carry the booking's times and activity so the constraint above can see them.
CREATE OR REPLACE FUNCTION booking_gear_copy_booking() RETURNS trigger AS $$
BEGIN
	SELECT b.starts_at, b.busy_until, b.status IN ('held', 'pending', 'confirmed', 'completed')
	INTO NEW.starts_at, NEW.busy_until, NEW.active
	FROM booking b WHERE b.id = NEW.booking_id;
	RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER booking_gear_copy_booking_trg
	BEFORE INSERT OR UPDATE ON "booking_gear"
	FOR EACH ROW EXECUTE FUNCTION booking_gear_copy_booking();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION booking_sync_gear() RETURNS trigger AS $$
BEGIN
	UPDATE booking_gear SET booking_id = booking_id WHERE booking_id = NEW.id;
	RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER booking_sync_gear_trg
	AFTER UPDATE OF starts_at, busy_until, status ON "booking"
	FOR EACH ROW EXECUTE FUNCTION booking_sync_gear();
