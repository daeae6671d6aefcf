CREATE TABLE "booking_move" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"studio_id" text NOT NULL,
	"booking_id" uuid NOT NULL,
	"from_starts_at" timestamp with time zone NOT NULL,
	"from_ends_at" timestamp with time zone NOT NULL,
	"from_room_id" uuid NOT NULL,
	"from_engineer_id" text,
	"from_gear_ids" uuid[] NOT NULL,
	"to_starts_at" timestamp with time zone NOT NULL,
	"to_ends_at" timestamp with time zone NOT NULL,
	"to_busy_until" timestamp with time zone NOT NULL,
	"to_room_id" uuid NOT NULL,
	"to_engineer_id" text,
	"to_gear_ids" uuid[] NOT NULL,
	"quote" jsonb NOT NULL,
	"old_total" bigint NOT NULL,
	"new_total" bigint NOT NULL,
	"old_deposit" bigint NOT NULL,
	"new_deposit" bigint NOT NULL,
	"fee" bigint DEFAULT 0 NOT NULL,
	"settlement" bigint NOT NULL,
	"status" text NOT NULL,
	"payment_id" uuid,
	"refund_id" uuid,
	"requested_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"applied_at" timestamp with time zone,
	CONSTRAINT "booking_move_status_known" CHECK ("booking_move"."status" in ('awaiting_payment','applied','cancelled')),
	CONSTRAINT "booking_move_times" CHECK ("booking_move"."to_ends_at" > "booking_move"."to_starts_at" and "booking_move"."to_busy_until" >= "booking_move"."to_ends_at")
);
--> statement-breakpoint
CREATE TABLE "recorded_payment" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"studio_id" text NOT NULL,
	"booking_id" uuid NOT NULL,
	"amount" bigint NOT NULL,
	"currency" text NOT NULL,
	"method" text NOT NULL,
	"paid_on" date NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"reverses_id" uuid,
	"reason" text,
	"recorded_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "recorded_payment_studio_id_key" UNIQUE("studio_id","id"),
	CONSTRAINT "recorded_payment_method_known" CHECK ("recorded_payment"."method" in ('cash','bank_transfer')),
	CONSTRAINT "recorded_payment_sign" CHECK (("recorded_payment"."amount" > 0 and "recorded_payment"."reverses_id" is null and "recorded_payment"."reason" is null) or ("recorded_payment"."amount" < 0 and "recorded_payment"."reverses_id" is not null and "recorded_payment"."reason" is not null and "recorded_payment"."reason" <> ''))
);
--> statement-breakpoint
CREATE TABLE "scheduled_message" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"studio_id" text NOT NULL,
	"booking_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"key" text NOT NULL,
	"due_at" timestamp with time zone NOT NULL,
	"sent_at" timestamp with time zone,
	"cancelled_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "scheduled_message_kind_known" CHECK ("scheduled_message"."kind" in ('reminder','balance_request','receipt'))
);
--> statement-breakpoint
ALTER TABLE "booking" DROP CONSTRAINT "booking_status_known";--> statement-breakpoint
ALTER TABLE "payment" DROP CONSTRAINT "payment_kind_known";--> statement-breakpoint
ALTER TABLE "booking" ADD COLUMN "no_show_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "booking" ADD COLUMN "no_show_by" text;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "directions" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "load_in_notes" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "reminder_hours" integer[] DEFAULT '{168,48}'::integer[] NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "move_free_hours" integer DEFAULT 168 NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "move_min_hours" integer DEFAULT 48 NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "move_fee" bigint DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "booking_move" ADD CONSTRAINT "booking_move_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking_move" ADD CONSTRAINT "booking_move_requested_by_user_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking_move" ADD CONSTRAINT "booking_move_booking_fk" FOREIGN KEY ("studio_id","booking_id") REFERENCES "public"."booking"("studio_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recorded_payment" ADD CONSTRAINT "recorded_payment_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recorded_payment" ADD CONSTRAINT "recorded_payment_recorded_by_user_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recorded_payment" ADD CONSTRAINT "recorded_payment_booking_fk" FOREIGN KEY ("studio_id","booking_id") REFERENCES "public"."booking"("studio_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recorded_payment" ADD CONSTRAINT "recorded_payment_reverses_fk" FOREIGN KEY ("studio_id","reverses_id") REFERENCES "public"."recorded_payment"("studio_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scheduled_message" ADD CONSTRAINT "scheduled_message_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scheduled_message" ADD CONSTRAINT "scheduled_message_booking_fk" FOREIGN KEY ("studio_id","booking_id") REFERENCES "public"."booking"("studio_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "booking_move_booking_idx" ON "booking_move" USING btree ("booking_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "booking_move_one_waiting_idx" ON "booking_move" USING btree ("booking_id") WHERE "booking_move"."status" = 'awaiting_payment';--> statement-breakpoint
CREATE UNIQUE INDEX "recorded_payment_reverses_idx" ON "recorded_payment" USING btree ("reverses_id");--> statement-breakpoint
CREATE INDEX "recorded_payment_booking_idx" ON "recorded_payment" USING btree ("booking_id");--> statement-breakpoint
CREATE INDEX "recorded_payment_studio_paid_idx" ON "recorded_payment" USING btree ("studio_id","paid_on");--> statement-breakpoint
CREATE UNIQUE INDEX "scheduled_message_booking_key_idx" ON "scheduled_message" USING btree ("booking_id","key");--> statement-breakpoint
CREATE INDEX "scheduled_message_due_idx" ON "scheduled_message" USING btree ("due_at") WHERE "scheduled_message"."sent_at" is null and "scheduled_message"."cancelled_at" is null;--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_no_show_by_user_id_fk" FOREIGN KEY ("no_show_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_status_known" CHECK ("booking"."status" in ('held','pending','confirmed','completed','no_show','cancelled','expired'));--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_kind_known" CHECK ("payment"."kind" in ('deposit','balance','move'));--> statement-breakpoint
ALTER TABLE "studio" ADD CONSTRAINT "studio_move_policy" CHECK ("studio"."move_min_hours" >= 0 and "studio"."move_free_hours" >= "studio"."move_min_hours" and "studio"."move_fee" >= 0);--> statement-breakpoint
-- A no-show keeps its time, like a completed session: the exclusion constraints of 0001 (the
-- engineer's as 0006 made it, within one studio) now count
-- the statuses of src/lib/domain/lifecycle.ts OCCUPYING_STATUSES, no_show among them.
ALTER TABLE "booking" DROP CONSTRAINT "booking_room_no_overlap";
--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_room_no_overlap"
	EXCLUDE USING gist ("room_id" WITH =, tstzrange("starts_at", "busy_until", '[)') WITH &&)
	WHERE ("status" IN ('held', 'pending', 'confirmed', 'completed', 'no_show'));
--> statement-breakpoint
ALTER TABLE "booking" DROP CONSTRAINT "booking_engineer_no_overlap";
--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_engineer_no_overlap"
	EXCLUDE USING gist ("studio_id" WITH =, "engineer_id" WITH =, tstzrange("starts_at", "busy_until", '[)') WITH &&)
	WHERE ("engineer_id" IS NOT NULL AND "status" IN ('held', 'pending', 'confirmed', 'completed', 'no_show'));
--> statement-breakpoint
CREATE OR REPLACE FUNCTION booking_gear_copy_booking() RETURNS trigger AS $$
BEGIN
	SELECT b.starts_at, b.busy_until, b.status IN ('held', 'pending', 'confirmed', 'completed', 'no_show')
	INTO NEW.starts_at, NEW.busy_until, NEW.active
	FROM booking b WHERE b.id = NEW.booking_id;
	RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
-- The moves between statuses are src/lib/domain/lifecycle.ts BOOKING_MOVES; the database refuses
-- any other, whoever asks (tests/integration/lifecycle-trigger.test.ts tries every pair). A session
-- is completed only with an end after its start, is a no-show only once its start has passed, and
-- changes its time, room or engineer only while it is still open.
CREATE OR REPLACE FUNCTION booking_status_guard() RETURNS trigger AS $$
BEGIN
	IF NEW.status IS DISTINCT FROM OLD.status AND (OLD.status, NEW.status) NOT IN (
		('held', 'pending'), ('held', 'confirmed'), ('held', 'cancelled'), ('held', 'expired'),
		('pending', 'confirmed'), ('pending', 'cancelled'), ('pending', 'expired'),
		('confirmed', 'completed'), ('confirmed', 'no_show'), ('confirmed', 'cancelled'),
		('expired', 'pending'), ('expired', 'confirmed')
	) THEN
		RAISE EXCEPTION 'a booking cannot go from % to %', OLD.status, NEW.status
			USING ERRCODE = '23514', CONSTRAINT = 'booking_status_move';
	END IF;
	IF NEW.status = 'completed' AND OLD.status <> 'completed'
		AND (NEW.actual_ends_at IS NULL OR NEW.actual_ends_at <= NEW.starts_at) THEN
		RAISE EXCEPTION 'a session is completed only with an end after its start'
			USING ERRCODE = '23514', CONSTRAINT = 'booking_status_move';
	END IF;
	IF NEW.status = 'no_show' AND OLD.status <> 'no_show' AND now() < NEW.starts_at THEN
		RAISE EXCEPTION 'a session is a no-show only once its start has passed'
			USING ERRCODE = '23514', CONSTRAINT = 'booking_status_move';
	END IF;
	IF (NEW.starts_at, NEW.ends_at, NEW.room_id) IS DISTINCT FROM (OLD.starts_at, OLD.ends_at, OLD.room_id)
		AND OLD.status NOT IN ('held', 'pending', 'confirmed') THEN
		RAISE EXCEPTION 'a % booking keeps its time and room', OLD.status
			USING ERRCODE = '23514', CONSTRAINT = 'booking_status_move';
	END IF;
	RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER booking_status_guard_trg
	BEFORE UPDATE ON "booking"
	FOR EACH ROW EXECUTE FUNCTION booking_status_guard();
--> statement-breakpoint
-- A recorded payment is never edited or deleted; a reversal undoes exactly one entry of the same
-- booking, for exactly its amount.
CREATE OR REPLACE FUNCTION recorded_payment_guard() RETURNS trigger AS $$
DECLARE
	original recorded_payment%ROWTYPE;
BEGIN
	IF TG_OP <> 'INSERT' THEN
		RAISE EXCEPTION 'recorded payments are never changed: % is refused; record a reversal instead', TG_OP
			USING ERRCODE = '55000';
	END IF;
	IF NEW.reverses_id IS NOT NULL THEN
		SELECT * INTO original FROM recorded_payment WHERE id = NEW.reverses_id;
		IF original.booking_id <> NEW.booking_id OR original.amount <> -NEW.amount OR original.currency <> NEW.currency
			OR original.reverses_id IS NOT NULL THEN
			RAISE EXCEPTION 'a reversal undoes one recorded payment of the same booking, for its whole amount'
				USING ERRCODE = '23514', CONSTRAINT = 'recorded_payment_reversal';
		END IF;
	END IF;
	RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER recorded_payment_guard_trg
	BEFORE INSERT OR UPDATE OR DELETE ON "recorded_payment"
	FOR EACH ROW EXECUTE FUNCTION recorded_payment_guard();
