-- sigma* of a substituent as an ammonium ion feels it, where the acid-derived sigma* falls
-- short (CH2CF3, CH2CN), refreshed from data/substituents.csv.
ALTER TABLE builtin_substituents ADD COLUMN sigma_star_ammonium REAL;
