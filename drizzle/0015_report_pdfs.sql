CREATE TABLE "report_pdf_files" (
	"club_id" uuid NOT NULL,
	"report_pdf_id" uuid NOT NULL,
	"bytes" "bytea" NOT NULL,
	CONSTRAINT "report_pdf_files_club_id_report_pdf_id_pk" PRIMARY KEY("club_id","report_pdf_id")
);
--> statement-breakpoint
CREATE TABLE "report_pdfs" (
	"club_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"audit_id" uuid NOT NULL,
	"requested_by" text,
	"squad_ids" jsonb,
	"job_id" uuid,
	"status" text DEFAULT 'running' NOT NULL,
	"phase" text DEFAULT 'queued' NOT NULL,
	"done" integer DEFAULT 0 NOT NULL,
	"total" integer DEFAULT 2 NOT NULL,
	"error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone,
	"expires_at" timestamp with time zone NOT NULL,
	"byte_size" integer,
	CONSTRAINT "report_pdfs_club_id_id_pk" PRIMARY KEY("club_id","id")
);
--> statement-breakpoint
ALTER TABLE "report_pdf_files" ADD CONSTRAINT "report_pdf_files_club_id_report_pdf_id_report_pdfs_club_id_id_fk" FOREIGN KEY ("club_id","report_pdf_id") REFERENCES "public"."report_pdfs"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "report_pdfs" ADD CONSTRAINT "report_pdfs_club_id_clubs_id_fk" FOREIGN KEY ("club_id") REFERENCES "public"."clubs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "report_pdfs" ADD CONSTRAINT "report_pdfs_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "report_pdfs" ADD CONSTRAINT "report_pdfs_club_id_audit_id_audits_club_id_id_fk" FOREIGN KEY ("club_id","audit_id") REFERENCES "public"."audits"("club_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "report_pdfs_audit_idx" ON "report_pdfs" USING btree ("club_id","audit_id","requested_by");--> statement-breakpoint
CREATE INDEX "report_pdfs_expires_idx" ON "report_pdfs" USING btree ("expires_at");--> statement-breakpoint
-- A PDF's streams are compressed already: stored out of line as it is, without a second try at compressing it.
ALTER TABLE "report_pdf_files" ALTER COLUMN "bytes" SET STORAGE EXTERNAL;
