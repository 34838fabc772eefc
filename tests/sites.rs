//! Site finding with the built-in group table: which atoms titrate, as what, and that the
//! spelling of a structure (Kekulé or aromatic, salt or charged form) does not change the answer.
//! Expected site kinds and the nearby handbook values are named per case.

use phdose::acidity::{Handbook, Kind, Profile};

fn profile(smiles: &str) -> Profile {
    Profile::new(smiles, &Handbook::builtin().unwrap()).unwrap_or_else(|e| panic!("{smiles}: {e}"))
}

/// SMILES, expected sites as (atom, kind), measured pKa of the main site, and its source.
type Case = (&'static str, &'static [(usize, Kind)], f64, &'static str);

const CASES: &[Case] = &[
    (
        "CC(=O)O",
        &[(3, Kind::Acid)],
        4.76,
        "acetic acid; Serjeant & Dempsey 1979 (from memory)",
    ),
    (
        "OC(=O)c1ccccc1",
        &[(0, Kind::Acid)],
        4.20,
        "benzoic acid; Serjeant & Dempsey 1979 (from memory)",
    ),
    (
        "Oc1ccccc1",
        &[(0, Kind::Acid)],
        9.99,
        "phenol; Serjeant & Dempsey 1979 (from memory)",
    ),
    (
        "CCS",
        &[(2, Kind::Acid)],
        10.6,
        "ethanethiol; Serjeant & Dempsey 1979 (from memory)",
    ),
    (
        "CS(=O)(=O)O",
        &[(4, Kind::Acid)],
        -1.9,
        "methanesulfonic acid (from memory)",
    ),
    (
        "NS(=O)(=O)c1ccccc1",
        &[(0, Kind::Acid)],
        10.1,
        "benzenesulfonamide (from memory)",
    ),
    (
        "O=C1CCC(=O)N1",
        &[(6, Kind::Acid)],
        9.62,
        "succinimide (from memory)",
    ),
    (
        "CCN",
        &[(2, Kind::Base)],
        10.65,
        "ethylamine; Perrin 1965 (from memory)",
    ),
    (
        "CCNCC",
        &[(2, Kind::Base)],
        11.0,
        "diethylamine; Perrin 1965 (from memory)",
    ),
    (
        "CCN(CC)CC",
        &[(2, Kind::Base)],
        10.75,
        "triethylamine; Perrin 1965 (from memory)",
    ),
    (
        "Nc1ccccc1",
        &[(0, Kind::Base)],
        4.60,
        "aniline; Perrin 1965 (from memory)",
    ),
    (
        "CNc1ccccc1",
        &[(1, Kind::Base)],
        4.85,
        "N-methylaniline; Perrin 1965 (from memory)",
    ),
    (
        "c1ccncc1",
        &[(3, Kind::Base)],
        5.23,
        "pyridine; Perrin 1965 (from memory)",
    ),
    (
        "c1c[nH]cn1",
        &[(4, Kind::Base)],
        6.99,
        "imidazole; Perrin 1965 (from memory)",
    ),
    (
        "CC(=N)N",
        &[(2, Kind::Base)],
        12.4,
        "acetamidine; Perrin 1965 (from memory)",
    ),
    (
        "NC(=N)N",
        &[(2, Kind::Base)],
        13.6,
        "guanidine; Perrin 1965 (from memory)",
    ),
    (
        "C1COCCN1",
        &[(5, Kind::Base)],
        8.36,
        "morpholine; Perrin 1965 (from memory)",
    ),
    (
        "CN(C)c1ccncc1",
        &[(6, Kind::Base)],
        9.6,
        "4-dimethylaminopyridine; Perrin 1965 (from memory)",
    ),
    // Groups that do not titrate in water are never sites (common practice).
    (
        "CC(=O)NC",
        &[],
        f64::NAN,
        "N-methylacetamide: amides do not titrate in water (common practice)",
    ),
    (
        "CCO",
        &[],
        f64::NAN,
        "ethanol, pKa about 16 (common practice)",
    ),
    ("CC#N", &[], f64::NAN, "acetonitrile (common practice)"),
    ("CCOCC", &[], f64::NAN, "diethyl ether (common practice)"),
];

#[test]
fn the_group_table_finds_the_handbook_sites() {
    for &(smiles, expected, measured, source) in CASES {
        let p = profile(smiles);
        let found: Vec<(usize, Kind)> = p.sites.iter().map(|s| (s.atom, s.kind)).collect();
        assert_eq!(found, expected, "{smiles} ({source})");
        if let Some(site) = p.sites.first() {
            // The typical value need not equal this compound's, but the compound must lie
            // inside the reported range.
            assert!(
                site.pka_low <= measured && measured <= site.pka_high,
                "{smiles}: {measured} ({source}) outside {}..{}",
                site.pka_low,
                site.pka_high
            );
        }
    }
}

#[test]
fn kekule_and_aromatic_spellings_give_the_same_sites() {
    for (kekule, aromatic) in [
        ("OC1=CC=CC=C1", "Oc1ccccc1"),
        ("OC(=O)C1=CC=C(Cl)C=C1", "OC(=O)c1ccc(Cl)cc1"),
        ("C1=CC=NC=C1", "c1ccncc1"),
        ("CN(C)C1=CC=NC=C1", "CN(C)c1ccncc1"),
        ("C1=CNC=N1", "c1c[nH]cn1"),
    ] {
        let a = profile(kekule).sites;
        let b = profile(aromatic).sites;
        assert_eq!(a, b, "{kekule} vs {aromatic}");
        assert!(!a.is_empty());
    }
}

#[test]
fn salts_and_charged_spellings_have_the_parent_sites() {
    // Triethylamine hydrochloride: the amine and one equivalent of strong acid.
    let salt = profile("CCN(CC)CC.Cl");
    assert_eq!(salt.sites.len(), 1);
    assert_eq!(salt.sites[0].kind, Kind::Base);
    assert_eq!(
        (salt.compound.strong_anions, salt.compound.strong_cations),
        (1.0, 0.0)
    );
    // Sodium acetate: acetic acid and one equivalent of strong base.
    let acetate = profile("CC(=O)[O-].[Na+]");
    assert_eq!(acetate.sites[0].kind, Kind::Acid);
    assert_eq!(
        (
            acetate.compound.strong_anions,
            acetate.compound.strong_cations
        ),
        (0.0, 1.0)
    );
    // A lone ethylammonium ion is taken as its chloride.
    let ion = profile("CC[NH3+]");
    assert_eq!(ion.sites[0].kind, Kind::Base);
    assert_eq!(ion.compound.strong_anions, 1.0);
    // Glycine written as the zwitterion has the same sites as the neutral spelling.
    assert_eq!(profile("[NH3+]CC(=O)[O-]").sites, profile("NCC(=O)O").sites);
    // A quaternary ammonium keeps its charge: no site, permanent +1, balanced by its chloride.
    let quat = profile("C[N+](C)(C)C.[Cl-]");
    assert!(quat.sites.is_empty());
    assert_eq!(quat.compound.parents[0].permanent_charge, 1);
    // A nitro group is not a charge to neutralize.
    assert_eq!(
        profile("C[N+](=O)[O-]").compound.parents[0].permanent_charge,
        0
    );
}
