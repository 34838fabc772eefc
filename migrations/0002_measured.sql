-- Measured pKa values: one row per constant, looked up by the canonical structure key
-- (src/chem/canon.rs) of the compound's neutral parent.

-- Built-in handbook values, refreshed from data/measured.csv whenever the program's data
-- version changes (rows are rewritten wholesale; nothing else refers to them).
CREATE TABLE builtin_measured (
    id          INTEGER PRIMARY KEY,
    name        TEXT NOT NULL,
    smiles      TEXT NOT NULL,
    key         TEXT NOT NULL,
    kind        TEXT NOT NULL CHECK (kind IN ('acid', 'base')),
    pka         REAL NOT NULL,
    temperature REAL NOT NULL,
    source      TEXT NOT NULL
);
CREATE INDEX builtin_measured_by_key ON builtin_measured (key);

-- The user's own values (`phdose db add|import`). Upgrades never rewrite these rows; only the
-- derived `key` column is recomputed from `smiles` if a newer program keys structures
-- differently.
CREATE TABLE user_measured (
    id     INTEGER PRIMARY KEY AUTOINCREMENT,
    key    TEXT NOT NULL,
    smiles TEXT NOT NULL,
    kind   TEXT NOT NULL CHECK (kind IN ('acid', 'base')),
    pka    REAL NOT NULL,
    note   TEXT NOT NULL DEFAULT '',
    added  TEXT NOT NULL DEFAULT (date('now'))
);
CREATE INDEX user_measured_by_key ON user_measured (key);
