ALTER TABLE "dataset_versions" ADD COLUMN "note" text;--> statement-breakpoint
ALTER TABLE "lift_tests" ADD COLUMN "note" text;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "restarted_from_run_id" text;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_restarted_from_run_id_runs_id_fk" FOREIGN KEY ("restarted_from_run_id") REFERENCES "public"."runs"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "runs_status_idx" ON "runs" USING btree ("status");