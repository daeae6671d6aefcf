CREATE TABLE "billing_details" (
	"user_id" text PRIMARY KEY NOT NULL,
	"kind" text NOT NULL,
	"name" text NOT NULL,
	"street" text NOT NULL,
	"postal_code" text NOT NULL,
	"city" text NOT NULL,
	"country" text NOT NULL,
	"vat_id" text DEFAULT '' NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "billing_details_kind" CHECK ("billing_details"."kind" in ('person', 'organisation')),
	CONSTRAINT "billing_details_country" CHECK ("billing_details"."country" ~ '^[A-Z]{2}$'),
	CONSTRAINT "billing_details_vat_only_organisation" CHECK ("billing_details"."vat_id" = '' or "billing_details"."kind" = 'organisation')
);
--> statement-breakpoint
ALTER TABLE "booking" ADD COLUMN "billing" jsonb;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "stripe_account_id" text;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "application_fee" bigint DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "refund" ADD COLUMN "stripe_account_id" text;--> statement-breakpoint
ALTER TABLE "stripe_event" ADD COLUMN "account" text;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "reverse_charge_abroad" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "stripe_account_id" text;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "charges_enabled" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "payouts_enabled" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "details_submitted" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "account_requirements" text[] DEFAULT '{}'::text[] NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "account_event_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "platform_fee_bp" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "billing_details" ADD CONSTRAINT "billing_details_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "studio" ADD CONSTRAINT "studio_stripe_account_id_unique" UNIQUE("stripe_account_id");--> statement-breakpoint
ALTER TABLE "studio" ADD CONSTRAINT "studio_platform_fee_range" CHECK ("studio"."platform_fee_bp" between 0 and 10000);