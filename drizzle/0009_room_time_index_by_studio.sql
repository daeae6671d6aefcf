DROP INDEX "booking_room_time_idx";--> statement-breakpoint
CREATE INDEX "booking_room_time_idx" ON "booking" USING btree ("studio_id","room_id","starts_at");