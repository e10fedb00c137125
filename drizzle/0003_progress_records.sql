CREATE TABLE "progress_records" (
	"club_id" uuid NOT NULL,
	"athlete_id" uuid NOT NULL,
	"element_id" uuid NOT NULL,
	"step_index" integer,
	"highest_step_index" integer,
	"step_reached_on" date,
	"paused" boolean DEFAULT false NOT NULL,
	"pause_reason" "pause_reason",
	"planned_step_index" integer,
	"last_event_on" date,
	"last_event_id" uuid,
	"flagged" boolean DEFAULT false NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "progress_records_club_id_athlete_id_element_id_pk" PRIMARY KEY("club_id","athlete_id","element_id")
);
--> statement-breakpoint
ALTER TABLE "clubs" ADD COLUMN "lost_skill_step_down" integer DEFAULT 2 NOT NULL;--> statement-breakpoint
ALTER TABLE "progress_records" ADD CONSTRAINT "progress_records_club_id_athlete_id_athletes_club_id_id_fk" FOREIGN KEY ("club_id","athlete_id") REFERENCES "public"."athletes"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "progress_records" ADD CONSTRAINT "progress_records_club_id_element_id_elements_club_id_id_fk" FOREIGN KEY ("club_id","element_id") REFERENCES "public"."elements"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "progress_records_element_idx" ON "progress_records" USING btree ("club_id","element_id");