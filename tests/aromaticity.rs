//! Aromaticity perception checked against RDKit: tests/reference/aromaticity.csv lists, for
//! each SMILES, the atoms RDKit (default model) calls aromatic. The fixture is written by
//! tests/reference/make_aromaticity_fixture.py, which records RDKit's version in its header.

use phdose::chem::molecule::Molecule;

const FIXTURE: &str = include_str!("reference/aromaticity.csv");

#[test]
fn aromatic_atoms_match_rdkit() {
    let mut reader = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(FIXTURE.as_bytes());
    let mut rows = 0;
    let mut wrong = Vec::new();
    for record in reader.records() {
        let r = record.unwrap();
        let (name, smiles) = (&r[0], &r[1]);
        let expected: Vec<usize> = r[2]
            .split_whitespace()
            .map(|i| i.parse().unwrap())
            .collect();
        let mol = Molecule::from_smiles(smiles)
            .unwrap_or_else(|e| panic!("{name} ({smiles}) does not parse: {e}"));
        let found: Vec<usize> = (0..mol.atoms.len())
            .filter(|&i| mol.atoms[i].aromatic)
            .collect();
        if found != expected {
            wrong.push(format!(
                "{name} {smiles}: RDKit {expected:?}, phdose {found:?}"
            ));
        }
        rows += 1;
    }
    assert!(rows >= 60, "fixture has only {rows} rows");
    assert!(
        wrong.is_empty(),
        "{} mismatches:\n{}",
        wrong.len(),
        wrong.join("\n")
    );
}

/// Atoms without their text positions, which differ between spellings.
fn atoms(mol: &Molecule) -> Vec<(u8, i8, u8, bool, Option<u16>)> {
    mol.atoms
        .iter()
        .map(|a| (a.element, a.charge, a.hydrogens(), a.aromatic, a.isotope))
        .collect()
}

#[test]
fn kekule_and_aromatic_spellings_give_the_same_molecule() {
    // Pairs of spellings of one structure with the same atom order.
    let pairs = [
        ("C1=CC=CC=C1O", "c1ccccc1O"),
        ("OC1=CC=CC=C1", "Oc1ccccc1"),
        ("C1=CC=C2C=CC=CC2=C1", "c1ccc2ccccc2c1"),
        ("C1=CC=NC=C1", "c1ccncc1"),
        ("C1=CC=CN1", "c1ccc[nH]1"),
        ("O=C1C=CC=CN1", "O=c1cccc[nH]1"),
        ("CN1C(=O)C2=C(N=CN2C)N(C)C1=O", "Cn1c(=O)c2c(ncn2C)n(C)c1=O"),
        ("[O-][N+]1=CC=CC=C1", "[O-][n+]1ccccc1"),
        ("C1=CC2=CC=CC=CC2=C1", "c1cc2cccccc2c1"),
    ];
    for (kekule, aromatic) in pairs {
        let k = Molecule::from_smiles(kekule).unwrap();
        let a = Molecule::from_smiles(aromatic).unwrap();
        assert_eq!(atoms(&k), atoms(&a), "{kekule} vs {aromatic}");
        assert_eq!(k.bonds, a.bonds, "{kekule} vs {aromatic}");
        assert_eq!(k.adjacency, a.adjacency, "{kekule} vs {aromatic}");
        assert_eq!(k.rings, a.rings, "{kekule} vs {aromatic}");
    }
}
