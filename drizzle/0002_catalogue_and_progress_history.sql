CREATE TYPE "public"."direction" AS ENUM('forward', 'backward', 'sideward');--> statement-breakpoint
CREATE TYPE "public"."modality" AS ENUM('floor-drill', 'trampoline', 'tumble-track', 'pit', 'soft-mat', 'spotting-rig', 'hand-spot', 'floor-solo', 'routine');--> statement-breakpoint
CREATE TYPE "public"."pause_reason" AS ENUM('lost-skill', 'injury', 'fear', 'other');--> statement-breakpoint
CREATE TYPE "public"."progress_event_kind" AS ENUM('step', 'pause', 'resume');--> statement-breakpoint
CREATE TYPE "public"."rotation_class" AS ENUM('none', 'single', 'double', 'triple');--> statement-breakpoint
CREATE TYPE "public"."shape" AS ENUM('tuck', 'pike', 'straight');--> statement-breakpoint
CREATE TYPE "public"."take_off" AS ENUM('standing', 'round-off', 'front-handspring', 'back-handspring', 'punch', 'trampoline-bounce');--> statement-breakpoint
CREATE TYPE "public"."twist_band" AS ENUM('none', 'half', 'full', 'more');--> statement-breakpoint
CREATE TABLE "element_prerequisites" (
	"club_id" uuid NOT NULL,
	"element_id" uuid NOT NULL,
	"requires_element_id" uuid NOT NULL,
	"step_index" integer NOT NULL,
	CONSTRAINT "element_prerequisites_club_id_element_id_requires_element_id_pk" PRIMARY KEY("club_id","element_id","requires_element_id")
);
--> statement-breakpoint
CREATE TABLE "element_step_maps" (
	"club_id" uuid NOT NULL,
	"element_id" uuid NOT NULL,
	"from_version" integer NOT NULL,
	"mapping" integer[] NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_by" text,
	CONSTRAINT "element_step_maps_club_id_element_id_from_version_pk" PRIMARY KEY("club_id","element_id","from_version")
);
--> statement-breakpoint
CREATE TABLE "element_steps" (
	"club_id" uuid NOT NULL,
	"element_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"name" text NOT NULL,
	"modality" "modality" NOT NULL,
	"criterion" text NOT NULL,
	"min_days" integer,
	CONSTRAINT "element_steps_club_id_element_id_position_pk" PRIMARY KEY("club_id","element_id","position")
);
--> statement-breakpoint
CREATE TABLE "elements" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"apparatus" text NOT NULL,
	"direction" "direction" NOT NULL,
	"quarter_rotations" integer NOT NULL,
	"twists" integer[] NOT NULL,
	"shape" "shape",
	"take_off" "take_off" NOT NULL,
	"difficulty_letter" text,
	"notes" text,
	"rotation_class" "rotation_class" NOT NULL,
	"twist_band" "twist_band" NOT NULL,
	"description_key" text NOT NULL,
	"counterpart_key" text,
	"template_family" text NOT NULL,
	"steps_version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "elements_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
CREATE TABLE "progress_events" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"athlete_id" uuid NOT NULL,
	"element_id" uuid NOT NULL,
	"kind" "progress_event_kind" NOT NULL,
	"step_index" integer,
	"steps_version" integer NOT NULL,
	"pause_reason" "pause_reason",
	"planned_step_index" integer,
	"occurred_on" date NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"coach_id" text,
	"note" text,
	"skip_reason" text,
	"corrects_event_id" uuid,
	"checks" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"flagged" boolean DEFAULT false NOT NULL,
	CONSTRAINT "progress_events_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
CREATE TABLE "progression_templates" (
	"club_id" uuid NOT NULL,
	"family" text NOT NULL,
	"label" text NOT NULL,
	"steps" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "progression_templates_club_id_family_pk" PRIMARY KEY("club_id","family")
);
--> statement-breakpoint
ALTER TABLE "element_prerequisites" ADD CONSTRAINT "element_prerequisites_club_id_element_id_elements_club_id_id_fk" FOREIGN KEY ("club_id","element_id") REFERENCES "public"."elements"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "element_prerequisites" ADD CONSTRAINT "element_prerequisites_club_id_requires_element_id_elements_club_id_id_fk" FOREIGN KEY ("club_id","requires_element_id") REFERENCES "public"."elements"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "element_step_maps" ADD CONSTRAINT "element_step_maps_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "element_step_maps" ADD CONSTRAINT "element_step_maps_club_id_element_id_elements_club_id_id_fk" FOREIGN KEY ("club_id","element_id") REFERENCES "public"."elements"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "element_steps" ADD CONSTRAINT "element_steps_club_id_element_id_elements_club_id_id_fk" FOREIGN KEY ("club_id","element_id") REFERENCES "public"."elements"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "elements" ADD CONSTRAINT "elements_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "progress_events" ADD CONSTRAINT "progress_events_coach_id_users_id_fk" FOREIGN KEY ("coach_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "progress_events" ADD CONSTRAINT "progress_events_club_id_athlete_id_athletes_club_id_id_fk" FOREIGN KEY ("club_id","athlete_id") REFERENCES "public"."athletes"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "progress_events" ADD CONSTRAINT "progress_events_club_id_element_id_elements_club_id_id_fk" FOREIGN KEY ("club_id","element_id") REFERENCES "public"."elements"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "progression_templates" ADD CONSTRAINT "progression_templates_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "elements_description_idx" ON "elements" USING btree ("club_id","description_key");--> statement-breakpoint
CREATE UNIQUE INDEX "elements_name_idx" ON "elements" USING btree ("club_id","apparatus",lower("name"));--> statement-breakpoint
CREATE INDEX "elements_counterpart_idx" ON "elements" USING btree ("club_id","counterpart_key");--> statement-breakpoint
CREATE INDEX "progress_events_record_idx" ON "progress_events" USING btree ("club_id","athlete_id","element_id");--> statement-breakpoint
CREATE INDEX "progress_events_element_idx" ON "progress_events" USING btree ("club_id","element_id");