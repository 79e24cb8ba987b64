-- satline schema: thermochemical tables for heats of solution, the enthalpy cycle and the
-- temperature of a dissolving batch. Independent of other migrations: two new tables.

CREATE TABLE thermo_values (
    id          INTEGER PRIMARY KEY,
    file        TEXT NOT NULL,
    quantity    TEXT NOT NULL CHECK (quantity IN ('formation', 'hydration', 'radius', 'ionisation', 'electron-affinity')),
    state       TEXT CHECK (state IN ('cr', 'aq', 'g', 'l')),
    stage       INTEGER CHECK (stage BETWEEN 1 AND 8),
    species     TEXT NOT NULL,
    value       REAL NOT NULL,
    unit        TEXT NOT NULL,
    source      TEXT NOT NULL REFERENCES sources (key),
    provenance  TEXT NOT NULL CHECK (provenance IN ('measured', 'compiled', 'from-memory', 'derived')),
    review      TEXT NOT NULL CHECK (review IN ('unreviewed', 'reviewed', 'rejected')),
    note        TEXT,
    UNIQUE (quantity, state, stage, species, source)
);

CREATE INDEX thermo_values_by_species ON thermo_values (species);

CREATE TABLE laliberte_heat_capacity (
    solute      TEXT PRIMARY KEY NOT NULL,
    file        TEXT NOT NULL,
    a1          REAL NOT NULL,
    a2          REAL NOT NULL,
    a3          REAL NOT NULL,
    a4          REAL NOT NULL,
    a5          REAL NOT NULL,
    a6          REAL NOT NULL,
    t_min_c     REAL NOT NULL,
    t_max_c     REAL NOT NULL,
    w_max       REAL NOT NULL,
    source      TEXT NOT NULL REFERENCES sources (key),
    provenance  TEXT NOT NULL CHECK (provenance IN ('measured', 'compiled', 'from-memory', 'derived')),
    review      TEXT NOT NULL CHECK (review IN ('unreviewed', 'reviewed', 'rejected')),
    note        TEXT
);
