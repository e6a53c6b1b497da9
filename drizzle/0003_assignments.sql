CREATE TYPE "public"."job_status" AS ENUM('queued', 'running', 'done', 'failed');--> statement-breakpoint
CREATE TYPE "public"."key_release" AS ENUM('after-due', 'manual');--> statement-breakpoint
CREATE TYPE "public"."late_policy" AS ENUM('closed', 'penalty');--> statement-breakpoint
CREATE TYPE "public"."submission_status" AS ENUM('queued', 'graded', 'failed');--> statement-breakpoint
CREATE TYPE "public"."verdict" AS ENUM('correct', 'incorrect', 'unreadable', 'wrong-dimension');--> statement-breakpoint
CREATE TABLE "assignment_items" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "assignment_items_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"assignment_id" integer NOT NULL,
	"position" integer NOT NULL,
	"problem_id" integer NOT NULL,
	"problem_version_id" integer NOT NULL,
	"points" double precision NOT NULL,
	"tolerance_overrides" jsonb DEFAULT '{}'::jsonb NOT NULL,
	CONSTRAINT "assignment_items_points" CHECK ("assignment_items"."points" >= 0)
);
--> statement-breakpoint
CREATE TABLE "assignments" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "assignments_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"course_id" integer NOT NULL,
	"title" text NOT NULL,
	"instructions" text DEFAULT '' NOT NULL,
	"opens_at" timestamp with time zone NOT NULL,
	"due_at" timestamp with time zone NOT NULL,
	"attempts_per_find" integer DEFAULT 3 NOT NULL,
	"late_policy" "late_policy" DEFAULT 'closed' NOT NULL,
	"late_penalty_percent_per_day" double precision DEFAULT 0 NOT NULL,
	"late_days_allowed" integer DEFAULT 0 NOT NULL,
	"key_release" "key_release" DEFAULT 'after-due' NOT NULL,
	"key_released_at" timestamp with time zone,
	"grades_released_at" timestamp with time zone,
	"created_by" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "assignments_due_after_open" CHECK ("assignments"."due_at" > "assignments"."opens_at"),
	CONSTRAINT "assignments_attempts_positive" CHECK ("assignments"."attempts_per_find" >= 1)
);
--> statement-breakpoint
CREATE TABLE "audit_events" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "audit_events_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"actor_id" integer,
	"course_id" integer NOT NULL,
	"assignment_id" integer,
	"user_id" integer,
	"part_result_id" integer,
	"kind" text NOT NULL,
	"before" jsonb,
	"after" jsonb,
	"note" text DEFAULT '' NOT NULL
);
--> statement-breakpoint
CREATE TABLE "extensions" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "extensions_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"assignment_id" integer NOT NULL,
	"user_id" integer NOT NULL,
	"due_at" timestamp with time zone,
	"extra_attempts" integer DEFAULT 0 NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"created_by" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "extensions_extra_attempts" CHECK ("extensions"."extra_attempts" >= 0)
);
--> statement-breakpoint
CREATE TABLE "grade_exports" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "grade_exports_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"requested_by" integer NOT NULL,
	"term_id" integer NOT NULL,
	"status" "job_status" DEFAULT 'queued' NOT NULL,
	"rows" integer DEFAULT 0 NOT NULL,
	"file_name" text NOT NULL,
	"csv" text,
	"error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "part_results" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "part_results_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"submission_id" integer NOT NULL,
	"assignment_id" integer NOT NULL,
	"item_id" integer NOT NULL,
	"user_id" integer NOT NULL,
	"find_name" text NOT NULL,
	"answer" text NOT NULL,
	"attempt" integer NOT NULL,
	"verdict" "verdict",
	"value" double precision,
	"score" double precision,
	"max_score" double precision NOT NULL,
	"message" text,
	"pitfall_id" text,
	"pitfall_feedback" text,
	"detail" jsonb,
	"graded_version_id" integer,
	"grader_version" text,
	"graded_at" timestamp with time zone,
	"regrade_id" integer
);
--> statement-breakpoint
CREATE TABLE "regrades" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "regrades_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"assignment_id" integer NOT NULL,
	"item_id" integer NOT NULL,
	"from_version_id" integer NOT NULL,
	"to_version_id" integer NOT NULL,
	"tolerance_overrides" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"status" "job_status" DEFAULT 'queued' NOT NULL,
	"total" integer DEFAULT 0 NOT NULL,
	"done" integer DEFAULT 0 NOT NULL,
	"changed" integer DEFAULT 0 NOT NULL,
	"error" text,
	"requested_by" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "submissions" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "submissions_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"assignment_id" integer NOT NULL,
	"item_id" integer NOT NULL,
	"user_id" integer NOT NULL,
	"answers" jsonb NOT NULL,
	"submitted_at" timestamp with time zone DEFAULT now() NOT NULL,
	"status" "submission_status" DEFAULT 'queued' NOT NULL,
	"days_late" integer DEFAULT 0 NOT NULL,
	"late_penalty" double precision DEFAULT 0 NOT NULL,
	"graded_at" timestamp with time zone,
	"error" text
);
--> statement-breakpoint
ALTER TABLE "assignment_items" ADD CONSTRAINT "assignment_items_assignment_id_assignments_id_fk" FOREIGN KEY ("assignment_id") REFERENCES "public"."assignments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "assignment_items" ADD CONSTRAINT "assignment_items_problem_id_problems_id_fk" FOREIGN KEY ("problem_id") REFERENCES "public"."problems"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "assignment_items" ADD CONSTRAINT "assignment_items_problem_version_id_problem_versions_id_fk" FOREIGN KEY ("problem_version_id") REFERENCES "public"."problem_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "assignments" ADD CONSTRAINT "assignments_course_id_courses_id_fk" FOREIGN KEY ("course_id") REFERENCES "public"."courses"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "assignments" ADD CONSTRAINT "assignments_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_actor_id_users_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "extensions" ADD CONSTRAINT "extensions_assignment_id_assignments_id_fk" FOREIGN KEY ("assignment_id") REFERENCES "public"."assignments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "extensions" ADD CONSTRAINT "extensions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "extensions" ADD CONSTRAINT "extensions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "grade_exports" ADD CONSTRAINT "grade_exports_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "grade_exports" ADD CONSTRAINT "grade_exports_term_id_terms_id_fk" FOREIGN KEY ("term_id") REFERENCES "public"."terms"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "part_results" ADD CONSTRAINT "part_results_submission_id_submissions_id_fk" FOREIGN KEY ("submission_id") REFERENCES "public"."submissions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "regrades" ADD CONSTRAINT "regrades_assignment_id_assignments_id_fk" FOREIGN KEY ("assignment_id") REFERENCES "public"."assignments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "regrades" ADD CONSTRAINT "regrades_item_id_assignment_items_id_fk" FOREIGN KEY ("item_id") REFERENCES "public"."assignment_items"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "regrades" ADD CONSTRAINT "regrades_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "submissions" ADD CONSTRAINT "submissions_assignment_id_assignments_id_fk" FOREIGN KEY ("assignment_id") REFERENCES "public"."assignments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "submissions" ADD CONSTRAINT "submissions_item_id_assignment_items_id_fk" FOREIGN KEY ("item_id") REFERENCES "public"."assignment_items"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "submissions" ADD CONSTRAINT "submissions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "assignment_items_assignment_idx" ON "assignment_items" USING btree ("assignment_id","position");--> statement-breakpoint
CREATE INDEX "assignments_course_idx" ON "assignments" USING btree ("course_id","due_at");--> statement-breakpoint
CREATE INDEX "audit_events_course_idx" ON "audit_events" USING btree ("course_id","at");--> statement-breakpoint
CREATE INDEX "audit_events_user_idx" ON "audit_events" USING btree ("user_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "extensions_assignment_user_key" ON "extensions" USING btree ("assignment_id","user_id");--> statement-breakpoint
CREATE INDEX "grade_exports_requested_idx" ON "grade_exports" USING btree ("requested_by","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "part_results_submission_find_key" ON "part_results" USING btree ("submission_id","find_name");--> statement-breakpoint
CREATE INDEX "part_results_item_user_find_idx" ON "part_results" USING btree ("item_id","user_id","find_name");--> statement-breakpoint
CREATE INDEX "part_results_assignment_idx" ON "part_results" USING btree ("assignment_id");--> statement-breakpoint
CREATE INDEX "regrades_assignment_idx" ON "regrades" USING btree ("assignment_id","created_at");--> statement-breakpoint
CREATE INDEX "submissions_item_user_idx" ON "submissions" USING btree ("item_id","user_id","submitted_at");--> statement-breakpoint
CREATE INDEX "submissions_assignment_status_idx" ON "submissions" USING btree ("assignment_id","status");--> statement-breakpoint
CREATE FUNCTION "audit_events_append_only"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'audit_events is append-only: rows are never changed or removed';
END;
$$;--> statement-breakpoint
CREATE TRIGGER "audit_events_no_update_or_delete" BEFORE UPDATE OR DELETE ON "audit_events" FOR EACH ROW EXECUTE FUNCTION "audit_events_append_only"();
