//! SMARTS matching checked against RDKit: every (molecule, pattern) pair in
//! tests/reference/smarts_matches.json, written by tests/reference/make_smarts_fixture.py with
//! RDKit (version recorded in the file), must give exactly RDKit's list of unique matches.
//! All failing pairs are listed before the test fails.
//!
//! "The same" means: the same atom sets (RDKit's default uniquify keeps one embedding per set
//! of atoms), and every tuple RDKit reports is an embedding phdose accepts too. Which of several
//! embeddings of one atom set is reported depends on the search order: phdose keeps the
//! lexicographically first, RDKit the first its search meets; the count of such pairs is printed.

use phdose::chem::molecule::Molecule;
use phdose::chem::smarts::{Pattern, Target};
use serde_json::Value;

/// Pairs where the molecule, not the matcher, differs from RDKit. RDKit's ring information is
/// the symmetrized SSSR (adamantane: all 4 six-membered rings; cubane: all 6 four-membered
/// rings), `Molecule::rings` the plain SSSR (3 and 5 rings), so `R<n>` counts differ on these
/// cage molecules. Each entry must still fail; once it agrees, the test asks to remove it.
const KNOWN_MOLECULE_SIDE: &[(&str, &str)] = &[
    ("C1C2CC3CC1CC(C2)C3", "[R1]"),
    ("C1C2CC3CC1CC(C2)C3", "[R2]"),
    ("C1C2CC3CC1CC(C2)C3", "[R3]"),
    ("C12C3C4C1C5C2C3C45", "[R2]"),
    ("C12C3C4C1C5C2C3C45", "[R3]"),
];

const FIXTURE: &str = include_str!("reference/smarts_matches.json");

fn as_matches(v: &Value) -> Vec<Vec<usize>> {
    v.as_array()
        .expect("list of matches")
        .iter()
        .map(|m| {
            m.as_array()
                .expect("match")
                .iter()
                .map(|i| i.as_u64().expect("atom index") as usize)
                .collect()
        })
        .collect()
}

fn atom_sets(matches: &[Vec<usize>]) -> Vec<Vec<usize>> {
    let mut sets: Vec<Vec<usize>> = matches
        .iter()
        .map(|m| {
            let mut s = m.clone();
            s.sort_unstable();
            s
        })
        .collect();
    sets.sort();
    sets
}

#[test]
fn matches_agree_with_rdkit() {
    let fixture: Value = serde_json::from_str(FIXTURE).expect("fixture is JSON");
    let version = fixture["rdkit_version"]
        .as_str()
        .expect("RDKit version recorded");
    let molecules = fixture["molecules"].as_array().expect("molecules");
    let patterns: Vec<(Pattern, String)> = fixture["patterns"]
        .as_array()
        .expect("patterns")
        .iter()
        .map(|p| {
            let text = p["smarts"].as_str().expect("smarts");
            let pattern = Pattern::parse(text).unwrap_or_else(|e| panic!("{e}"));
            (pattern, p["origin"].as_str().unwrap_or("").to_string())
        })
        .collect();
    let expected = fixture["matches_by_molecule"].as_array().expect("matches");
    assert_eq!(expected.len(), molecules.len());

    let mut failures = Vec::new();
    let mut pairs = 0;
    let mut other_order = 0;
    let mut known = Vec::new();
    for (smiles, row) in molecules.iter().zip(expected) {
        let smiles = smiles.as_str().expect("SMILES");
        let row = row.as_array().expect("one list per pattern");
        assert_eq!(row.len(), patterns.len());
        pairs += row.len();
        let mol = match Molecule::from_smiles(smiles) {
            Ok(mol) => mol,
            Err(e) => {
                failures.push(format!(
                    "{smiles}: molecule not read ({} pairs): {e}",
                    row.len()
                ));
                continue;
            }
        };
        let target = Target::new(&mol);
        for ((pattern, origin), want) in patterns.iter().zip(row) {
            let want = {
                let mut w = as_matches(want);
                w.sort();
                w
            };
            let mut got = pattern.matches_in(&target);
            got.sort();
            let rejected: Vec<&Vec<usize>> = want
                .iter()
                .filter(|m| !pattern.is_embedding(&target, m))
                .collect();
            if atom_sets(&got) != atom_sets(&want) || !rejected.is_empty() {
                let key = (smiles, pattern.text());
                if KNOWN_MOLECULE_SIDE.contains(&key) {
                    known.push(key);
                    continue;
                }
                failures.push(format!(
                    "{smiles}  {}  [{origin}]\n    RDKit:  {want:?}\n    phdose: {got:?}\n    \
                     RDKit tuples phdose rejects: {rejected:?}",
                    pattern.text()
                ));
            } else if got != want {
                other_order += 1;
            }
        }
    }
    for entry in KNOWN_MOLECULE_SIDE {
        if !known.contains(entry) {
            failures.push(format!(
                "{} {}: listed in KNOWN_MOLECULE_SIDE but agrees with RDKit now; remove it",
                entry.0, entry.1
            ));
        }
    }
    let failed: usize = failures.len();
    eprintln!(
        "SMARTS vs RDKit {version}: {pairs} pairs, {failed} failing entries, \
         {other_order} pairs agreeing with another embedding of the same atom set kept, \
         {} known molecule-side differences (symmetrized SSSR)",
        known.len()
    );
    for f in &failures {
        eprintln!("{f}");
    }
    assert!(pairs >= 400, "the fixture holds at least 400 pairs");
    assert!(
        failures.is_empty(),
        "{failed} entries differ from RDKit (listed above)"
    );
}
