-- satline schema, version 1: the reference data and its audit history.
-- Every dataset, point and gas constant is tied to a source: NOT NULL plus a foreign key,
-- so a number without a citation cannot be stored.

CREATE TABLE sources (
    key        TEXT PRIMARY KEY NOT NULL,
    kind       TEXT NOT NULL CHECK (kind IN ('handbook', 'compilation', 'paper', 'standard', 'book', 'other')),
    title      TEXT NOT NULL,
    authors    TEXT NOT NULL,
    publisher  TEXT,
    edition    TEXT,
    year       INTEGER,
    locator    TEXT,
    doi        TEXT,
    isbn       TEXT,
    url        TEXT,
    note       TEXT
);

CREATE TABLE solutes (
    id          TEXT PRIMARY KEY NOT NULL,
    name        TEXT NOT NULL,
    formula     TEXT NOT NULL,
    kind        TEXT NOT NULL CHECK (kind IN ('salt', 'molecular', 'gas')),
    molar_mass  REAL NOT NULL CHECK (molar_mass > 0),
    cation      TEXT,
    anion       TEXT,
    ions        INTEGER NOT NULL CHECK (ions >= 1),
    hazard      TEXT
);

-- Synonyms and tags keep the order they were written in (position).
CREATE TABLE solute_synonyms (
    solute    TEXT NOT NULL REFERENCES solutes(id) ON DELETE CASCADE,
    position  INTEGER NOT NULL,
    synonym   TEXT NOT NULL,
    PRIMARY KEY (solute, position)
);

CREATE TABLE solute_tags (
    solute    TEXT NOT NULL REFERENCES solutes(id) ON DELETE CASCADE,
    position  INTEGER NOT NULL,
    tag       TEXT NOT NULL,
    PRIMARY KEY (solute, position)
);

-- The solid in equilibrium with the saturated solution.
CREATE TABLE phases (
    id       INTEGER PRIMARY KEY,
    formula  TEXT NOT NULL,
    name     TEXT NOT NULL,
    water    REAL NOT NULL CHECK (water >= 0),
    UNIQUE (formula, name)
);

CREATE TABLE datasets (
    key               TEXT PRIMARY KEY NOT NULL,
    solute            TEXT NOT NULL REFERENCES solutes(id),
    solvent           TEXT NOT NULL DEFAULT 'water',
    phase             INTEGER NOT NULL REFERENCES phases(id),
    source            TEXT NOT NULL REFERENCES sources(key),
    unit              TEXT NOT NULL,
    temperature_unit  TEXT NOT NULL CHECK (temperature_unit IN ('C', 'K', 'F')),
    provenance        TEXT NOT NULL CHECK (provenance IN ('measured', 'compiled', 'from-memory', 'derived')),
    review            TEXT NOT NULL CHECK (review IN ('unreviewed', 'reviewed', 'rejected')),
    retired           INTEGER NOT NULL DEFAULT 0 CHECK (retired IN (0, 1)),
    note              TEXT,
    -- Where the dataset's solid is the stable phase, as reported and in kelvin (optional).
    stable_low_reported   REAL,
    stable_high_reported  REAL,
    stable_low_k          REAL,
    stable_high_k         REAL,
    CHECK ((stable_low_reported IS NULL) = (stable_high_reported IS NULL))
);

CREATE TABLE points (
    dataset               TEXT NOT NULL REFERENCES datasets(key) ON DELETE CASCADE,
    position              INTEGER NOT NULL,
    temperature_reported  REAL NOT NULL,
    temperature_k         REAL NOT NULL CHECK (temperature_k > 0),
    value_reported        REAL NOT NULL,
    mass_fraction         REAL NOT NULL CHECK (mass_fraction >= 0 AND mass_fraction < 1),
    uncertainty           REAL,
    PRIMARY KEY (dataset, position)
);

-- Henry's-law records. The columns used depend on the form; the CHECKs keep each form whole.
CREATE TABLE gas_constants (
    key                      TEXT PRIMARY KEY NOT NULL,
    solute                   TEXT NOT NULL REFERENCES solutes(id),
    source                   TEXT NOT NULL REFERENCES sources(key),
    form                     TEXT NOT NULL CHECK (form IN ('vant-hoff', 'mole-fraction-fit', 'molality-fit')),
    convention               TEXT,
    value                    REAL,
    reference_temperature_k  REAL,
    temperature_term_k       REAL,
    a                        REAL,
    b                        REAL,
    c                        REAL,
    d                        REAL,
    scale_k                  REAL,
    reference_pressure_pa    REAL,
    t_min_k                  REAL,
    t_max_k                  REAL,
    provenance               TEXT NOT NULL CHECK (provenance IN ('measured', 'compiled', 'from-memory', 'derived')),
    review                   TEXT NOT NULL CHECK (review IN ('unreviewed', 'reviewed', 'rejected')),
    note                     TEXT,
    CHECK (form <> 'vant-hoff' OR (convention IS NOT NULL AND value IS NOT NULL
           AND reference_temperature_k IS NOT NULL AND temperature_term_k IS NOT NULL)),
    CHECK (form NOT IN ('mole-fraction-fit', 'molality-fit') OR (a IS NOT NULL AND b IS NOT NULL AND c IS NOT NULL
           AND d IS NOT NULL AND scale_k IS NOT NULL AND reference_pressure_pa IS NOT NULL
           AND t_min_k IS NOT NULL AND t_max_k IS NOT NULL))
);

-- Tabulated freezing points of a solute's solutions (the ice line).
CREATE TABLE freezing (
    key                          TEXT PRIMARY KEY NOT NULL,
    solute                       TEXT NOT NULL REFERENCES solutes(id),
    source                       TEXT NOT NULL REFERENCES sources(key),
    unit                         TEXT NOT NULL,
    temperature_unit             TEXT NOT NULL CHECK (temperature_unit IN ('C', 'K', 'F')),
    provenance                   TEXT NOT NULL CHECK (provenance IN ('measured', 'compiled', 'from-memory', 'derived')),
    review                       TEXT NOT NULL CHECK (review IN ('unreviewed', 'reviewed', 'rejected')),
    eutectic_composition_reported  REAL,
    eutectic_temperature_reported  REAL,
    eutectic_mass_fraction         REAL,
    eutectic_temperature_k         REAL,
    note                           TEXT,
    CHECK ((eutectic_composition_reported IS NULL) = (eutectic_temperature_reported IS NULL))
);

CREATE TABLE freezing_points (
    freezing              TEXT NOT NULL REFERENCES freezing(key) ON DELETE CASCADE,
    position              INTEGER NOT NULL,
    composition_reported  REAL NOT NULL,
    temperature_reported  REAL NOT NULL,
    mass_fraction         REAL NOT NULL CHECK (mass_fraction >= 0 AND mass_fraction < 1),
    temperature_k         REAL NOT NULL CHECK (temperature_k > 0),
    PRIMARY KEY (freezing, position)
);

-- Every change, in order. before/after are JSON texts (NULL for a creation or a removal).
CREATE TABLE audit (
    id      INTEGER PRIMARY KEY,
    time    TEXT NOT NULL,
    actor   TEXT NOT NULL,
    action  TEXT NOT NULL,
    entity  TEXT NOT NULL,
    before  TEXT,
    after   TEXT
);
