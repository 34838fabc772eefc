-- A Taft series for the groups on a Hammett site's own atom besides its ring (the N-alkyl
-- groups of N-alkylanilinium ions), refreshed from data/series.csv.
ALTER TABLE builtin_series ADD COLUMN side TEXT;
