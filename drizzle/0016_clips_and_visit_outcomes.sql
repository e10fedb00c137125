CREATE TABLE "clip_reviews" (
	"club_id" uuid NOT NULL,
	"clip_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	"reviewed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "clip_reviews_club_id_clip_id_user_id_pk" PRIMARY KEY("club_id","clip_id","user_id")
);
--> statement-breakpoint
CREATE TABLE "clips" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"athlete_id" uuid NOT NULL,
	"element_id" uuid NOT NULL,
	"object_key" text NOT NULL,
	"content_type" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"file_name" text DEFAULT '' NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"uploaded_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "clips_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
ALTER TABLE "audits" ADD COLUMN "visit_outcomes" json;--> statement-breakpoint
ALTER TABLE "recommendations" ADD COLUMN "clip_id" uuid;--> statement-breakpoint
ALTER TABLE "clip_reviews" ADD CONSTRAINT "clip_reviews_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "clip_reviews" ADD CONSTRAINT "clip_reviews_club_id_clip_id_clips_club_id_id_fk" FOREIGN KEY ("club_id","clip_id") REFERENCES "public"."clips"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "clips" ADD CONSTRAINT "clips_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "clips" ADD CONSTRAINT "clips_club_id_athlete_id_athletes_club_id_id_fk" FOREIGN KEY ("club_id","athlete_id") REFERENCES "public"."athletes"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "clips" ADD CONSTRAINT "clips_club_id_element_id_elements_club_id_id_fk" FOREIGN KEY ("club_id","element_id") REFERENCES "public"."elements"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "clips_athlete_idx" ON "clips" USING btree ("club_id","athlete_id","element_id");--> statement-breakpoint
ALTER TABLE "recommendations" ADD CONSTRAINT "recommendations_club_id_clip_id_clips_club_id_id_fk" FOREIGN KEY ("club_id","clip_id") REFERENCES "public"."clips"("club_id","id") ON DELETE no action ON UPDATE no action;