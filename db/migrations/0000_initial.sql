CREATE TYPE "public"."assumption_status" AS ENUM('draft', 'approved');--> statement-breakpoint
CREATE TYPE "public"."role" AS ENUM('administrator', 'trustee', 'actuary', 'communications', 'board');--> statement-breakpoint
CREATE TYPE "public"."run_status" AS ENUM('queued', 'running', 'done', 'failed');--> statement-breakpoint
CREATE TYPE "public"."token_kind" AS ENUM('invitation', 'password_reset');--> statement-breakpoint
CREATE TABLE "access_tokens" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" "token_kind" NOT NULL,
	"token_hash" varchar(64) NOT NULL,
	"email" varchar(254) NOT NULL,
	"scheme_id" uuid,
	"role" "role",
	"created_by" uuid,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "access_tokens_token_hash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "assumption_sets" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scheme_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"status" "assumption_status" DEFAULT 'draft' NOT NULL,
	"set_at" date NOT NULL,
	"rationale" text DEFAULT '' NOT NULL,
	"inflation" double precision NOT NULL,
	"salary_growth" double precision NOT NULL,
	"annuity_real_rate" double precision NOT NULL,
	"annuity_years" integer NOT NULL,
	"fund_order" jsonb NOT NULL,
	"correlations" jsonb NOT NULL,
	"based_on_id" uuid,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"approved_by" uuid,
	"approved_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "audit_events" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"user_id" uuid,
	"actor_email" varchar(254),
	"scheme_id" uuid,
	"action" varchar(80) NOT NULL,
	"entity" varchar(60),
	"entity_id" varchar(80),
	"before" jsonb,
	"after" jsonb,
	"ip" varchar(64)
);
--> statement-breakpoint
CREATE TABLE "default_options" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scheme_id" uuid NOT NULL,
	"name" varchar(120) NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"glide_path" jsonb NOT NULL,
	"archived" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "fund_assumptions" (
	"assumption_set_id" uuid NOT NULL,
	"fund_id" uuid NOT NULL,
	"expected_return" double precision NOT NULL,
	"volatility" double precision NOT NULL,
	"annual_charge" double precision NOT NULL,
	CONSTRAINT "fund_assumptions_assumption_set_id_fund_id_pk" PRIMARY KEY("assumption_set_id","fund_id")
);
--> statement-breakpoint
CREATE TABLE "funds" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scheme_id" uuid NOT NULL,
	"name" varchar(120) NOT NULL,
	"asset_class" varchar(240) DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "illustrative_members" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scheme_id" uuid NOT NULL,
	"label" varchar(120) NOT NULL,
	"age" integer NOT NULL,
	"retirement_age" integer NOT NULL,
	"salary" double precision NOT NULL,
	"salary_growth" double precision,
	"contribution_rate" double precision NOT NULL,
	"pot" double precision NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "projection_runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scheme_id" uuid NOT NULL,
	"status" "run_status" DEFAULT 'queued' NOT NULL,
	"progress" double precision DEFAULT 0 NOT NULL,
	"assumption_set_id" uuid,
	"assumptions_draft" boolean NOT NULL,
	"seed" integer NOT NULL,
	"paths" integer NOT NULL,
	"risk_aversion" double precision NOT NULL,
	"input" jsonb NOT NULL,
	"result" jsonb,
	"engine_version" varchar(32),
	"error" text,
	"rerun_of" uuid,
	"requested_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "scheme_members" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"scheme_id" uuid NOT NULL,
	"reference" varchar(64) NOT NULL,
	"age" integer NOT NULL,
	"salary" double precision NOT NULL,
	"pot" double precision NOT NULL,
	"contribution_rate" double precision NOT NULL,
	"retirement_age" integer NOT NULL,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "scheme_roles" (
	"user_id" uuid NOT NULL,
	"scheme_id" uuid NOT NULL,
	"role" "role" NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "scheme_roles_user_id_scheme_id_pk" PRIMARY KEY("user_id","scheme_id")
);
--> statement-breakpoint
CREATE TABLE "schemes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" varchar(160) NOT NULL,
	"currency" varchar(3) DEFAULT 'GBP' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "session" (
	"sid" varchar PRIMARY KEY NOT NULL,
	"sess" json NOT NULL,
	"expire" timestamp (6) NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sign_in_failures" (
	"email_key" varchar(254) PRIMARY KEY NOT NULL,
	"failures" integer DEFAULT 0 NOT NULL,
	"last_failure_at" timestamp with time zone DEFAULT now() NOT NULL,
	"locked_until" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" varchar(254) NOT NULL,
	"display_name" varchar(120) NOT NULL,
	"password_hash" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "access_tokens" ADD CONSTRAINT "access_tokens_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "access_tokens" ADD CONSTRAINT "access_tokens_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "assumption_sets" ADD CONSTRAINT "assumption_sets_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "assumption_sets" ADD CONSTRAINT "assumption_sets_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "assumption_sets" ADD CONSTRAINT "assumption_sets_approved_by_users_id_fk" FOREIGN KEY ("approved_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "default_options" ADD CONSTRAINT "default_options_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fund_assumptions" ADD CONSTRAINT "fund_assumptions_assumption_set_id_assumption_sets_id_fk" FOREIGN KEY ("assumption_set_id") REFERENCES "public"."assumption_sets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fund_assumptions" ADD CONSTRAINT "fund_assumptions_fund_id_funds_id_fk" FOREIGN KEY ("fund_id") REFERENCES "public"."funds"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "funds" ADD CONSTRAINT "funds_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "illustrative_members" ADD CONSTRAINT "illustrative_members_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "projection_runs" ADD CONSTRAINT "projection_runs_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "projection_runs" ADD CONSTRAINT "projection_runs_assumption_set_id_assumption_sets_id_fk" FOREIGN KEY ("assumption_set_id") REFERENCES "public"."assumption_sets"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "projection_runs" ADD CONSTRAINT "projection_runs_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scheme_members" ADD CONSTRAINT "scheme_members_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scheme_roles" ADD CONSTRAINT "scheme_roles_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scheme_roles" ADD CONSTRAINT "scheme_roles_scheme_id_schemes_id_fk" FOREIGN KEY ("scheme_id") REFERENCES "public"."schemes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "assumption_sets_scheme_version" ON "assumption_sets" USING btree ("scheme_id","version");--> statement-breakpoint
CREATE INDEX "audit_scheme_at" ON "audit_events" USING btree ("scheme_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "funds_scheme_name" ON "funds" USING btree ("scheme_id","name");--> statement-breakpoint
CREATE INDEX "projection_runs_scheme" ON "projection_runs" USING btree ("scheme_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "scheme_members_reference" ON "scheme_members" USING btree ("scheme_id","reference");--> statement-breakpoint
CREATE INDEX "IDX_session_expire" ON "session" USING btree ("expire");--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_lower" ON "users" USING btree (lower("email"));