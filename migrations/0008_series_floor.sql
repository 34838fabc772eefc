-- Lowest sum of sigma* a Taft series takes (the plateau of plain alkyl groups: ammonium ions
-- stop getting more basic with more or larger alkyl groups), refreshed from data/series.csv.
ALTER TABLE builtin_series ADD COLUMN sigma_floor REAL;
