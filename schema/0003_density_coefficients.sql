-- satline schema: solution-density coefficients (Laliberté's model), one set per solute,
-- each with its source and the range of temperature (°C) and mass fraction it was fitted
-- over. Cited, provenanced and reviewed like the solubility data.

CREATE TABLE density_coefficients (
    solute      TEXT PRIMARY KEY NOT NULL REFERENCES solutes(id),
    source      TEXT NOT NULL REFERENCES sources(key),
    c0          REAL NOT NULL,
    c1          REAL NOT NULL,
    c2          REAL NOT NULL,
    c3          REAL NOT NULL,
    c4          REAL NOT NULL,
    t_min_c     REAL NOT NULL CHECK (t_min_c > -273.15),
    t_max_c     REAL NOT NULL CHECK (t_max_c >= t_min_c),
    w_max       REAL NOT NULL CHECK (w_max > 0 AND w_max < 1),
    table_name  TEXT,
    cas         TEXT,
    points      INTEGER CHECK (points IS NULL OR points > 0),
    provenance  TEXT NOT NULL CHECK (provenance IN ('measured', 'compiled', 'from-memory', 'derived')),
    review      TEXT NOT NULL CHECK (review IN ('unreviewed', 'reviewed', 'rejected')),
    note        TEXT
);

CREATE INDEX density_coefficients_by_source ON density_coefficients (source);
