CREATE TABLE "club_archive_files" (
	"club_id" uuid NOT NULL,
	"archive_id" uuid NOT NULL,
	"bytes" "bytea" NOT NULL,
	CONSTRAINT "club_archive_files_club_id_archive_id_pk" PRIMARY KEY("club_id","archive_id")
);
--> statement-breakpoint
CREATE TABLE "club_archives" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"requested_by" text,
	"job_id" uuid,
	"status" text DEFAULT 'running' NOT NULL,
	"phase" text DEFAULT 'queued' NOT NULL,
	"done" integer DEFAULT 0 NOT NULL,
	"total" integer DEFAULT 1 NOT NULL,
	"error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone,
	"expires_at" timestamp with time zone NOT NULL,
	"byte_size" integer,
	"sha256" text,
	CONSTRAINT "club_archives_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
ALTER TABLE "club_archive_files" ADD CONSTRAINT "club_archive_files_club_id_archive_id_club_archives_club_id_id_fk" FOREIGN KEY ("club_id","archive_id") REFERENCES "public"."club_archives"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "club_archives" ADD CONSTRAINT "club_archives_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "club_archives" ADD CONSTRAINT "club_archives_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "club_archives_expires_idx" ON "club_archives" USING btree ("expires_at");--> statement-breakpoint
-- A zip is compressed already: stored out of line as it is, without a second try at compressing it.
ALTER TABLE "club_archive_files" ALTER COLUMN "bytes" SET STORAGE EXTERNAL;
