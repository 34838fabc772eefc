//! SMARTS patterns: parse and match (to be written).
