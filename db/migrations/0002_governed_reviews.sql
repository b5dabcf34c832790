CREATE TYPE "public"."review_decision" AS ENUM('option', 'no_change');--> statement-breakpoint
CREATE TYPE "public"."review_status" AS ENUM('open', 'signed_off');--> statement-breakpoint
CREATE TABLE "approvals" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scheme_id" uuid NOT NULL,
	"assumption_set_id" uuid,
	"option_version_id" uuid,
	"user_id" uuid,
	"approver_name" varchar(120) NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "approvals_one_target" CHECK (("approvals"."assumption_set_id" is null) <> ("approvals"."option_version_id" is null))
);
--> statement-breakpoint
CREATE TABLE "default_option_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"option_id" uuid NOT NULL,
	"scheme_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"status" "assumption_status" DEFAULT 'draft' NOT NULL,
	"name" varchar(120) NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"glide_path" jsonb NOT NULL,
	"based_on_id" uuid,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" uuid,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"approved_by" uuid,
	"approved_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "review_option_versions" (
	"review_id" uuid NOT NULL,
	"option_version_id" uuid NOT NULL,
	"position" integer NOT NULL,
	CONSTRAINT "review_option_versions_review_id_option_version_id_pk" PRIMARY KEY("review_id","option_version_id")
);
--> statement-breakpoint
CREATE TABLE "review_reminders" (
	"scheme_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"due_on" date NOT NULL,
	"days_before" integer NOT NULL,
	"message_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "review_reminders_scheme_id_user_id_due_on_days_before_pk" PRIMARY KEY("scheme_id","user_id","due_on","days_before")
);
--> statement-breakpoint
CREATE TABLE "review_reports" (
	"review_id" uuid NOT NULL,
	"report_id" uuid NOT NULL,
	"position" integer NOT NULL,
	CONSTRAINT "review_reports_review_id_report_id_pk" PRIMARY KEY("review_id","report_id")
);
--> statement-breakpoint
CREATE TABLE "review_runs" (
	"review_id" uuid NOT NULL,
	"run_id" uuid NOT NULL,
	"position" integer NOT NULL,
	CONSTRAINT "review_runs_review_id_run_id_pk" PRIMARY KEY("review_id","run_id")
);
--> statement-breakpoint
CREATE TABLE "review_sign_offs" (
	"review_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"signer_name" varchar(120) NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "review_sign_offs_review_id_user_id_pk" PRIMARY KEY("review_id","user_id")
);
--> statement-breakpoint
CREATE TABLE "reviews" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scheme_id" uuid NOT NULL,
	"title" varchar(200) NOT NULL,
	"status" "review_status" DEFAULT 'open' NOT NULL,
	"assumption_set_id" uuid,
	"decision" "review_decision",
	"chosen_version_id" uuid,
	"risk_aversion" double precision,
	"lambda_calibration" text DEFAULT '' NOT NULL,
	"reasons" text DEFAULT '' NOT NULL,
	"dissent" text DEFAULT '' NOT NULL,
	"next_review_due" date,
	"opened_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" uuid,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"signed_off_at" timestamp with time zone,
	"record" jsonb,
	"pdf" "bytea"
);
--> statement-breakpoint
CREATE TABLE "run_option_versions" (
	"run_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"option_id" uuid NOT NULL,
	"option_version_id" uuid NOT NULL,
	CONSTRAINT "run_option_versions_run_id_position_pk" PRIMARY KEY("run_id","position")
);
--> statement-breakpoint
CREATE TABLE "scheme_settings" (
	"scheme_id" uuid PRIMARY KEY NOT NULL,
	"approvals_required" integer DEFAULT 1 NOT NULL,
	"sign_off_quorum" integer DEFAULT 2 NOT NULL,
	"review_interval_years" integer DEFAULT 3 NOT NULL,
	"current_default_option_id" uuid,
	"next_review_due" date,
	"updated_by" uuid,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "scheme_settings_approvals" CHECK ("scheme_settings"."approvals_required" between 1 and 2),
	CONSTRAINT "scheme_settings_quorum" CHECK ("scheme_settings"."sign_off_quorum" between 1 and 12),
	CONSTRAINT "scheme_settings_interval" CHECK ("scheme_settings"."review_interval_years" between 1 and 5)
);
--> statement-breakpoint
ALTER TABLE "assumption_sets" ADD COLUMN "updated_by" uuid;--> statement-breakpoint
ALTER TABLE "projection_runs" ADD COLUMN "baseline_option_id" uuid;--> statement-breakpoint
ALTER TABLE "approvals" ADD CONSTRAINT "approvals_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "approvals" ADD CONSTRAINT "approvals_assumption_set_id_assumption_sets_id_fk" FOREIGN KEY ("assumption_set_id") REFERENCES "public"."assumption_sets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "approvals" ADD CONSTRAINT "approvals_option_version_id_default_option_versions_id_fk" FOREIGN KEY ("option_version_id") REFERENCES "public"."default_option_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "approvals" ADD CONSTRAINT "approvals_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "default_option_versions" ADD CONSTRAINT "default_option_versions_option_id_default_options_id_fk" FOREIGN KEY ("option_id") REFERENCES "public"."default_options"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "default_option_versions" ADD CONSTRAINT "default_option_versions_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "default_option_versions" ADD CONSTRAINT "default_option_versions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "default_option_versions" ADD CONSTRAINT "default_option_versions_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "default_option_versions" ADD CONSTRAINT "default_option_versions_approved_by_users_id_fk" FOREIGN KEY ("approved_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_option_versions" ADD CONSTRAINT "review_option_versions_review_id_reviews_id_fk" FOREIGN KEY ("review_id") REFERENCES "public"."reviews"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_option_versions" ADD CONSTRAINT "review_option_versions_option_version_id_default_option_versions_id_fk" FOREIGN KEY ("option_version_id") REFERENCES "public"."default_option_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_reminders" ADD CONSTRAINT "review_reminders_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_reminders" ADD CONSTRAINT "review_reminders_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_reminders" ADD CONSTRAINT "review_reminders_message_id_outbox_messages_id_fk" FOREIGN KEY ("message_id") REFERENCES "public"."outbox_messages"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_reports" ADD CONSTRAINT "review_reports_review_id_reviews_id_fk" FOREIGN KEY ("review_id") REFERENCES "public"."reviews"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_reports" ADD CONSTRAINT "review_reports_report_id_reports_id_fk" FOREIGN KEY ("report_id") REFERENCES "public"."reports"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_runs" ADD CONSTRAINT "review_runs_review_id_reviews_id_fk" FOREIGN KEY ("review_id") REFERENCES "public"."reviews"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_runs" ADD CONSTRAINT "review_runs_run_id_projection_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."projection_runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_sign_offs" ADD CONSTRAINT "review_sign_offs_review_id_reviews_id_fk" FOREIGN KEY ("review_id") REFERENCES "public"."reviews"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_sign_offs" ADD CONSTRAINT "review_sign_offs_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reviews" ADD CONSTRAINT "reviews_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reviews" ADD CONSTRAINT "reviews_assumption_set_id_assumption_sets_id_fk" FOREIGN KEY ("assumption_set_id") REFERENCES "public"."assumption_sets"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reviews" ADD CONSTRAINT "reviews_chosen_version_id_default_option_versions_id_fk" FOREIGN KEY ("chosen_version_id") REFERENCES "public"."default_option_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reviews" ADD CONSTRAINT "reviews_opened_by_users_id_fk" FOREIGN KEY ("opened_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reviews" ADD CONSTRAINT "reviews_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_option_versions" ADD CONSTRAINT "run_option_versions_run_id_projection_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."projection_runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_option_versions" ADD CONSTRAINT "run_option_versions_option_id_default_options_id_fk" FOREIGN KEY ("option_id") REFERENCES "public"."default_options"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_option_versions" ADD CONSTRAINT "run_option_versions_option_version_id_default_option_versions_id_fk" FOREIGN KEY ("option_version_id") REFERENCES "public"."default_option_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scheme_settings" ADD CONSTRAINT "scheme_settings_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scheme_settings" ADD CONSTRAINT "scheme_settings_current_default_option_id_default_options_id_fk" FOREIGN KEY ("current_default_option_id") REFERENCES "public"."default_options"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scheme_settings" ADD CONSTRAINT "scheme_settings_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "approvals_set_user" ON "approvals" USING btree ("assumption_set_id","user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "approvals_version_user" ON "approvals" USING btree ("option_version_id","user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "option_versions_option_version" ON "default_option_versions" USING btree ("option_id","version");--> statement-breakpoint
CREATE INDEX "option_versions_scheme" ON "default_option_versions" USING btree ("scheme_id");--> statement-breakpoint
CREATE INDEX "reviews_scheme" ON "reviews" USING btree ("scheme_id","created_at");--> statement-breakpoint
CREATE INDEX "run_option_versions_version" ON "run_option_versions" USING btree ("option_version_id");--> statement-breakpoint
ALTER TABLE "assumption_sets" ADD CONSTRAINT "assumption_sets_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "projection_runs" ADD CONSTRAINT "projection_runs_baseline_option_id_default_options_id_fk" FOREIGN KEY ("baseline_option_id") REFERENCES "public"."default_options"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
-- Options made before versioning become their version 1, approved as they stood (no approver was recorded then).
INSERT INTO "default_option_versions" ("option_id", "scheme_id", "version", "status", "name", "description", "glide_path", "created_at", "updated_at", "approved_at")
SELECT "id", "scheme_id", 1, 'approved', "name", "description", "glide_path", "created_at", "updated_at", "updated_at" FROM "default_options";--> statement-breakpoint
-- Approvals of assumption sets given before each approval was recorded on its own.
INSERT INTO "approvals" ("scheme_id", "assumption_set_id", "user_id", "approver_name", "at")
SELECT s."scheme_id", s."id", s."approved_by", u."display_name", coalesce(s."approved_at", s."updated_at")
FROM "assumption_sets" s JOIN "users" u ON u."id" = s."approved_by" WHERE s."status" = 'approved';--> statement-breakpoint
UPDATE "assumption_sets" SET "updated_by" = "created_by";--> statement-breakpoint
ALTER TABLE "default_options" DROP COLUMN "name";--> statement-breakpoint
ALTER TABLE "default_options" DROP COLUMN "description";--> statement-breakpoint
ALTER TABLE "default_options" DROP COLUMN "glide_path";