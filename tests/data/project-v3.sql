-- A project file as schema version 3 wrote it (frozen: never edit).
-- test-project.c loads it and checks that opening upgrades it to the
-- current version with every row kept.  Versions 1 and 2's tables and rows
-- are those of project-v2.sql; version 3's statements are migration_to_3
-- of src/core/schema.c, verbatim, with a derivation run, a derived row and
-- a value set by hand (and a cleared one).
PRAGMA application_id = 1397507922;
PRAGMA user_version = 3;
CREATE TABLE sources ( id       INTEGER PRIMARY KEY, name      TEXT NOT NULL, file_name   TEXT NOT NULL, file_path   TEXT NOT NULL, sha256     TEXT NOT NULL, size_bytes   INTEGER NOT NULL, imported_by  TEXT NOT NULL, imported_at  TEXT NOT NULL, delimiter   TEXT NOT NULL, mapping    TEXT NOT NULL, missing_tokens TEXT NOT NULL, epoch     REAL, rows_read   INTEGER NOT NULL DEFAULT 0, rows_accepted INTEGER NOT NULL DEFAULT 0, rows_rejected INTEGER NOT NULL DEFAULT 0) STRICT;
CREATE INDEX sources_by_sha256 ON sources (sha256);
CREATE TABLE stars ( id       INTEGER PRIMARY KEY, designation   TEXT NOT NULL UNIQUE, notes      TEXT NOT NULL DEFAULT '', first_source_id INTEGER NOT NULL REFERENCES sources (id)) STRICT;
CREATE TABLE measurements ( id      INTEGER PRIMARY KEY, star_id   INTEGER NOT NULL REFERENCES stars (id), source_id  INTEGER NOT NULL REFERENCES sources (id), line     INTEGER NOT NULL, ra REAL, ra_err REAL, dec REAL, dec_err REAL, epoch REAL, parallax REAL, parallax_err REAL, pmra REAL, pmra_err REAL, pmdec REAL, pmdec_err REAL, vmag REAL, vmag_err REAL, bmag REAL, bmag_err REAL, bv REAL, bv_err REAL, ebv REAL, ebv_err REAL, vrad REAL, vrad_err REAL, sptype TEXT, UNIQUE (star_id, source_id)) STRICT;
CREATE TABLE rejected_rows ( id     INTEGER PRIMARY KEY, source_id  INTEGER NOT NULL REFERENCES sources (id), line    INTEGER NOT NULL, column_name TEXT, reason   TEXT NOT NULL, raw     BLOB NOT NULL) STRICT;
CREATE INDEX rejected_rows_by_source ON rejected_rows (source_id, line);
CREATE TABLE ledger ( id   INTEGER PRIMARY KEY, at   TEXT NOT NULL, who   TEXT NOT NULL, action TEXT NOT NULL, summary TEXT NOT NULL, details TEXT NOT NULL DEFAULT '{}') STRICT;
CREATE TABLE settings (  key   TEXT PRIMARY KEY,  value TEXT NOT NULL) STRICT;
CREATE TABLE lists (  id          INTEGER PRIMARY KEY,  name        TEXT NOT NULL UNIQUE,  description TEXT NOT NULL DEFAULT '',  condition   TEXT,  created_by  TEXT NOT NULL,  created_at  TEXT NOT NULL) STRICT;
CREATE TABLE list_members (  list_id  INTEGER NOT NULL REFERENCES lists (id) ON DELETE CASCADE,  star_id  INTEGER NOT NULL REFERENCES stars (id),  priority INTEGER NOT NULL DEFAULT 0,  tags     TEXT NOT NULL DEFAULT '',  notes    TEXT NOT NULL DEFAULT '',  PRIMARY KEY (list_id, star_id)) STRICT, WITHOUT ROWID;
CREATE TABLE derivation_runs (  id               INTEGER PRIMARY KEY,  started_at       TEXT NOT NULL,  finished_at      TEXT,  who              TEXT NOT NULL,  software_version TEXT NOT NULL,  parameters       TEXT NOT NULL,  methods          TEXT NOT NULL,  stars            INTEGER NOT NULL DEFAULT 0,  duration_s       REAL) STRICT;
CREATE TABLE derived (  star_id        INTEGER PRIMARY KEY REFERENCES stars (id),  run_id         INTEGER NOT NULL REFERENCES derivation_runs (id),  stale          INTEGER NOT NULL DEFAULT 0,  flags          INTEGER NOT NULL DEFAULT 0,  monte_carlo    INTEGER NOT NULL DEFAULT 0,  m_position INTEGER, m_parallax INTEGER, m_pm INTEGER, m_vmag INTEGER, m_bmag INTEGER,  m_bv INTEGER, m_ebv INTEGER, m_vrad INTEGER, m_sptype INTEGER,  plx_snr REAL, plx_snr_lo REAL, plx_snr_hi REAL,  dist REAL, dist_lo REAL, dist_hi REAL,  distmod REAL, distmod_lo REAL, distmod_hi REAL,  av REAL, av_lo REAL, av_hi REAL,  bv0 REAL, bv0_lo REAL, bv0_hi REAL,  absmag REAL, absmag_lo REAL, absmag_hi REAL,  teff REAL, teff_lo REAL, teff_hi REAL,  bc REAL, bc_lo REAL, bc_hi REAL,  mbol REAL, mbol_lo REAL, mbol_hi REAL,  lum REAL, lum_lo REAL, lum_hi REAL,  radius REAL, radius_lo REAL, radius_hi REAL,  vtan REAL, vtan_lo REAL, vtan_hi REAL,  elon REAL, elon_lo REAL, elon_hi REAL,  elat REAL, elat_lo REAL, elat_hi REAL,  ellipse_a REAL, ellipse_a_lo REAL, ellipse_a_hi REAL,  ellipse_b REAL, ellipse_b_lo REAL, ellipse_b_hi REAL,  ellipse_pa REAL, ellipse_pa_lo REAL, ellipse_pa_hi REAL,  spclass TEXT,  logt_sigma REAL, logl_sigma REAL, logt_logl_corr REAL) STRICT;
CREATE INDEX derived_by_run ON derived (run_id);
CREATE TABLE overrides (  id         INTEGER PRIMARY KEY,  star_id    INTEGER NOT NULL REFERENCES stars (id),  quantity   TEXT NOT NULL,  value      REAL NOT NULL,  lo         REAL,  hi         REAL,  reason     TEXT NOT NULL,  set_by     TEXT NOT NULL,  set_at     TEXT NOT NULL,  cleared_by TEXT,  cleared_at TEXT) STRICT;
CREATE UNIQUE INDEX overrides_active ON overrides (star_id, quantity) WHERE cleared_at IS NULL;
INSERT INTO sources VALUES (1, 'Old reduction', 'old.csv', '/data/old.csv', 'aa11bb22cc33dd44ee55ff66aa11bb22cc33dd44ee55ff66aa11bb22cc33dd44', 120, 'observer', '2026-01-15T09:30:00Z', ',', '[{"field":"id","column":"id","unit":""},{"field":"parallax","column":"parallax","unit":"mas"}]', '["","NaN"]', NULL, 3, 2, 1);
INSERT INTO stars VALUES (1, 'OLD 1', '', 1);
INSERT INTO stars VALUES (2, 'OLD 2', 'bright companion', 1);
INSERT INTO measurements (id, star_id, source_id, line, parallax, parallax_err) VALUES (1, 1, 1, 2, 12.5, 0.3);
INSERT INTO measurements (id, star_id, source_id, line, parallax, parallax_err) VALUES (2, 2, 1, 3, -0.4, 0.6);
INSERT INTO rejected_rows VALUES (1, 1, 4, 'parallax', 'not a number: ''x''', X'4F4C4420332C78');
INSERT INTO ledger VALUES (1, '2026-01-15T09:29:00Z', 'observer', 'create', 'created the project', '{}');
INSERT INTO ledger VALUES (2, '2026-01-15T09:30:00Z', 'observer', 'import', 'imported old.csv: 2 rows accepted, 1 rejected, 2 new stars', '{}');
INSERT INTO settings VALUES ('distance.length_scale_pc', '1350');
INSERT INTO lists VALUES (1, 'Run 2026A', 'Targets for the spring run', 'parallax > 10', 'observer', '2026-01-16T14:00:00Z');
INSERT INTO list_members VALUES (1, 1, 2, 'bright;priority', 'observe twice');
INSERT INTO list_members VALUES (1, 2, 0, '', '');
INSERT INTO derivation_runs VALUES (1, '2026-02-01T10:00:00Z', '2026-02-01T10:00:01Z', 'observer', '0.3', '[derive]
errors=linear
', '{"distance":1}', 2, 0.25);
INSERT INTO derived (star_id, run_id, stale, flags, m_parallax, plx_snr, plx_snr_lo, plx_snr_hi, dist, dist_lo, dist_hi) VALUES (1, 1, 0, 0, 1, 41.6666666666667, NULL, NULL, 80.0, 78.125, 82.0512820512821);
INSERT INTO derived (star_id, run_id, stale, flags, m_parallax) VALUES (2, 1, 1, 4, 2);
INSERT INTO overrides VALUES (1, 2, 'dist', 1500.0, 1400.0, 1600.0, 'cluster membership', 'observer', '2026-02-02T08:00:00Z', NULL, NULL);
INSERT INTO overrides VALUES (2, 1, 'teff', 5800.0, NULL, NULL, 'from a spectrum', 'observer', '2026-02-02T08:05:00Z', 'observer', '2026-02-03T09:00:00Z');
INSERT INTO ledger VALUES (3, '2026-02-01T10:00:01Z', 'observer', 'derive', 'derived 2 stars', '{"run_id":1}');
