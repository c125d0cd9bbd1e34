-- Roles for a shared Rampwright logbook on PostgreSQL (README, "A shared logbook for a line of benches").
-- Run once as a superuser, after the logbook's owner has opened it with Rampwright (which creates the tables):
--   psql -d line_logbook -v owner=logbook_owner -f roles.sql
-- then give each bench and each reviewer a login in the right group:
--   CREATE ROLE bench_2 LOGIN IN ROLE rampwright_bench;        \password bench_2
--   CREATE ROLE qa_reviewer LOGIN IN ROLE rampwright_reviewer; \password qa_reviewer
-- A bench inserts sessions and their rows and updates its open sessions; nothing else. The database itself refuses
-- any change to a finished (signed, closed or interrupted) session, for every role (triggers of schema 3).

DO $$ BEGIN
  IF NOT EXISTS (SELECT FROM pg_roles WHERE rolname = 'rampwright_bench') THEN CREATE ROLE rampwright_bench NOLOGIN; END IF;
  IF NOT EXISTS (SELECT FROM pg_roles WHERE rolname = 'rampwright_reviewer') THEN CREATE ROLE rampwright_reviewer NOLOGIN; END IF;
END $$;

GRANT CONNECT ON DATABASE :"DBNAME" TO rampwright_bench, rampwright_reviewer;
GRANT USAGE ON SCHEMA public TO rampwright_bench, rampwright_reviewer;
REVOKE CREATE ON SCHEMA public FROM PUBLIC, rampwright_bench, rampwright_reviewer;

-- Reviewers read everything.
GRANT SELECT ON ALL TABLES IN SCHEMA public TO rampwright_reviewer;

-- Benches read and add; the only rows they may change are open sessions (heartbeat, readings, the end) and a
-- unit's design name while it has none. No DELETE, no TRUNCATE, no other UPDATE.
GRANT SELECT, INSERT ON ALL TABLES IN SCHEMA public TO rampwright_bench;
GRANT UPDATE ON sessions TO rampwright_bench;
GRANT UPDATE (design_name) ON units TO rampwright_bench;
GRANT USAGE ON ALL SEQUENCES IN SCHEMA public TO rampwright_bench;

-- Tables a later Rampwright adds get the same read and insert rights.
ALTER DEFAULT PRIVILEGES FOR ROLE :"owner" IN SCHEMA public GRANT SELECT ON TABLES TO rampwright_reviewer;
ALTER DEFAULT PRIVILEGES FOR ROLE :"owner" IN SCHEMA public GRANT SELECT, INSERT ON TABLES TO rampwright_bench;
ALTER DEFAULT PRIVILEGES FOR ROLE :"owner" IN SCHEMA public GRANT USAGE ON SEQUENCES TO rampwright_bench;
