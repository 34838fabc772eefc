-- Para constant of a substituent as a pyridine-type ring N site feels it, where sigma_p falls
-- short (SMe), refreshed from data/substituents.csv.
ALTER TABLE builtin_substituents ADD COLUMN sigma_p_aza REAL;
