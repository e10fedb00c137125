CREATE TABLE "planner_stations" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"modality" "modality" NOT NULL,
	"capacity" integer NOT NULL,
	"seconds_per_turn" integer NOT NULL,
	"needs_spotter" boolean NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "planner_stations_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
CREATE TABLE "session_plans" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"squad_id" uuid NOT NULL,
	"session_date" date NOT NULL,
	"model" jsonb NOT NULL,
	"placements" jsonb NOT NULL,
	"outcome" jsonb,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone,
	CONSTRAINT "session_plans_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
ALTER TABLE "planner_stations" ADD CONSTRAINT "planner_stations_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "session_plans" ADD CONSTRAINT "session_plans_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "session_plans" ADD CONSTRAINT "session_plans_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "session_plans" ADD CONSTRAINT "session_plans_club_id_squad_id_squads_club_id_id_fk" FOREIGN KEY ("club_id","squad_id") REFERENCES "public"."squads"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "planner_stations_club_id_name_index" ON "planner_stations" USING btree ("club_id","name");--> statement-breakpoint
CREATE INDEX "session_plans_squad_idx" ON "session_plans" USING btree ("club_id","squad_id","session_date");