-- satline schema, version 2: a metadata table (what the database was built from) and the
-- indexes the catalog's reads and the librarian's lookups use.

CREATE TABLE metadata (
    key    TEXT PRIMARY KEY NOT NULL,
    value  TEXT NOT NULL
);

CREATE INDEX datasets_by_solute ON datasets (solute);
CREATE INDEX datasets_by_source ON datasets (source);
CREATE INDEX gas_constants_by_solute ON gas_constants (solute);
CREATE INDEX freezing_by_solute ON freezing (solute);
CREATE INDEX audit_by_entity ON audit (entity);
