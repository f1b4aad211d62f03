ALTER TABLE "vote_codes" DROP CONSTRAINT "vote_codes_competition_id_competitions_id_fk";
--> statement-breakpoint
ALTER TABLE "vote_codes" ALTER COLUMN "event_id" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "vote_codes" DROP COLUMN "competition_id";--> statement-breakpoint
ALTER TABLE "vote_codes" DROP COLUMN "redeemed_at";