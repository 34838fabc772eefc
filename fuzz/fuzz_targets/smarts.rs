//! SMARTS text -> query graph -> matches against a few molecules of different shapes (rings,
//! charges, hydrogens, aromatic heteroatoms). Any panic is a bug; errors are fine.
#![no_main]

use std::sync::OnceLock;

use libfuzzer_sys::fuzz_target;
use phdose::chem::molecule::Molecule;
use phdose::chem::smarts::Pattern;

fn targets() -> &'static [Molecule] {
    static T: OnceLock<Vec<Molecule>> = OnceLock::new();
    T.get_or_init(|| {
        [
            "OC(=O)c1ccc(Cl)cc1",
            "C[N+](C)(C)CC([O-])=O",
            "c1ccc2[nH]ccc2c1",
            "[2H]C([2H])([2H])S(=O)(=O)N",
            "NC(=N)NCCC[C@H](N)C(O)=O.Cl",
        ]
        .iter()
        .map(|s| Molecule::from_smiles(s).expect("fixed SMILES parse"))
        .collect()
    })
}

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    if text.len() > 120 {
        return;
    }
    if let Ok(pattern) = Pattern::parse(text) {
        for mol in targets() {
            let _ = pattern.matches(mol);
        }
    }
});
