//! Element symbols a SMARTS text may name, with their atomic numbers.
//!
//! The SMARTS reader needs only symbol → number; the chemistry about each element lives in
//! `chem::elements`. The order is the periodic table's (IUPAC), so the atomic number is the
//! index. Symbols past lawrencium are left out on purpose: `[Nh]` must read as "aliphatic N
//! with an implicit hydrogen", as RDKit reads it, not as nihonium.

const SYMBOLS: [&str; 104] = [
    "", "H", "He", "Li", "Be", "B", "C", "N", "O", "F", "Ne", "Na", "Mg", "Al", "Si", "P", "S",
    "Cl", "Ar", "K", "Ca", "Sc", "Ti", "V", "Cr", "Mn", "Fe", "Co", "Ni", "Cu", "Zn", "Ga", "Ge",
    "As", "Se", "Br", "Kr", "Rb", "Sr", "Y", "Zr", "Nb", "Mo", "Tc", "Ru", "Rh", "Pd", "Ag", "Cd",
    "In", "Sn", "Sb", "Te", "I", "Xe", "Cs", "Ba", "La", "Ce", "Pr", "Nd", "Pm", "Sm", "Eu", "Gd",
    "Tb", "Dy", "Ho", "Er", "Tm", "Yb", "Lu", "Hf", "Ta", "W", "Re", "Os", "Ir", "Pt", "Au", "Hg",
    "Tl", "Pb", "Bi", "Po", "At", "Rn", "Fr", "Ra", "Ac", "Th", "Pa", "U", "Np", "Pu", "Am", "Cm",
    "Bk", "Cf", "Es", "Fm", "Md", "No", "Lr",
];

/// Atomic number of an element symbol written with its usual capitalisation (`"Cl"`).
pub fn atomic_number(symbol: &str) -> Option<u8> {
    SYMBOLS
        .iter()
        .position(|&s| !s.is_empty() && s == symbol)
        .map(|n| n as u8)
}

/// Lower-case symbols SMARTS accepts for aromatic atoms (Daylight's list plus RDKit's `te`).
pub fn aromatic_number(symbol: &str) -> Option<u8> {
    match symbol {
        "b" => Some(5),
        "c" => Some(6),
        "n" => Some(7),
        "o" => Some(8),
        "p" => Some(15),
        "s" => Some(16),
        "as" => Some(33),
        "se" => Some(34),
        "te" => Some(52),
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_follow_the_periodic_table() {
        assert_eq!(atomic_number("H"), Some(1));
        assert_eq!(atomic_number("C"), Some(6));
        assert_eq!(atomic_number("Cl"), Some(17));
        assert_eq!(atomic_number("Na"), Some(11));
        assert_eq!(atomic_number("Hg"), Some(80));
        assert_eq!(atomic_number("U"), Some(92));
        assert_eq!(atomic_number("Lr"), Some(103));
        assert_eq!(atomic_number("Nh"), None);
        assert_eq!(atomic_number("cl"), None);
        assert_eq!(atomic_number(""), None);
    }

    #[test]
    fn aromatic_symbols() {
        assert_eq!(aromatic_number("c"), Some(6));
        assert_eq!(aromatic_number("se"), Some(34));
        assert_eq!(aromatic_number("C"), None);
    }
}
