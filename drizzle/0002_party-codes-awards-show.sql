CREATE TABLE "awards" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"event_id" uuid NOT NULL,
	"title" text NOT NULL,
	"citation" text DEFAULT '' NOT NULL,
	"winner_entry_id" uuid,
	"position" integer DEFAULT 0 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "vote_code_scopes" (
	"vote_code_id" uuid NOT NULL,
	"competition_id" uuid NOT NULL,
	"redeemed_at" timestamp with time zone,
	CONSTRAINT "vote_code_scopes_vote_code_id_competition_id_pk" PRIMARY KEY("vote_code_id","competition_id")
);
--> statement-breakpoint
ALTER TABLE "vote_codes" ALTER COLUMN "competition_id" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "competitions" ADD COLUMN "show_starts_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "competitions" ADD COLUMN "show_minutes" integer DEFAULT 60 NOT NULL;--> statement-breakpoint
ALTER TABLE "vote_codes" ADD COLUMN "event_id" uuid;--> statement-breakpoint
ALTER TABLE "vote_codes" ADD COLUMN "party_wide" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "awards" ADD CONSTRAINT "awards_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "awards" ADD CONSTRAINT "awards_winner_entry_id_entries_id_fk" FOREIGN KEY ("winner_entry_id") REFERENCES "public"."entries"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "vote_code_scopes" ADD CONSTRAINT "vote_code_scopes_vote_code_id_vote_codes_id_fk" FOREIGN KEY ("vote_code_id") REFERENCES "public"."vote_codes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "vote_code_scopes" ADD CONSTRAINT "vote_code_scopes_competition_id_competitions_id_fk" FOREIGN KEY ("competition_id") REFERENCES "public"."competitions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "awards_event_idx" ON "awards" USING btree ("event_id");--> statement-breakpoint
CREATE INDEX "vote_code_scopes_competition_idx" ON "vote_code_scopes" USING btree ("competition_id");--> statement-breakpoint
ALTER TABLE "vote_codes" ADD CONSTRAINT "vote_codes_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "vote_codes_event_idx" ON "vote_codes" USING btree ("event_id");--> statement-breakpoint
-- Existing codes are one compo's own codes: the party is that compo's event, the scope that compo, redeemed as before.
UPDATE "vote_codes" SET "event_id" = "competitions"."event_id" FROM "competitions" WHERE "competitions"."id" = "vote_codes"."competition_id";--> statement-breakpoint
INSERT INTO "vote_code_scopes" ("vote_code_id", "competition_id", "redeemed_at") SELECT "id", "competition_id", "redeemed_at" FROM "vote_codes" WHERE "competition_id" IS NOT NULL;
