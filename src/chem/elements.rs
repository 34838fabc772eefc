//! The periodic table as phdose needs it: atomic number, symbol, standard atomic weight, the
//! default valences of the SMILES organic subset, and the masses of common isotope labels.
//!
//! The numbers live in `data/elements.csv` and `data/isotopes.csv` (each row names its source)
//! and are read once, on first use.

use std::sync::OnceLock;

/// One element row of `data/elements.csv`.
#[derive(Debug, Clone, PartialEq)]
pub struct Element {
    pub number: u8,
    pub symbol: String,
    /// Standard atomic weight in g/mol.
    pub weight: f64,
    /// Default valences, lowest first (empty for elements outside the organic subset).
    pub valences: Vec<u8>,
}

struct Table {
    elements: Vec<Element>,
    /// (atomic number, mass number, isotopic mass in u).
    isotopes: Vec<(u8, u16, f64)>,
}

const ELEMENTS_CSV: &str = include_str!("../../data/elements.csv");
const ISOTOPES_CSV: &str = include_str!("../../data/isotopes.csv");

fn reader(text: &str) -> csv::Reader<&[u8]> {
    csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(text.as_bytes())
}

/// Reads the built-in tables. They are compiled in, so a row that does not parse is a bug in
/// phdose; the unit tests below read every row.
fn load() -> Table {
    let mut elements = Vec::new();
    for record in reader(ELEMENTS_CSV).records() {
        let r = record.expect("data/elements.csv is well formed");
        let valences = r[3]
            .split(';')
            .filter(|v| !v.is_empty())
            .map(|v| v.parse().expect("valence is a small integer"))
            .collect();
        elements.push(Element {
            number: r[0].parse().expect("atomic number"),
            symbol: r[1].to_string(),
            weight: r[2].parse().expect("atomic weight"),
            valences,
        });
    }
    let mut isotopes = Vec::new();
    for record in reader(ISOTOPES_CSV).records() {
        let r = record.expect("data/isotopes.csv is well formed");
        let number = elements
            .iter()
            .find(|e| e.symbol == r[0])
            .map(|e| e.number)
            .expect("isotope of a listed element");
        isotopes.push((
            number,
            r[1].parse().expect("mass number"),
            r[2].parse().expect("isotopic mass"),
        ));
    }
    Table { elements, isotopes }
}

fn table() -> &'static Table {
    static TABLE: OnceLock<Table> = OnceLock::new();
    TABLE.get_or_init(load)
}

/// The element with this symbol (`"C"`, `"Cl"`; case-sensitive).
pub fn by_symbol(symbol: &str) -> Option<&'static Element> {
    table().elements.iter().find(|e| e.symbol == symbol)
}

/// The element with this atomic number.
pub fn by_number(number: u8) -> Option<&'static Element> {
    table().elements.iter().find(|e| e.number == number)
}

/// Mass in u of one atom of the isotope, when the label is in `data/isotopes.csv`.
pub fn isotope_mass(number: u8, mass_number: u16) -> Option<f64> {
    table()
        .isotopes
        .iter()
        .find(|&&(z, a, _)| z == number && a == mass_number)
        .map(|&(_, _, m)| m)
}

/// Mass of one atom in g/mol: the isotope's mass for a listed label, otherwise the standard
/// atomic weight (an unlisted label such as `[36S]` falls back to the standard weight rather
/// than guess). `None` for `*` and unknown numbers.
pub fn atom_mass(number: u8, isotope: Option<u16>) -> Option<f64> {
    if let Some(mass) = isotope.and_then(|a| isotope_mass(number, a)) {
        return Some(mass);
    }
    by_number(number).map(|e| e.weight)
}

/// Default valences of the atom's isoelectronic neutral counterpart: a charge shifts an atom
/// along its period (N+ behaves like C, C- like N, O+ like N), the usual SMILES convention.
pub fn valences_with_charge(number: u8, charge: i8) -> &'static [u8] {
    let shifted = number as i16 - charge as i16;
    // Only shift within the same period's p-block; otherwise there is no default valence.
    if shifted <= 0 || !same_period(number as i16, shifted) {
        return &[];
    }
    by_number(shifted as u8).map_or(&[], |e| e.valences.as_slice())
}

fn same_period(a: i16, b: i16) -> bool {
    // Period boundaries (last element of each period), a fact of the periodic table.
    const ENDS: [i16; 7] = [2, 10, 18, 36, 54, 86, 118];
    let period = |z: i16| ENDS.iter().position(|&end| z <= end);
    period(a) == period(b)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_row_loads_in_order() {
        let t = table();
        assert!(t.elements.len() >= 86);
        for (i, e) in t.elements.iter().enumerate() {
            assert_eq!(e.number as usize, i + 1, "row {} out of order", e.symbol);
            assert!(e.weight > 0.9 * e.number as f64, "{} weight", e.symbol);
        }
        assert!(t.isotopes.len() >= 11);
    }

    #[test]
    fn symbols_and_weights() {
        assert_eq!(by_symbol("C").unwrap().number, 6);
        assert_eq!(by_symbol("Cl").unwrap().number, 17);
        assert_eq!(by_number(53).unwrap().symbol, "I");
        assert!(by_symbol("Xx").is_none());
        // Weights are those of data/elements.csv (RDKit's table).
        assert_eq!(by_symbol("O").unwrap().weight, 15.999);
    }

    #[test]
    fn isotope_masses_and_fallback() {
        // Deuterium is heavier than protium by about one neutron mass (common practice).
        let d = atom_mass(1, Some(2)).unwrap();
        assert!((d - 2.0141).abs() < 1e-3);
        // An unlisted label falls back to the standard weight.
        assert_eq!(atom_mass(16, Some(36)), Some(by_number(16).unwrap().weight));
        assert_eq!(atom_mass(0, None), None);
    }

    #[test]
    fn charged_atoms_take_isoelectronic_valences() {
        assert_eq!(valences_with_charge(7, 1), &[4]); // N+ like C
        assert_eq!(valences_with_charge(6, -1), &[3, 5]); // C- like N
        assert_eq!(valences_with_charge(8, 1), &[3, 5]); // O+ like N
        assert_eq!(valences_with_charge(7, -1), &[2]); // N- like O
        assert!(valences_with_charge(9, -1).is_empty()); // F- like Ne: none
        assert!(valences_with_charge(11, 1).is_empty()); // Na+ would cross a period
    }
}
