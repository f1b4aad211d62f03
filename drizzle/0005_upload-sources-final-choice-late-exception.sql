ALTER TABLE "entries" ADD COLUMN "final_upload_id" uuid;--> statement-breakpoint
ALTER TABLE "entries" ADD COLUMN "late_until" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "entries" ADD COLUMN "late_reason" text;--> statement-breakpoint
ALTER TABLE "entries" ADD COLUMN "late_granted_by" text;--> statement-breakpoint
ALTER TABLE "entries" ADD COLUMN "late_granted_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "uploads" ADD COLUMN "repository_url" text;--> statement-breakpoint
ALTER TABLE "uploads" ADD COLUMN "repository_commit" text;--> statement-breakpoint
ALTER TABLE "uploads" ADD COLUMN "licence" text;--> statement-breakpoint
ALTER TABLE "uploads" ADD COLUMN "late_exception" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "entries" ADD CONSTRAINT "entries_final_upload_id_uploads_id_fk" FOREIGN KEY ("final_upload_id") REFERENCES "public"."uploads"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entries" ADD CONSTRAINT "entries_late_granted_by_user_id_fk" FOREIGN KEY ("late_granted_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;