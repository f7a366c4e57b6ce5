CREATE TYPE "public"."study_kind" AS ENUM('sweep', 'closure-matrix', 'grid');--> statement-breakpoint
ALTER TYPE "public"."subject_type" ADD VALUE 'study';--> statement-breakpoint
CREATE TABLE "studies" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"team_id" uuid NOT NULL,
	"column_id" uuid NOT NULL,
	"case_id" uuid,
	"name" text NOT NULL,
	"kind" "study_kind" NOT NULL,
	"spec" jsonb NOT NULL,
	"base_case" jsonb NOT NULL,
	"member_count" integer NOT NULL,
	"measurement_id" uuid,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"cancelled_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "workers" (
	"id" text PRIMARY KEY NOT NULL,
	"host" text NOT NULL,
	"pid" integer NOT NULL,
	"slots" integer NOT NULL,
	"solver_version" text NOT NULL,
	"started_at" timestamp with time zone DEFAULT now() NOT NULL,
	"heartbeat_at" timestamp with time zone DEFAULT now() NOT NULL,
	"stopped_at" timestamp with time zone,
	"active_runs" integer DEFAULT 0 NOT NULL,
	"runs_done" integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "study_id" uuid;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "study_index" integer;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "study_point" jsonb;--> statement-breakpoint
ALTER TABLE "teams" ADD COLUMN "max_study_runs" integer DEFAULT 100 NOT NULL;--> statement-breakpoint
ALTER TABLE "studies" ADD CONSTRAINT "studies_team_id_teams_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."teams"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "studies" ADD CONSTRAINT "studies_column_id_columns_id_fk" FOREIGN KEY ("column_id") REFERENCES "public"."columns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "studies" ADD CONSTRAINT "studies_case_id_cases_id_fk" FOREIGN KEY ("case_id") REFERENCES "public"."cases"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "studies" ADD CONSTRAINT "studies_measurement_id_measurements_id_fk" FOREIGN KEY ("measurement_id") REFERENCES "public"."measurements"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "studies" ADD CONSTRAINT "studies_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "studies_column_idx" ON "studies" USING btree ("team_id","column_id","created_at");--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "runs_study_idx" ON "runs" USING btree ("study_id","study_index");