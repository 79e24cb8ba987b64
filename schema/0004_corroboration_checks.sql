-- satline schema, version 3: corroboration checks. A check records that one stored record
-- (a solubility dataset, a freezing table or a Henry's-law record) was compared with
-- something outside it: which reference, how, the figures of the comparison, the tolerance
-- and the verdict. A check never changes a record's review state: `reviewed` still means a
-- person compared the printed source.
--
-- The subject is named by its full key and kind rather than by a foreign key, because it
-- may live in one of three tables; `satline check` reports a check whose subject is gone.

CREATE TABLE checks (
    key             TEXT PRIMARY KEY NOT NULL,   -- "<subject key>/<check key>"
    solute          TEXT NOT NULL REFERENCES solutes(id),
    subject_kind    TEXT NOT NULL CHECK (subject_kind IN ('dataset', 'freezing', 'henry')),
    subject         TEXT NOT NULL,               -- full key of the checked record
    kind            TEXT NOT NULL,               -- heat-sign, continuity, second-source, ice-line, ...
    reference       TEXT NOT NULL,               -- the outside reference compared with
    other           TEXT,                        -- another stored record compared with, if any
    method          TEXT NOT NULL,               -- how the comparison was made
    temperature_k   REAL CHECK (temperature_k IS NULL OR temperature_k > 0),
    figure          REAL,                        -- the reference's figure
    satline_figure  REAL,                        -- satline's figure, as computed when checked
    unit            TEXT,                        -- unit of both figures
    tolerance       REAL CHECK (tolerance IS NULL OR tolerance >= 0),
    tolerance_unit  TEXT,
    verdict         TEXT NOT NULL CHECK (verdict IN ('pass', 'fail', 'not-applicable')),
    explanation     TEXT,                        -- why a check fails or does not apply
    tool            TEXT,                        -- what ran the check, with versions
    CHECK (verdict <> 'not-applicable' OR explanation IS NOT NULL)
);

CREATE INDEX checks_by_subject ON checks (subject);
CREATE INDEX checks_by_solute ON checks (solute);
