-- Substituent constants (Hammett, Taft) and linear free-energy series, refreshed from
-- data/substituents.csv and data/series.csv with the other built-in tables; and the series
-- (with its parent compound) each group row belongs to.
CREATE TABLE builtin_substituents (
    priority    INTEGER PRIMARY KEY,
    name        TEXT NOT NULL UNIQUE,
    smarts      TEXT NOT NULL,
    position    TEXT NOT NULL CHECK (position IN ('attached', 'ring')),
    sigma_m     REAL,
    sigma_p     REAL,
    sigma_minus REAL,
    sigma_o     REAL,
    sigma_star  REAL,
    source      TEXT NOT NULL
);

CREATE TABLE builtin_series (
    name        TEXT PRIMARY KEY,
    constant    TEXT NOT NULL CHECK (constant IN ('hammett', 'taft')),
    rho         REAL NOT NULL,
    base        REAL NOT NULL,
    para        TEXT,
    ortho_shift REAL,
    attenuation REAL,
    source      TEXT NOT NULL
);

ALTER TABLE builtin_groups ADD COLUMN series TEXT;
ALTER TABLE builtin_groups ADD COLUMN parent TEXT;
