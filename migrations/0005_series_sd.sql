-- Standard deviation of each linear free-energy series' equation (pK units), refreshed from
-- data/series.csv: the method's own share of a corrected estimate's reported range.
ALTER TABLE builtin_series ADD COLUMN sd REAL;
