-- Standard deviation of each linear free-energy series' equation (pK units), refreshed from
-- data/series.csv: the method's own share of a corrected estimate's reported range. And the
-- ortho constant of a substituent next to a ring aza site (2-substituted pyridinium ions),
-- refreshed from data/substituents.csv.
ALTER TABLE builtin_series ADD COLUMN sd REAL;
ALTER TABLE builtin_substituents ADD COLUMN sigma_o_aza REAL;
