CREATE TABLE "rate_limits" (
	"key" varchar(255) PRIMARY KEY NOT NULL,
	"points" integer DEFAULT 0 NOT NULL,
	"expire" bigint
);
--> statement-breakpoint
-- Session ids are now stored as the SHA-256 of the cookie's secret: sessions stored before could
-- not be matched, so they end here and their holders sign in again.
DELETE FROM "sessions";
