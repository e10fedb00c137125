CREATE TABLE "age_thresholds" (
	"club_id" uuid NOT NULL,
	"discipline" "discipline" NOT NULL,
	"junior_from_age" integer NOT NULL,
	"senior_from_age" integer NOT NULL,
	"source" text NOT NULL,
	CONSTRAINT "age_thresholds_club_id_discipline_pk" PRIMARY KEY("club_id","discipline")
);
--> statement-breakpoint
CREATE TABLE "audits" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"squad_id" uuid,
	"as_of" date NOT NULL,
	"input_hash" text NOT NULL,
	"result" jsonb NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"published_at" timestamp with time zone,
	"published_by" text,
	CONSTRAINT "audits_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
CREATE TABLE "requirement_profiles" (
	"club_id" uuid NOT NULL,
	"id" text NOT NULL,
	"label" text NOT NULL,
	"discipline" "discipline" NOT NULL,
	"categories" text[] NOT NULL,
	"source" text NOT NULL,
	"requirements" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "requirement_profiles_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
ALTER TABLE "age_thresholds" ADD CONSTRAINT "age_thresholds_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audits" ADD CONSTRAINT "audits_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audits" ADD CONSTRAINT "audits_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audits" ADD CONSTRAINT "audits_published_by_users_id_fk" FOREIGN KEY ("published_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audits" ADD CONSTRAINT "audits_club_id_squad_id_squads_club_id_id_fk" FOREIGN KEY ("club_id","squad_id") REFERENCES "public"."squads"("club_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "requirement_profiles" ADD CONSTRAINT "requirement_profiles_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "audits_scope_idx" ON "audits" USING btree ("club_id","squad_id","as_of");