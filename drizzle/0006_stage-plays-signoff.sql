CREATE TABLE "stage_plays" (
	"entry_id" uuid PRIMARY KEY NOT NULL,
	"source" text DEFAULT 'reference' NOT NULL,
	"signed_off_upload_id" uuid,
	"signed_off_by" text,
	"signed_off_at" timestamp with time zone,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "stage_plays" ADD CONSTRAINT "stage_plays_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stage_plays" ADD CONSTRAINT "stage_plays_signed_off_upload_id_uploads_id_fk" FOREIGN KEY ("signed_off_upload_id") REFERENCES "public"."uploads"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stage_plays" ADD CONSTRAINT "stage_plays_signed_off_by_user_id_fk" FOREIGN KEY ("signed_off_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "competitions" DROP COLUMN "stage_flash_mode";