-- Hand-written (not generated; drizzle-kit does not model UNLOGGED): the rate-limit counters skip
-- the write-ahead log. Every counted request (each fit check, each sign-in try) used to wait for a
-- WAL flush of a counter that has no value after a crash; an unlogged table's commit does not wait.
-- After a crash PostgreSQL empties the table, so the windows start again, and a read replica has no
-- copy of it (counters are only ever read and written on the primary). See docs/scaling.md.
ALTER TABLE "rate_limit" SET UNLOGGED;
