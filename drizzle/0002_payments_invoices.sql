ALTER TABLE "invoice" ADD COLUMN "amounts_include_vat" boolean DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE "invoice" ADD COLUMN "prepaid_vat_breakdown" jsonb DEFAULT '[]'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "invoice" ADD COLUMN "line_net_total" bigint DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "invoice" ADD COLUMN "source_key" text;--> statement-breakpoint
ALTER TABLE "invoice" ADD COLUMN "payment_id" uuid;--> statement-breakpoint
ALTER TABLE "invoice" ADD COLUMN "refund_id" uuid;--> statement-breakpoint
ALTER TABLE "invoice_line" ADD COLUMN "kind" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "invoice_line" ADD COLUMN "unit_amount" bigint DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "invoice_line" ADD COLUMN "amount" bigint DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "attempt" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "expires_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "failure_reason" text;--> statement-breakpoint
ALTER TABLE "refund" ADD COLUMN "reason" text DEFAULT 'cancellation' NOT NULL;--> statement-breakpoint
ALTER TABLE "refund" ADD COLUMN "idempotency_key" text;--> statement-breakpoint
ALTER TABLE "refund" ADD COLUMN "requested_by" text;--> statement-breakpoint
ALTER TABLE "refund" ADD COLUMN "sent_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_preceding_invoice_id_invoice_id_fk" FOREIGN KEY ("preceding_invoice_id") REFERENCES "public"."invoice"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_payment_id_payment_id_fk" FOREIGN KEY ("payment_id") REFERENCES "public"."payment"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_refund_id_refund_id_fk" FOREIGN KEY ("refund_id") REFERENCES "public"."refund"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "refund" ADD CONSTRAINT "refund_requested_by_user_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "payment_booking_kind_attempt_idx" ON "payment" USING btree ("booking_id","kind","attempt");--> statement-breakpoint
CREATE INDEX "payment_status_idx" ON "payment" USING btree ("status");--> statement-breakpoint
CREATE INDEX "refund_booking_idx" ON "refund" USING btree ("booking_id");--> statement-breakpoint
CREATE INDEX "refund_status_idx" ON "refund" USING btree ("status");--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_source_key_unique" UNIQUE("source_key");--> statement-breakpoint
ALTER TABLE "refund" ADD CONSTRAINT "refund_idempotency_key_unique" UNIQUE("idempotency_key");--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_type_known" CHECK ("invoice"."type_code" in (380, 381, 386));--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_number_positive" CHECK ("invoice"."number" > 0);--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_kind_known" CHECK ("payment"."kind" in ('deposit','balance'));--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_status_known" CHECK ("payment"."status" in ('open','processing','paid','failed','expired'));--> statement-breakpoint
ALTER TABLE "refund" ADD CONSTRAINT "refund_status_known" CHECK ("refund"."status" in ('pending','succeeded','failed'));