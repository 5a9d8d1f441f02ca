ALTER TABLE "cue_runs" ADD COLUMN "heartbeat_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "cue_runs" ADD COLUMN "job_id" uuid;--> statement-breakpoint
CREATE INDEX "cue_runs_heartbeat_idx" ON "cue_runs" USING btree ("heartbeat_at") WHERE state = 'cueing';