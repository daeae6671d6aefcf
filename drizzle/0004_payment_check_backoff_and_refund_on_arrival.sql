ALTER TABLE "payment" ADD COLUMN "last_checked_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "refund_on_arrival" bigint;