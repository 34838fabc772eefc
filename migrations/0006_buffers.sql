-- Built-in buffer systems and the forms they are sold in, refreshed from data/buffers.csv and
-- data/buffer_forms.csv whenever the program's data version changes. Columns follow the CSV
-- files; `position` keeps the file order (within a system, the order of preference of forms).
CREATE TABLE builtin_buffers (
    position   INTEGER PRIMARY KEY,
    name       TEXT NOT NULL UNIQUE,
    aliases    TEXT,
    label      TEXT NOT NULL,
    species    TEXT NOT NULL,
    charges    TEXT NOT NULL,
    pkas       TEXT NOT NULL,
    dh_kj_mol  TEXT,
    source     TEXT NOT NULL
);

CREATE TABLE builtin_buffer_forms (
    position          INTEGER PRIMARY KEY,
    system            TEXT NOT NULL REFERENCES builtin_buffers (name),
    name              TEXT NOT NULL,
    label             TEXT NOT NULL,
    formula           TEXT NOT NULL,
    hydrate_water     REAL NOT NULL,
    molar_mass_g_mol  REAL NOT NULL,
    units             REAL NOT NULL,
    strong_cations    REAL NOT NULL,
    strong_anions     REAL NOT NULL,
    percent_w_w       REAL,
    density_g_ml      REAL,
    solubility_g_100g REAL,
    solubility_t_c    REAL,
    titrate_with      TEXT,
    source            TEXT NOT NULL,
    UNIQUE (system, name)
);
