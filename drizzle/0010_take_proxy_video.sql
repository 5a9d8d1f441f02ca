ALTER TABLE "takes" ADD COLUMN "proxy_video_key" text;--> statement-breakpoint
ALTER TABLE "takes" ADD COLUMN "proxy_video_type" text;--> statement-breakpoint
ALTER TABLE "takes" ADD COLUMN "proxy_video_bytes" bigint;--> statement-breakpoint
ALTER TABLE "takes" ADD COLUMN "proxy_video_sha256" text;--> statement-breakpoint
ALTER TABLE "takes" ADD COLUMN "proxy_video_at" timestamp with time zone;