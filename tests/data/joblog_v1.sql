-- A job log as the first released schema (version 1) wrote it: a frozen copy, never
-- edited, used to test the forward migrations. Invented site and runs.
PRAGMA application_id = 1751215206;
CREATE TABLE jobs (
    id          INTEGER PRIMARY KEY,
    site        TEXT NOT NULL,
    date        TEXT NOT NULL,
    notes       TEXT NOT NULL DEFAULT '',
    created_at  TEXT NOT NULL
);
CREATE TABLE entries (
    id          INTEGER PRIMARY KEY,
    job_id      INTEGER NOT NULL REFERENCES jobs(id),
    kind        TEXT NOT NULL,
    inputs      TEXT NOT NULL,
    result      TEXT NOT NULL,
    cable       TEXT,
    label       TEXT NOT NULL DEFAULT '',
    note        TEXT NOT NULL DEFAULT '',
    created_at  TEXT NOT NULL
);
INSERT INTO jobs VALUES (1, 'Quarry Lane repeater hut', '2026-03-14', 'ladder to the roof is on the north side', '2026-03-14T08:02:11+00:00');
INSERT INTO jobs VALUES (2, 'Old mill data room', '2026-03-15', '', '2026-03-15T09:40:00+00:00');
INSERT INTO entries VALUES (1, 1, 'locate', '{"delay": "245 ns", "cable": "rg58"}', '{"distance_m": 24.238, "vf": 0.66}', 'rg58', 'feeder 2', 'reflection near the wall gland', '2026-03-14T08:15:40+00:00');
INSERT INTO entries VALUES (2, 1, 'cut', '{"frequency": "146 MHz", "degrees": "90", "vf": "0.66"}', '{"physical_length_m": 0.3388, "cut_length_m": 0.3588}', NULL, 'phasing line', '', '2026-03-14T09:01:05+00:00');
INSERT INTO entries VALUES (3, 2, 'echo', '{"z0": "50 ohm", "load": "75 ohm"}', '{"gamma_real": 0.2, "gamma_imag": 0.0, "return_loss_db": 13.979, "vswr": 1.5}', NULL, 'patch 14', '', '2026-03-15T10:12:00+00:00');
PRAGMA user_version = 1;
