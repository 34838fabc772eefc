-- Built-in reagents and the stock forms they are offered in, refreshed from data/reagents.csv
-- and data/reagent_stocks.csv whenever the program's data version changes. Columns follow
-- the CSV files; `position` keeps the file order.
CREATE TABLE builtin_reagents (
    position          INTEGER PRIMARY KEY,
    name              TEXT NOT NULL UNIQUE,
    formula           TEXT NOT NULL,
    molar_mass_g_mol  REAL NOT NULL,
    role              TEXT NOT NULL CHECK (role IN ('acid', 'base')),
    mildness          INTEGER NOT NULL,
    strong_cations    REAL NOT NULL,
    strong_anions     REAL NOT NULL,
    carbonate         REAL NOT NULL,
    system            TEXT,
    top_charge        INTEGER,
    pkas              TEXT,
    dh_kj_mol         TEXT,
    solubility_g_100g REAL,
    hazards           TEXT NOT NULL,
    source            TEXT NOT NULL
);

CREATE TABLE builtin_reagent_stocks (
    position     INTEGER PRIMARY KEY,
    reagent      TEXT NOT NULL REFERENCES builtin_reagents (name),
    form         TEXT NOT NULL,
    molar        REAL,
    percent_w_w  REAL,
    density_g_ml REAL,
    source       TEXT NOT NULL,
    UNIQUE (reagent, form)
);
