CREATE TABLE "projection_run_pots" (
	"run_id" uuid NOT NULL,
	"variant" varchar(16) NOT NULL,
	"option_id" varchar(100) NOT NULL,
	"member_id" varchar(100) NOT NULL,
	"paths" integer NOT NULL,
	"encoding" varchar(40) NOT NULL,
	"data" "bytea" NOT NULL,
	CONSTRAINT "projection_run_pots_run_id_variant_option_id_member_id_pk" PRIMARY KEY("run_id","variant","option_id","member_id")
);
--> statement-breakpoint
ALTER TABLE "projection_run_pots" ADD CONSTRAINT "projection_run_pots_run_id_projection_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."projection_runs"("id") ON DELETE cascade ON UPDATE no action;