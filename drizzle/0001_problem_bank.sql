CREATE TYPE "public"."problem_visibility" AS ENUM('private', 'department', 'installation');--> statement-breakpoint
CREATE TYPE "public"."sweep_status" AS ENUM('queued', 'running', 'done', 'failed');--> statement-breakpoint
CREATE TABLE "problem_sweeps" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "problem_sweeps_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"problem_version_id" integer NOT NULL,
	"requested_by" integer NOT NULL,
	"status" "sweep_status" DEFAULT 'queued' NOT NULL,
	"total" integer NOT NULL,
	"checked" integer DEFAULT 0 NOT NULL,
	"failed" integer DEFAULT 0 NOT NULL,
	"failures" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "problem_versions" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "problem_versions_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"problem_id" integer NOT NULL,
	"number" integer NOT NULL,
	"definition" jsonb NOT NULL,
	"created_by" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"frozen_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "problems" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "problems_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"owner_id" integer NOT NULL,
	"department_id" integer,
	"visibility" "problem_visibility" DEFAULT 'private' NOT NULL,
	"origin_problem_id" integer,
	"origin_version_id" integer,
	"title" text NOT NULL,
	"cycle" text NOT NULL,
	"topics" text[] DEFAULT '{}'::text[] NOT NULL,
	"difficulty" text NOT NULL,
	"level" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "problem_sweeps" ADD CONSTRAINT "problem_sweeps_problem_version_id_problem_versions_id_fk" FOREIGN KEY ("problem_version_id") REFERENCES "public"."problem_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "problem_sweeps" ADD CONSTRAINT "problem_sweeps_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "problem_versions" ADD CONSTRAINT "problem_versions_problem_id_problems_id_fk" FOREIGN KEY ("problem_id") REFERENCES "public"."problems"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "problem_versions" ADD CONSTRAINT "problem_versions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "problems" ADD CONSTRAINT "problems_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "problems" ADD CONSTRAINT "problems_department_id_departments_id_fk" FOREIGN KEY ("department_id") REFERENCES "public"."departments"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "problems" ADD CONSTRAINT "problems_origin_problem_id_problems_id_fk" FOREIGN KEY ("origin_problem_id") REFERENCES "public"."problems"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "problem_sweeps_version_idx" ON "problem_sweeps" USING btree ("problem_version_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "problem_versions_problem_number_key" ON "problem_versions" USING btree ("problem_id","number");--> statement-breakpoint
CREATE INDEX "problems_owner_idx" ON "problems" USING btree ("owner_id");--> statement-breakpoint
CREATE INDEX "problems_visibility_idx" ON "problems" USING btree ("visibility","department_id");