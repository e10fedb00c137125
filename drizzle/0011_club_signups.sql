CREATE TABLE "club_signups" (
	"token_hash" text PRIMARY KEY NOT NULL,
	"email" text NOT NULL,
	"person_name" text NOT NULL,
	"club_name" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE INDEX "club_signups_expires_at_index" ON "club_signups" USING btree ("expires_at");