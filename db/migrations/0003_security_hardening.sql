ALTER TYPE "public"."token_kind" ADD VALUE 'sign_in_confirmation';--> statement-breakpoint
CREATE TABLE "sign_in_addresses" (
	"user_id" uuid NOT NULL,
	"address" varchar(64) NOT NULL,
	"first_seen_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_seen_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sign_in_addresses_user_id_address_pk" PRIMARY KEY("user_id","address")
);
--> statement-breakpoint
CREATE TABLE "sign_in_throttles" (
	"key" varchar(300) PRIMARY KEY NOT NULL,
	"failures" integer DEFAULT 0 NOT NULL,
	"last_failure_at" timestamp with time zone DEFAULT now() NOT NULL,
	"wait_until" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "sign_in_failures" DISABLE ROW LEVEL SECURITY;--> statement-breakpoint
DROP TABLE "sign_in_failures" CASCADE;--> statement-breakpoint
ALTER TABLE "access_tokens" ADD COLUMN "revoked_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "outbox_messages" ADD COLUMN "link_token_id" uuid;--> statement-breakpoint
ALTER TABLE "projection_runs" ADD COLUMN "heartbeat_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "sign_in_addresses" ADD CONSTRAINT "sign_in_addresses_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outbox_messages" ADD CONSTRAINT "outbox_messages_link_token_id_access_tokens_id_fk" FOREIGN KEY ("link_token_id") REFERENCES "public"."access_tokens"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
-- Links issued before this migration may have been shown to administrators: withdraw them all (re-send invitations), and remove their tokens from stored mail.
UPDATE "access_tokens" SET "revoked_at" = now() WHERE "used_at" IS NULL AND "revoked_at" IS NULL;--> statement-breakpoint
UPDATE "outbox_messages" SET "body" = regexp_replace("body", 'token=[A-Za-z0-9_%-]+', 'token=[withdrawn]', 'g') WHERE "body" LIKE '%token=%';--> statement-breakpoint
CREATE UNIQUE INDEX "access_tokens_one_invitation" ON "access_tokens" USING btree ("scheme_id","email") WHERE kind = 'invitation' and used_at is null and revoked_at is null;--> statement-breakpoint
CREATE UNIQUE INDEX "access_tokens_one_personal" ON "access_tokens" USING btree ("kind","email") WHERE kind <> 'invitation' and used_at is null and revoked_at is null;