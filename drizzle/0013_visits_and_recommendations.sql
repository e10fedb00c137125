CREATE TYPE "public"."recommendation_priority" AS ENUM('low', 'normal', 'high');--> statement-breakpoint
CREATE TYPE "public"."recommendation_status" AS ENUM('open', 'accepted', 'declined', 'done');--> statement-breakpoint
CREATE TABLE "recommendation_events" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"recommendation_id" uuid NOT NULL,
	"status" "recommendation_status" NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"by_user_id" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "recommendation_events_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
CREATE TABLE "recommendations" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"visit_id" uuid NOT NULL,
	"squad_id" uuid NOT NULL,
	"athlete_id" uuid,
	"element_id" uuid,
	"suggested_step_index" integer,
	"steps_version" integer,
	"text" text NOT NULL,
	"priority" "recommendation_priority" DEFAULT 'normal' NOT NULL,
	"due_on" date NOT NULL,
	"status" "recommendation_status" DEFAULT 'open' NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"reminded_at" timestamp with time zone,
	CONSTRAINT "recommendations_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
CREATE TABLE "visit_squads" (
	"club_id" uuid NOT NULL,
	"visit_id" uuid NOT NULL,
	"squad_id" uuid NOT NULL,
	CONSTRAINT "visit_squads_club_id_visit_id_squad_id_pk" PRIMARY KEY("club_id","visit_id","squad_id")
);
--> statement-breakpoint
CREATE TABLE "visits" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"clinician_id" text,
	"invitation_id" uuid,
	"first_day" date NOT NULL,
	"last_day" date NOT NULL,
	"agenda" text DEFAULT '' NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"cancelled_at" timestamp with time zone,
	CONSTRAINT "visits_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
ALTER TABLE "recommendation_events" ADD CONSTRAINT "recommendation_events_by_user_id_users_id_fk" FOREIGN KEY ("by_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recommendation_events" ADD CONSTRAINT "recommendation_events_club_id_recommendation_id_recommendations_club_id_id_fk" FOREIGN KEY ("club_id","recommendation_id") REFERENCES "public"."recommendations"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recommendations" ADD CONSTRAINT "recommendations_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recommendations" ADD CONSTRAINT "recommendations_club_id_visit_id_visits_club_id_id_fk" FOREIGN KEY ("club_id","visit_id") REFERENCES "public"."visits"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recommendations" ADD CONSTRAINT "recommendations_club_id_squad_id_squads_club_id_id_fk" FOREIGN KEY ("club_id","squad_id") REFERENCES "public"."squads"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recommendations" ADD CONSTRAINT "recommendations_club_id_athlete_id_athletes_club_id_id_fk" FOREIGN KEY ("club_id","athlete_id") REFERENCES "public"."athletes"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recommendations" ADD CONSTRAINT "recommendations_club_id_element_id_elements_club_id_id_fk" FOREIGN KEY ("club_id","element_id") REFERENCES "public"."elements"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visit_squads" ADD CONSTRAINT "visit_squads_club_id_visit_id_visits_club_id_id_fk" FOREIGN KEY ("club_id","visit_id") REFERENCES "public"."visits"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visit_squads" ADD CONSTRAINT "visit_squads_club_id_squad_id_squads_club_id_id_fk" FOREIGN KEY ("club_id","squad_id") REFERENCES "public"."squads"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_clinician_id_users_id_fk" FOREIGN KEY ("clinician_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_club_id_invitation_id_invitations_club_id_id_fk" FOREIGN KEY ("club_id","invitation_id") REFERENCES "public"."invitations"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "recommendation_events_recommendation_idx" ON "recommendation_events" USING btree ("club_id","recommendation_id");--> statement-breakpoint
CREATE INDEX "recommendations_squad_idx" ON "recommendations" USING btree ("club_id","squad_id");--> statement-breakpoint
CREATE INDEX "recommendations_athlete_idx" ON "recommendations" USING btree ("club_id","athlete_id");--> statement-breakpoint
CREATE INDEX "recommendations_visit_idx" ON "recommendations" USING btree ("club_id","visit_id");--> statement-breakpoint
CREATE INDEX "visit_squads_squad_idx" ON "visit_squads" USING btree ("club_id","squad_id");--> statement-breakpoint
CREATE INDEX "visits_clinician_idx" ON "visits" USING btree ("club_id","clinician_id");--> statement-breakpoint
-- A clinician's membership window becomes a visit covering every squad of the club, so that
-- access, which now derives from visits, stays what it was.
WITH "moved" AS (
	INSERT INTO "visits" ("club_id", "clinician_id", "first_day", "last_day", "agenda")
	SELECT "club_id", "user_id", "access_starts_on", "access_ends_on", 'Visit window of the membership'
	FROM "memberships"
	WHERE "role" = 'clinician' AND "access_starts_on" IS NOT NULL AND "access_ends_on" IS NOT NULL
	RETURNING "club_id", "id"
)
INSERT INTO "visit_squads" ("club_id", "visit_id", "squad_id")
SELECT "moved"."club_id", "moved"."id", "squads"."id"
FROM "moved" JOIN "squads" ON "squads"."club_id" = "moved"."club_id";
