ALTER TABLE "cue_runs" DROP CONSTRAINT "cue_runs_inputs_key";--> statement-breakpoint
ALTER TABLE "cue_runs" ADD COLUMN "params" jsonb DEFAULT '{}'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "takes" ADD COLUMN "frame_rate" text;--> statement-breakpoint
ALTER TABLE "takes" ADD COLUMN "start_timecode" text;--> statement-breakpoint
ALTER TABLE "takes" ADD COLUMN "film_offset_frames" integer;--> statement-breakpoint
ALTER TABLE "cue_runs" ADD CONSTRAINT "cue_runs_inputs_key" UNIQUE NULLS NOT DISTINCT("take_id","venue_id","cueing_version_id","budget_version_id","params");