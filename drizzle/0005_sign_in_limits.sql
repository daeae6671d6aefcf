CREATE TABLE "auth_limit" (
	"kind" text NOT NULL,
	"address" text NOT NULL,
	"account" text DEFAULT '' NOT NULL,
	"count" integer NOT NULL,
	"window_started_at" timestamp with time zone NOT NULL,
	"last_at" timestamp with time zone NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	CONSTRAINT "auth_limit_kind_address_account_pk" PRIMARY KEY("kind","address","account"),
	CONSTRAINT "auth_limit_kind" CHECK ("auth_limit"."kind" in ('sign_in', 'sign_up'))
);
--> statement-breakpoint
CREATE INDEX "auth_limit_expires_idx" ON "auth_limit" USING btree ("expires_at");