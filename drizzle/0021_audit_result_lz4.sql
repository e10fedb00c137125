-- A stored audit's full result runs to megabytes of JSON: compressed with lz4 rather than the
-- default pglz it is written in about half the time and read a little faster, for a somewhat
-- larger row. Only rows written from now on are compressed so; older ones are read as they are.
-- A server built without lz4 keeps pglz.
DO $$
BEGIN
  ALTER TABLE "audits" ALTER COLUMN "result" SET COMPRESSION lz4;
EXCEPTION WHEN feature_not_supported THEN
  RAISE NOTICE 'lz4 is not available: audit results stay compressed with pglz';
END
$$;
