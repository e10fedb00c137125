CREATE TYPE "public"."discipline" AS ENUM('artistic-women', 'artistic-men', 'tumbling', 'trampoline');--> statement-breakpoint
CREATE TYPE "public"."role" AS ENUM('director', 'coach', 'clinician', 'board');--> statement-breakpoint
CREATE TYPE "public"."squad_level" AS ENUM('development', 'intermediate', 'junior', 'senior');--> statement-breakpoint
CREATE TABLE "athletes" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"given_name" text NOT NULL,
	"family_name" text NOT NULL,
	"birth_year" integer NOT NULL,
	"squad_id" uuid NOT NULL,
	"discipline" "discipline" NOT NULL,
	"archived_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "athletes_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
CREATE TABLE "clubs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"slug" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "clubs_slug_unique" UNIQUE("slug")
);
--> statement-breakpoint
CREATE TABLE "coach_squads" (
	"club_id" uuid NOT NULL,
	"squad_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	CONSTRAINT "coach_squads_club_id_squad_id_user_id_pk" PRIMARY KEY("club_id","squad_id","user_id")
);
--> statement-breakpoint
CREATE TABLE "memberships" (
	"club_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	"role" "role" NOT NULL,
	"access_starts_on" date,
	"access_ends_on" date,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "memberships_club_id_user_id_pk" PRIMARY KEY("club_id","user_id")
);
--> statement-breakpoint
CREATE TABLE "squads" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"level" "squad_level" NOT NULL,
	"discipline" "discipline" NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "squads_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" text PRIMARY KEY NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"password_hash" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "athletes" ADD CONSTRAINT "athletes_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "athletes" ADD CONSTRAINT "athletes_club_id_squad_id_squads_club_id_id_fk" FOREIGN KEY ("club_id","squad_id") REFERENCES "public"."squads"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "coach_squads" ADD CONSTRAINT "coach_squads_club_id_squad_id_squads_club_id_id_fk" FOREIGN KEY ("club_id","squad_id") REFERENCES "public"."squads"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "coach_squads" ADD CONSTRAINT "coach_squads_club_id_user_id_memberships_club_id_user_id_fk" FOREIGN KEY ("club_id","user_id") REFERENCES "public"."memberships"("club_id","user_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "memberships" ADD CONSTRAINT "memberships_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "memberships" ADD CONSTRAINT "memberships_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "squads" ADD CONSTRAINT "squads_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "athletes_club_id_squad_id_index" ON "athletes" USING btree ("club_id","squad_id");--> statement-breakpoint
CREATE INDEX "memberships_user_id_index" ON "memberships" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "squads_club_id_name_index" ON "squads" USING btree ("club_id","name");--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_lower_idx" ON "users" USING btree (lower("email"));