ALTER TABLE "sign_in_attempts" ADD COLUMN "kind" text DEFAULT 'sign-in' NOT NULL;--> statement-breakpoint
ALTER TABLE "submissions" ADD COLUMN "form_token" text;--> statement-breakpoint
CREATE INDEX "sign_in_attempts_pair_idx" ON "sign_in_attempts" USING btree ("email","client_address","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "submissions_user_form_token_idx" ON "submissions" USING btree ("user_id","form_token");