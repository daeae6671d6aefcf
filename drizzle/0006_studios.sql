-- Many studios on one installation. A studio is an organization of better-auth's organization
-- plugin (name, short name, team and invitations); its settings stay in "studio", keyed by the
-- organization's id. Every table of a studio's data gains studio_id, and every reference between
-- such tables includes it, so PostgreSQL itself refuses a row of one studio that points at
-- another's (PostgreSQL manual, "Constraints": a foreign key over several columns must match a
-- unique constraint over the same columns of the referenced table).;
--> statement-breakpoint
CREATE TABLE "invitation" (
	"id" text PRIMARY KEY NOT NULL,
	"organization_id" text NOT NULL,
	"email" text NOT NULL,
	"role" text,
	"status" text DEFAULT 'pending' NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"inviter_id" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "member" (
	"id" text PRIMARY KEY NOT NULL,
	"organization_id" text NOT NULL,
	"user_id" text NOT NULL,
	"role" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "member_role_known" CHECK ("member"."role" in ('owner', 'engineer', 'accountant'))
);
--> statement-breakpoint
CREATE TABLE "organization" (
	"id" text PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"slug" text NOT NULL,
	"logo" text,
	"metadata" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "organization_slug_unique" UNIQUE("slug")
);
--> statement-breakpoint
ALTER TABLE "invitation" ADD CONSTRAINT "invitation_organization_id_organization_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organization"("id") ON DELETE cascade ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "invitation" ADD CONSTRAINT "invitation_inviter_id_user_id_fk" FOREIGN KEY ("inviter_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "member" ADD CONSTRAINT "member_organization_id_organization_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organization"("id") ON DELETE cascade ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "member" ADD CONSTRAINT "member_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;
--> statement-breakpoint
CREATE INDEX "invitation_organization_idx" ON "invitation" USING btree ("organization_id");
--> statement-breakpoint
CREATE INDEX "invitation_email_idx" ON "invitation" USING btree ("email");
--> statement-breakpoint
CREATE UNIQUE INDEX "member_organization_user_idx" ON "member" USING btree ("organization_id","user_id");
--> statement-breakpoint
CREATE INDEX "member_user_idx" ON "member" USING btree ("user_id");
--> statement-breakpoint
ALTER TABLE "session" ADD COLUMN "active_organization_id" text;
--> statement-breakpoint
-- The studio an installation ran until now becomes its first organization, published as before.
-- Its short name comes from its name ("Hollow Pine Studio" -> "hollow-pine").
ALTER TABLE "studio" ALTER COLUMN "id" DROP DEFAULT;
--> statement-breakpoint
ALTER TABLE "studio" ALTER COLUMN "id" SET DATA TYPE text;
--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "published" boolean DEFAULT false NOT NULL;
--> statement-breakpoint
INSERT INTO "organization" ("id", "name", "slug")
	SELECT gen_random_uuid()::text, s."name",
		coalesce(nullif(trim(both '-' from regexp_replace(regexp_replace(lower(s."name"), '\s+studios?$', ''), '[^a-z0-9]+', '-', 'g')), ''), 'studio')
	FROM "studio" s;
--> statement-breakpoint
UPDATE "studio" s SET "id" = o."id", "published" = true FROM "organization" o WHERE o."name" = s."name";
--> statement-breakpoint
-- Its staff become members with the role they had.
INSERT INTO "member" ("id", "organization_id", "user_id", "role")
	SELECT gen_random_uuid()::text, o."id", u."id", u."role" FROM "user" u CROSS JOIN "organization" o
	WHERE u."role" IN ('owner', 'engineer', 'accountant');
--> statement-breakpoint
ALTER TABLE "studio" ADD CONSTRAINT "studio_id_organization_id_fk" FOREIGN KEY ("id") REFERENCES "public"."organization"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
-- Rows made before belong to that studio. Issued documents and counters never change otherwise:
-- their guards step aside for this one update.
ALTER TABLE "audit_log" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "blackout" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "booking" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "booking_gear" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "email_outbox" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "gear_item" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "invoice" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "invoice_counter" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "invoice_line" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "recall_sheet" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "refund" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "room" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "surcharge_rule" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "upload" ADD COLUMN "studio_id" text;
--> statement-breakpoint
ALTER TABLE "invoice" DISABLE TRIGGER "invoice_immutable_trg";
--> statement-breakpoint
ALTER TABLE "invoice_line" DISABLE TRIGGER "invoice_line_immutable_trg";
--> statement-breakpoint
ALTER TABLE "invoice_counter" DISABLE TRIGGER "invoice_counter_step_trg";
--> statement-breakpoint
UPDATE "blackout" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "booking" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "booking_gear" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "gear_item" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "invoice" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "invoice_counter" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "invoice_line" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "payment" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "recall_sheet" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "refund" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "room" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "surcharge_rule" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "upload" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1);
--> statement-breakpoint
UPDATE "audit_log" SET "studio_id" = (SELECT "id" FROM "studio" LIMIT 1) WHERE "entity" <> 'user';
--> statement-breakpoint
ALTER TABLE "invoice" ENABLE TRIGGER "invoice_immutable_trg";
--> statement-breakpoint
ALTER TABLE "invoice_line" ENABLE TRIGGER "invoice_line_immutable_trg";
--> statement-breakpoint
ALTER TABLE "invoice_counter" ENABLE TRIGGER "invoice_counter_step_trg";
--> statement-breakpoint
ALTER TABLE "blackout" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "booking" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "booking_gear" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "gear_item" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "invoice" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "invoice_counter" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "invoice_line" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "payment" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "recall_sheet" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "refund" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "room" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "surcharge_rule" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "upload" ALTER COLUMN "studio_id" SET NOT NULL;
--> statement-breakpoint
ALTER TABLE "booking" DROP CONSTRAINT "booking_reference_unique";
--> statement-breakpoint
ALTER TABLE "invoice" DROP CONSTRAINT "invoice_display_number_unique";
--> statement-breakpoint
ALTER TABLE "room" DROP CONSTRAINT "room_slug_unique";
--> statement-breakpoint
ALTER TABLE "booking" DROP CONSTRAINT "booking_room_id_room_id_fk";
--> statement-breakpoint
ALTER TABLE "booking_gear" DROP CONSTRAINT "booking_gear_booking_id_booking_id_fk";
--> statement-breakpoint
ALTER TABLE "booking_gear" DROP CONSTRAINT "booking_gear_gear_item_id_gear_item_id_fk";
--> statement-breakpoint
ALTER TABLE "gear_item" DROP CONSTRAINT "gear_item_home_room_id_room_id_fk";
--> statement-breakpoint
ALTER TABLE "invoice" DROP CONSTRAINT "invoice_booking_id_booking_id_fk";
--> statement-breakpoint
ALTER TABLE "invoice" DROP CONSTRAINT "invoice_preceding_invoice_id_invoice_id_fk";
--> statement-breakpoint
ALTER TABLE "invoice" DROP CONSTRAINT "invoice_payment_id_payment_id_fk";
--> statement-breakpoint
ALTER TABLE "invoice" DROP CONSTRAINT "invoice_refund_id_refund_id_fk";
--> statement-breakpoint
ALTER TABLE "invoice_line" DROP CONSTRAINT "invoice_line_invoice_id_invoice_id_fk";
--> statement-breakpoint
ALTER TABLE "payment" DROP CONSTRAINT "payment_booking_id_booking_id_fk";
--> statement-breakpoint
ALTER TABLE "recall_sheet" DROP CONSTRAINT "recall_sheet_booking_id_booking_id_fk";
--> statement-breakpoint
ALTER TABLE "refund" DROP CONSTRAINT "refund_booking_id_booking_id_fk";
--> statement-breakpoint
ALTER TABLE "refund" DROP CONSTRAINT "refund_payment_id_payment_id_fk";
--> statement-breakpoint
ALTER TABLE "upload" DROP CONSTRAINT "upload_booking_id_booking_id_fk";
--> statement-breakpoint
DROP INDEX "invoice_series_number_idx";
--> statement-breakpoint
DROP INDEX "invoice_issued_idx";
--> statement-breakpoint
DROP INDEX "recall_sheet_artist_idx";
--> statement-breakpoint
ALTER TABLE "invoice_counter" DROP CONSTRAINT "invoice_counter_series_year_pk";
--> statement-breakpoint
ALTER TABLE "invoice_counter" ADD CONSTRAINT "invoice_counter_studio_id_series_year_pk" PRIMARY KEY("studio_id","series","year");
--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_studio_id_key" UNIQUE("studio_id","id");
--> statement-breakpoint
ALTER TABLE "gear_item" ADD CONSTRAINT "gear_item_studio_id_key" UNIQUE("studio_id","id");
--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_studio_id_key" UNIQUE("studio_id","id");
--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_studio_id_key" UNIQUE("studio_id","id");
--> statement-breakpoint
ALTER TABLE "refund" ADD CONSTRAINT "refund_studio_id_key" UNIQUE("studio_id","id");
--> statement-breakpoint
ALTER TABLE "room" ADD CONSTRAINT "room_studio_id_key" UNIQUE("studio_id","id");
--> statement-breakpoint
ALTER TABLE "blackout" ADD CONSTRAINT "blackout_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_room_fk" FOREIGN KEY ("studio_id","room_id") REFERENCES "public"."room"("studio_id","id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "booking_gear" ADD CONSTRAINT "booking_gear_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "booking_gear" ADD CONSTRAINT "booking_gear_booking_fk" FOREIGN KEY ("studio_id","booking_id") REFERENCES "public"."booking"("studio_id","id") ON DELETE cascade ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "booking_gear" ADD CONSTRAINT "booking_gear_item_fk" FOREIGN KEY ("studio_id","gear_item_id") REFERENCES "public"."gear_item"("studio_id","id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "email_outbox" ADD CONSTRAINT "email_outbox_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "gear_item" ADD CONSTRAINT "gear_item_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
-- Removing a room only clears the home of its gear (PostgreSQL 15: SET NULL with a column list).
ALTER TABLE "gear_item" ADD CONSTRAINT "gear_item_home_room_fk" FOREIGN KEY ("studio_id","home_room_id") REFERENCES "public"."room"("studio_id","id") ON DELETE SET NULL ("home_room_id") ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_booking_fk" FOREIGN KEY ("studio_id","booking_id") REFERENCES "public"."booking"("studio_id","id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_preceding_fk" FOREIGN KEY ("studio_id","preceding_invoice_id") REFERENCES "public"."invoice"("studio_id","id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_payment_fk" FOREIGN KEY ("studio_id","payment_id") REFERENCES "public"."payment"("studio_id","id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_refund_fk" FOREIGN KEY ("studio_id","refund_id") REFERENCES "public"."refund"("studio_id","id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "invoice_counter" ADD CONSTRAINT "invoice_counter_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "invoice_line" ADD CONSTRAINT "invoice_line_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "invoice_line" ADD CONSTRAINT "invoice_line_invoice_fk" FOREIGN KEY ("studio_id","invoice_id") REFERENCES "public"."invoice"("studio_id","id") ON DELETE cascade ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_booking_fk" FOREIGN KEY ("studio_id","booking_id") REFERENCES "public"."booking"("studio_id","id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "recall_sheet" ADD CONSTRAINT "recall_sheet_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "recall_sheet" ADD CONSTRAINT "recall_sheet_booking_fk" FOREIGN KEY ("studio_id","booking_id") REFERENCES "public"."booking"("studio_id","id") ON DELETE cascade ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "refund" ADD CONSTRAINT "refund_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "refund" ADD CONSTRAINT "refund_booking_fk" FOREIGN KEY ("studio_id","booking_id") REFERENCES "public"."booking"("studio_id","id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "refund" ADD CONSTRAINT "refund_payment_fk" FOREIGN KEY ("studio_id","payment_id") REFERENCES "public"."payment"("studio_id","id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "room" ADD CONSTRAINT "room_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "surcharge_rule" ADD CONSTRAINT "surcharge_rule_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "upload" ADD CONSTRAINT "upload_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE no action ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "upload" ADD CONSTRAINT "upload_booking_fk" FOREIGN KEY ("studio_id","booking_id") REFERENCES "public"."booking"("studio_id","id") ON DELETE cascade ON UPDATE no action;
--> statement-breakpoint
CREATE INDEX "audit_log_studio_idx" ON "audit_log" USING btree ("studio_id","created_at");
--> statement-breakpoint
CREATE INDEX "blackout_studio_idx" ON "blackout" USING btree ("studio_id","starts_on");
--> statement-breakpoint
CREATE UNIQUE INDEX "booking_studio_reference_idx" ON "booking" USING btree ("studio_id","reference");
--> statement-breakpoint
CREATE INDEX "booking_studio_time_idx" ON "booking" USING btree ("studio_id","starts_at");
--> statement-breakpoint
CREATE INDEX "gear_item_studio_idx" ON "gear_item" USING btree ("studio_id","category");
--> statement-breakpoint
CREATE UNIQUE INDEX "invoice_display_number_idx" ON "invoice" USING btree ("studio_id","display_number");
--> statement-breakpoint
CREATE UNIQUE INDEX "room_studio_slug_idx" ON "room" USING btree ("studio_id","slug");
--> statement-breakpoint
CREATE INDEX "surcharge_rule_studio_idx" ON "surcharge_rule" USING btree ("studio_id","sort_order");
--> statement-breakpoint
CREATE INDEX "upload_booking_idx" ON "upload" USING btree ("booking_id");
--> statement-breakpoint
CREATE UNIQUE INDEX "invoice_series_number_idx" ON "invoice" USING btree ("studio_id","series","year","number");
--> statement-breakpoint
CREATE INDEX "invoice_issued_idx" ON "invoice" USING btree ("studio_id","issued_at");
--> statement-breakpoint
CREATE INDEX "recall_sheet_artist_idx" ON "recall_sheet" USING btree ("studio_id","artist_id");
--> statement-breakpoint
-- The engineer exclusion holds within each studio: one studio's bookings never block another's.
ALTER TABLE "booking" DROP CONSTRAINT "booking_engineer_no_overlap";
--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_engineer_no_overlap"
	EXCLUDE USING gist ("studio_id" WITH =, "engineer_id" WITH =, tstzrange("starts_at", "busy_until", '[)') WITH &&)
	WHERE ("engineer_id" IS NOT NULL AND "status" IN ('held', 'pending', 'confirmed', 'completed'));
--> statement-breakpoint
-- A booking's engineer is an owner or engineer of the booking's own studio when booked or changed.
-- The check is a trigger, not a foreign key, so that a member who leaves keeps their past sessions.
CREATE OR REPLACE FUNCTION booking_engineer_is_member() RETURNS trigger AS $$
BEGIN
	IF NEW.engineer_id IS NOT NULL AND NOT EXISTS (
		SELECT 1 FROM member m
		WHERE m.organization_id = NEW.studio_id AND m.user_id = NEW.engineer_id AND m.role IN ('owner', 'engineer')
	) THEN
		RAISE EXCEPTION 'the engineer % is not in the team of studio %', NEW.engineer_id, NEW.studio_id
			USING ERRCODE = '23503', CONSTRAINT = 'booking_engineer_member';
	END IF;
	RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER booking_engineer_is_member_trg
	BEFORE INSERT OR UPDATE OF engineer_id, studio_id ON "booking"
	FOR EACH ROW EXECUTE FUNCTION booking_engineer_is_member();
--> statement-breakpoint
-- A counter belongs to one studio, series and year, and only moves up by one (Article 226(2)).
CREATE OR REPLACE FUNCTION invoice_counter_step() RETURNS trigger AS $$
BEGIN
	IF TG_OP = 'DELETE' THEN
		RAISE EXCEPTION 'invoice counters are never deleted' USING ERRCODE = '55000';
	END IF;
	IF NEW.studio_id <> OLD.studio_id OR NEW.series <> OLD.series OR NEW.year <> OLD.year OR NEW.last_number <> OLD.last_number + 1 THEN
		RAISE EXCEPTION 'an invoice counter only moves up by one (% % % -> %)', OLD.series, OLD.year, OLD.last_number, NEW.last_number
			USING ERRCODE = '55000';
	END IF;
	RETURN NEW;
END;
$$ LANGUAGE plpgsql;
