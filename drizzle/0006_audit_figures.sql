ALTER TABLE "audits" ADD COLUMN "figures" jsonb;--> statement-breakpoint
UPDATE "audits" SET "figures" = jsonb_build_object('headline', "result"->'headline', 'squads', "result"->'squads');--> statement-breakpoint
ALTER TABLE "audits" ALTER COLUMN "figures" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "audits" ALTER COLUMN "result" SET DATA TYPE json USING "result"::json;--> statement-breakpoint
DO $$
BEGIN
  -- lz4 compresses and expands a large result several times faster than the default; a server
  -- built without it keeps the default.
  IF EXISTS (SELECT 1 FROM pg_settings WHERE name = 'default_toast_compression' AND 'lz4' = ANY (enumvals)) THEN
    ALTER TABLE "audits" ALTER COLUMN "result" SET COMPRESSION lz4;
  END IF;
END $$;
