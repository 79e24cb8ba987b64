-- satline schema: a density set may be fitted up to the pure solute (w_max = 1), as for a
-- liquid miscible with water (acetic acid). SQLite cannot change a CHECK in place: the
-- table is rebuilt with the same columns and its rows copied.

CREATE TABLE density_coefficients_new (
    solute      TEXT PRIMARY KEY NOT NULL REFERENCES solutes(id),
    source      TEXT NOT NULL REFERENCES sources(key),
    c0          REAL NOT NULL,
    c1          REAL NOT NULL,
    c2          REAL NOT NULL,
    c3          REAL NOT NULL,
    c4          REAL NOT NULL,
    t_min_c     REAL NOT NULL CHECK (t_min_c > -273.15),
    t_max_c     REAL NOT NULL CHECK (t_max_c >= t_min_c),
    w_max       REAL NOT NULL CHECK (w_max > 0 AND w_max <= 1),
    table_name  TEXT,
    cas         TEXT,
    points      INTEGER CHECK (points IS NULL OR points > 0),
    provenance  TEXT NOT NULL CHECK (provenance IN ('measured', 'compiled', 'from-memory', 'derived')),
    review      TEXT NOT NULL CHECK (review IN ('unreviewed', 'reviewed', 'rejected')),
    note        TEXT
);

INSERT INTO density_coefficients_new
    SELECT solute, source, c0, c1, c2, c3, c4, t_min_c, t_max_c, w_max, table_name, cas,
           points, provenance, review, note
    FROM density_coefficients;

DROP TABLE density_coefficients;
ALTER TABLE density_coefficients_new RENAME TO density_coefficients;
CREATE INDEX density_coefficients_by_source ON density_coefficients (source);
