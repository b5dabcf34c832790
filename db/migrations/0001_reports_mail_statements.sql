CREATE TYPE "public"."export_status" AS ENUM('queued', 'running', 'done', 'failed');--> statement-breakpoint
CREATE TYPE "public"."mail_status" AS ENUM('queued', 'retrying', 'sent', 'failed');--> statement-breakpoint
CREATE TABLE "outbox_attachments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"message_id" uuid NOT NULL,
	"filename" varchar(200) NOT NULL,
	"content_type" varchar(100) NOT NULL,
	"content" "bytea" NOT NULL
);
--> statement-breakpoint
CREATE TABLE "outbox_messages" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scheme_id" uuid,
	"kind" varchar(40) NOT NULL,
	"recipients" jsonb NOT NULL,
	"subject" varchar(300) NOT NULL,
	"body" text NOT NULL,
	"status" "mail_status" DEFAULT 'queued' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"provider_id" varchar(300),
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_attempt_at" timestamp with time zone,
	"sent_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "received_mail" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"envelope_from" varchar(254),
	"envelope_to" jsonb NOT NULL,
	"raw" "bytea" NOT NULL
);
--> statement-breakpoint
CREATE TABLE "reports" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scheme_id" uuid NOT NULL,
	"run_id" uuid NOT NULL,
	"title" varchar(200) NOT NULL,
	"risk_aversion" double precision NOT NULL,
	"draft" boolean NOT NULL,
	"content" jsonb NOT NULL,
	"pdf" "bytea" NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "statement_exports" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scheme_id" uuid NOT NULL,
	"run_id" uuid NOT NULL,
	"option_id" varchar(64) NOT NULL,
	"scope" varchar(20) NOT NULL,
	"format" varchar(8) NOT NULL,
	"status" "export_status" DEFAULT 'queued' NOT NULL,
	"progress" double precision DEFAULT 0 NOT NULL,
	"member_count" integer DEFAULT 0 NOT NULL,
	"error" text,
	"filename" varchar(200),
	"file" "bytea",
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "outbox_attachments" ADD CONSTRAINT "outbox_attachments_message_id_outbox_messages_id_fk" FOREIGN KEY ("message_id") REFERENCES "public"."outbox_messages"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outbox_messages" ADD CONSTRAINT "outbox_messages_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outbox_messages" ADD CONSTRAINT "outbox_messages_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reports" ADD CONSTRAINT "reports_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reports" ADD CONSTRAINT "reports_run_id_projection_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."projection_runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reports" ADD CONSTRAINT "reports_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "statement_exports" ADD CONSTRAINT "statement_exports_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "statement_exports" ADD CONSTRAINT "statement_exports_run_id_projection_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."projection_runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "statement_exports" ADD CONSTRAINT "statement_exports_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "outbox_scheme_created" ON "outbox_messages" USING btree ("scheme_id","created_at");--> statement-breakpoint
CREATE INDEX "reports_scheme" ON "reports" USING btree ("scheme_id","created_at");--> statement-breakpoint
CREATE INDEX "statement_exports_scheme" ON "statement_exports" USING btree ("scheme_id","created_at");