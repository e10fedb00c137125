CREATE TABLE "invitation_tokens" (
	"token_hash" text PRIMARY KEY NOT NULL,
	"club_id" uuid NOT NULL,
	"invitation_id" uuid NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "invitations" DROP CONSTRAINT "invitations_tokenHash_unique";--> statement-breakpoint
ALTER TABLE "invitation_tokens" ADD CONSTRAINT "invitation_tokens_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invitation_tokens" ADD CONSTRAINT "invitation_tokens_club_id_invitation_id_invitations_club_id_id_fk" FOREIGN KEY ("club_id","invitation_id") REFERENCES "public"."invitations"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "invitation_tokens_invitation_idx" ON "invitation_tokens" USING btree ("club_id","invitation_id");--> statement-breakpoint
ALTER TABLE "progress_events" ADD CONSTRAINT "progress_events_club_id_corrects_event_id_progress_events_club_id_id_fk" FOREIGN KEY ("club_id","corrects_event_id") REFERENCES "public"."progress_events"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "progress_records" ADD CONSTRAINT "progress_records_club_id_last_event_id_progress_events_club_id_id_fk" FOREIGN KEY ("club_id","last_event_id") REFERENCES "public"."progress_events"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "progress_events_corrects_idx" ON "progress_events" USING btree ("club_id","corrects_event_id") WHERE "progress_events"."corrects_event_id" is not null;--> statement-breakpoint
CREATE INDEX "progress_records_last_event_idx" ON "progress_records" USING btree ("club_id","last_event_id");--> statement-breakpoint
-- The links of open invitations move to their own table, so that a link is found without
-- knowing its club. Links of accepted or withdrawn invitations can never be used again and are
-- not kept.
INSERT INTO "invitation_tokens" ("token_hash", "club_id", "invitation_id", "expires_at", "created_at")
SELECT "token_hash", "club_id", "id", "expires_at", "created_at" FROM "invitations"
WHERE "accepted_at" IS NULL AND "withdrawn_at" IS NULL;--> statement-breakpoint
ALTER TABLE "invitations" DROP COLUMN "token_hash";