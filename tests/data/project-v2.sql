-- A project file as schema version 2 wrote it (frozen: never edit).
-- test-project.c loads it and checks that opening upgrades it to the
-- current version with every row kept.  Version 1's tables and rows are
-- those of project-v1.sql; version 2's statements are migration_to_2 of
-- src/core/schema.c, verbatim.
PRAGMA application_id = 1397507922;
PRAGMA user_version = 2;
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
