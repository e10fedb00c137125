ALTER TABLE "requirement_profiles" ADD COLUMN "apparatus" text;--> statement-breakpoint
-- A profile written before the column existed is read on its discipline's own apparatus: floor
-- for the artistic disciplines (the seeded profile is the women's floor one), the discipline's
-- name for tumbling and trampoline.
UPDATE "requirement_profiles" SET "apparatus" = CASE "discipline"
  WHEN 'tumbling' THEN 'tumbling'
  WHEN 'trampoline' THEN 'trampoline'
  ELSE 'floor' END;--> statement-breakpoint
ALTER TABLE "requirement_profiles" ALTER COLUMN "apparatus" SET NOT NULL;--> statement-breakpoint
-- The rotation class now counts saltos completed: 5–7 quarters are single, 9–11 double
-- (shared/domain/catalogue.ts, rotationClass).
UPDATE "elements" SET "rotation_class" = CASE
  WHEN "quarter_rotations" <= 0 THEN 'none'
  WHEN "quarter_rotations" < 8 THEN 'single'
  WHEN "quarter_rotations" < 12 THEN 'double'
  ELSE 'triple' END::"rotation_class"
WHERE "rotation_class" IS DISTINCT FROM (CASE
  WHEN "quarter_rotations" <= 0 THEN 'none'
  WHEN "quarter_rotations" < 8 THEN 'single'
  WHEN "quarter_rotations" < 12 THEN 'double'
  ELSE 'triple' END)::"rotation_class";
