/**
 * The logbook's schema as an ordered list of migrations. `PRAGMA user_version` holds how many have run; each one
 * runs in its own transaction together with the version bump, so a crash mid-migration leaves the old version whole.
 * Never edit a released migration: add the next one.
 * Times are integer milliseconds since 1970 UTC (`*_at_ms`); sample-clock times are seconds (`*_s`).
 */

/** Marks a file as ours (`PRAGMA application_id`): "RAMP" in ASCII. */
export const logbookApplicationId = 0x52414d50;

export const migrations: readonly string[] = [
  // 1: the first logbook.
  `
  CREATE TABLE board_designs (
    id INTEGER PRIMARY KEY,
    name TEXT NOT NULL,
    version INTEGER NOT NULL,
    content_hash TEXT NOT NULL UNIQUE,
    design_json TEXT NOT NULL,
    saved_at_ms INTEGER NOT NULL,
    UNIQUE (name, version)
  );
  CREATE TABLE units (
    id INTEGER PRIMARY KEY,
    serial TEXT NOT NULL UNIQUE,
    design_name TEXT,
    created_at_ms INTEGER NOT NULL
  );
  CREATE TABLE sessions (
    id INTEGER PRIMARY KEY,
    unit_id INTEGER NOT NULL REFERENCES units(id),
    design_id INTEGER NOT NULL REFERENCES board_designs(id),
    operator TEXT NOT NULL,
    started_at_ms INTEGER NOT NULL,
    ended_at_ms INTEGER,
    status TEXT NOT NULL CHECK (status IN ('open', 'closed', 'interrupted')),
    notes TEXT,
    readings_json TEXT,
    writer_host TEXT,
    writer_pid INTEGER,
    heartbeat_at_ms INTEGER,
    cycle_count INTEGER,
    alpha_mean_deg REAL,
    ramp_peak_median_v REAL
  );
  CREATE INDEX sessions_by_unit ON sessions (unit_id, started_at_ms);
  CREATE INDEX sessions_by_design ON sessions (design_id, started_at_ms);
  CREATE INDEX sessions_by_start ON sessions (started_at_ms);
  CREATE INDEX sessions_by_status ON sessions (status);
  CREATE TABLE cycles (
    session_id INTEGER NOT NULL REFERENCES sessions(id),
    seq INTEGER NOT NULL,
    t_s REAL NOT NULL,
    half_cycle TEXT,
    period_s REAL,
    alpha_deg REAL,
    control_v REAL,
    pulses INTEGER,
    wrong_half_cycle_pulses INTEGER,
    ramp_peak_v REAL,
    ramp_floor_v REAL,
    slope_v_per_ms REAL,
    start_delay_deg REAL,
    nonlinearity_pct REAL,
    clipped INTEGER,
    reset_us REAL,
    recorded_at_ms INTEGER NOT NULL,
    PRIMARY KEY (session_id, seq)
  ) WITHOUT ROWID;
  CREATE TABLE transfer_points (
    session_id INTEGER NOT NULL REFERENCES sessions(id),
    seq INTEGER NOT NULL,
    t_s REAL NOT NULL,
    control_v REAL NOT NULL,
    alpha_deg REAL NOT NULL,
    PRIMARY KEY (session_id, seq)
  ) WITHOUT ROWID;
  CREATE TABLE captures (
    id INTEGER PRIMARY KEY,
    session_id INTEGER NOT NULL REFERENCES sessions(id),
    label TEXT,
    start_s REAL NOT NULL,
    sample_rate_hz REAL NOT NULL,
    samples_per_channel INTEGER NOT NULL,
    roles TEXT NOT NULL,
    after_gap INTEGER NOT NULL,
    started_at_ms INTEGER NOT NULL,
    encoding TEXT NOT NULL,
    sha256 TEXT NOT NULL,
    data BLOB NOT NULL
  );
  CREATE INDEX captures_by_session ON captures (session_id);
  CREATE TABLE trims (
    id INTEGER PRIMARY KEY,
    session_id INTEGER NOT NULL REFERENCES sessions(id),
    part TEXT NOT NULL,
    from_ohm REAL NOT NULL,
    to_ohm REAL NOT NULL,
    method TEXT NOT NULL,
    reason TEXT NOT NULL,
    at_ms INTEGER NOT NULL
  );
  CREATE INDEX trims_by_session ON trims (session_id);
  CREATE TABLE link_events (
    id INTEGER PRIMARY KEY,
    session_id INTEGER NOT NULL REFERENCES sessions(id),
    kind TEXT NOT NULL,
    detail TEXT NOT NULL,
    count INTEGER NOT NULL,
    at_ms INTEGER NOT NULL
  );
  CREATE INDEX link_events_by_session ON link_events (session_id);
  `,
  // 2: part values the technician measured on the board (ohm, or farad for the ramp capacitor), beside the
  // design's value, as told to the trim planner; and each commissioning step's report as it was recorded
  // (steps_json), so recall shows what the technician saw, not the readings of the session's last moments.
  `
  ALTER TABLE sessions ADD COLUMN steps_json TEXT;
  CREATE TABLE part_measurements (
    id INTEGER PRIMARY KEY,
    session_id INTEGER NOT NULL REFERENCES sessions(id),
    part TEXT NOT NULL,
    value REAL NOT NULL,
    design_value REAL NOT NULL,
    at_ms INTEGER NOT NULL
  );
  CREATE INDEX part_measurements_by_session ON part_measurements (session_id);
  `,
  // 3: a line of benches sharing one logbook. Which bench recorded a session (`bench`, carried in its archive);
  // the content hash of a session that arrived as an archive (`content_sha256`, so a second push of it is found
  // without reading its cycles); and, in a bench's own logbook, which finished sessions it has pushed to which
  // shared logbook (`shared_copies`; `target` is the shared logbook's address without any password).
  // The PostgreSQL store mirrors every migration (postgres/pgSchema.ts).
  `
  ALTER TABLE sessions ADD COLUMN bench TEXT;
  ALTER TABLE sessions ADD COLUMN content_sha256 TEXT;
  CREATE UNIQUE INDEX sessions_by_content ON sessions (content_sha256) WHERE content_sha256 IS NOT NULL;
  CREATE TABLE shared_copies (
    session_id INTEGER NOT NULL REFERENCES sessions(id),
    target TEXT NOT NULL,
    content_sha256 TEXT NOT NULL,
    remote_session_id INTEGER NOT NULL,
    shared_at_ms INTEGER NOT NULL,
    PRIMARY KEY (session_id, target)
  );
  `,
  // 4: how a closed session ended. `sign_off` is null for a session closed without sign-off; a signed-off session
  // says whether every step was recorded and within tolerance ('signed-off') or not ('signed-off-with-exceptions',
  // with the technician's written reason and the steps excepted, JSON of the contract's SignOffException[]).
  // Sessions signed off before this schema (their recorded steps include the sign-off step) are classified from
  // their recorded steps: any step missing, unmeasured or out of tolerance makes them "with exceptions", with a
  // reason saying that no reason was asked for then. Nothing already stored changes; an arrived session so classified
  // forgets its archive hash (its content now holds the sign-off), so it is hashed from its rows again. Mirrored in
  // postgres/pgSchema.ts.
  `
  ALTER TABLE sessions ADD COLUMN sign_off TEXT CHECK (sign_off IN ('signed-off', 'signed-off-with-exceptions'));
  ALTER TABLE sessions ADD COLUMN sign_off_reason TEXT;
  ALTER TABLE sessions ADD COLUMN sign_off_exceptions_json TEXT;
  CREATE TEMP TABLE signed_before (id INTEGER PRIMARY KEY, exceptions TEXT NOT NULL);
  INSERT INTO signed_before (id, exceptions)
    SELECT s.id,
      (SELECT json_group_array(json_object(
          'step', wanted.step,
          'problem', CASE WHEN got.value IS NULL THEN 'not-recorded'
                          WHEN json_extract(got.value, '$.verdict') IS NULL OR json_extract(got.value, '$.verdict') = 'not-measured' THEN 'not-measured'
                          ELSE 'out-of-tolerance' END,
          'readings', json(coalesce((SELECT json_group_array(json_extract(reading.value, '$.label')) FROM json_each(json_extract(got.value, '$.readings')) AS reading
                       WHERE json_extract(reading.value, '$.verdict') = 'out-of-tolerance'), '[]'))))
       FROM (SELECT 'sync' AS step, 1 AS n UNION ALL SELECT 'ramp', 2 UNION ALL SELECT 'trim', 3 UNION ALL SELECT 'transfer', 4 UNION ALL SELECT 'limits', 5) AS wanted
       LEFT JOIN json_each(s.steps_json) AS got ON json_extract(got.value, '$.step') = wanted.step
       WHERE got.value IS NULL OR coalesce(json_extract(got.value, '$.verdict'), '') NOT IN ('in-tolerance', 'marginal')
       ORDER BY wanted.n)
    FROM sessions s
    WHERE s.status = 'closed' AND json_valid(s.steps_json)
      AND EXISTS (SELECT 1 FROM json_each(s.steps_json) AS step WHERE json_extract(step.value, '$.step') = 'sign-off');
  UPDATE sessions SET
    sign_off = CASE WHEN (SELECT json_array_length(exceptions) FROM signed_before b WHERE b.id = sessions.id) = 0 THEN 'signed-off' ELSE 'signed-off-with-exceptions' END,
    sign_off_reason = CASE WHEN (SELECT json_array_length(exceptions) FROM signed_before b WHERE b.id = sessions.id) = 0 THEN NULL
      ELSE 'No reason was written: this session was signed off before Rampwright checked the steps at sign-off; the exceptions were found from its recorded steps when the logbook was upgraded.' END,
    sign_off_exceptions_json = CASE WHEN (SELECT json_array_length(exceptions) FROM signed_before b WHERE b.id = sessions.id) = 0 THEN NULL
      ELSE (SELECT exceptions FROM signed_before b WHERE b.id = sessions.id) END,
    content_sha256 = NULL
  WHERE id IN (SELECT id FROM signed_before);
  DROP TABLE signed_before;
  `,
];

export const latestSchemaVersion = migrations.length;
