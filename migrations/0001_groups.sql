-- Built-in table of ionizable (and deliberately non-ionizable) groups, refreshed from
-- data/groups.csv whenever the program's data version changes. Row order is priority:
-- the first row whose pattern claims an atom decides what that atom is.
CREATE TABLE builtin_groups (
    priority  INTEGER PRIMARY KEY,
    name      TEXT NOT NULL UNIQUE,
    smarts    TEXT NOT NULL,
    site      INTEGER NOT NULL,
    kind      TEXT NOT NULL CHECK (kind IN ('acid', 'base', 'none')),
    pka       REAL,
    pka_low   REAL,
    pka_high  REAL,
    source    TEXT NOT NULL
);

-- Key/value facts about the store itself (the data version of the built-in tables).
CREATE TABLE store_meta (
    key   TEXT PRIMARY KEY,
    value TEXT NOT NULL
);
