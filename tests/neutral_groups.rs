//! Groups that stay neutral in water: ketone, ester, amide and urea O, ethers, alcohols, amide
//! N-H, indole C3. They are recognized with their handbook constant (beyond pH 1-13, measured
//! with acidity functions or in strong base), listed beside the sites and never as sites, so
//! the equilibrium never counts them. Each case names its source; values recalled from the
//! named handbooks are marked "from memory".

mod common;

use common::{json, phdose, stdout};
use phdose::acidity::{Handbook, Kind, Profile};

fn profile(smiles: &str) -> Profile {
    Profile::new(smiles, &Handbook::builtin().unwrap()).unwrap_or_else(|e| panic!("{smiles}: {e}"))
}

/// SMILES, kind, handbook pKa, tolerance, source.
type Case = (&'static str, Kind, f64, f64, &'static str);

const CASES: &[Case] = &[
    (
        "CO",
        Kind::Acid,
        15.5,
        0.5,
        "methanol; Ballinger & Long, J. Am. Chem. Soc. 1960, 82, 795 (from memory)",
    ),
    (
        "OCC(C)C",
        Kind::Acid,
        16.1,
        0.7,
        "2-methylpropan-1-ol about 16.1; Ballinger & Long 1960 (from memory)",
    ),
    (
        "CCOCC",
        Kind::Base,
        -3.6,
        0.8,
        "diethyl ether; Arnett 1963 via Perrin 1965 (from memory)",
    ),
    (
        "C1CCOC1",
        Kind::Base,
        -2.1,
        1.0,
        "tetrahydrofuran; Arnett 1963 via Perrin 1965 (from memory)",
    ),
    (
        "CCOC(C)=O",
        Kind::Base,
        -6.5,
        0.8,
        "ethyl acetate (carbonyl O); Perrin 1965 (from memory)",
    ),
    (
        "CC(N)=O",
        Kind::Base,
        -0.5,
        0.5,
        "acetamide (O-protonation); Perrin 1965 (from memory)",
    ),
    (
        "NC(=O)c1ccccc1",
        Kind::Base,
        -1.8,
        0.6,
        "benzamide (O-protonation); Perrin 1965 (from memory)",
    ),
    (
        "CC(=O)c1ccccc1",
        Kind::Base,
        -6.15,
        0.5,
        "acetophenone; Stewart & Yates 1958 via Perrin 1965 (from memory)",
    ),
    (
        "CCC(C)=O",
        Kind::Base,
        -7.0,
        1.0,
        "butan-2-one about -7 (acetone -7.2); Perrin 1965 (from memory)",
    ),
    (
        "c1ccc2[nH]ccc2c1",
        Kind::Base,
        -3.6,
        0.8,
        "indole (C3 protonation); Hinman & Lang 1964 (from memory)",
    ),
    (
        "CC(N)=O",
        Kind::Acid,
        15.1,
        0.7,
        "acetamide N-H; Serjeant & Dempsey 1979 (from memory)",
    ),
    (
        "c1cn[nH]c1",
        Kind::Acid,
        14.2,
        0.5,
        "pyrazole N-H; Serjeant & Dempsey 1979 (from memory)",
    ),
    (
        "CC(C)(C)O",
        Kind::Acid,
        19.2,
        0.2,
        "tert-butanol; Ballinger & Long, J. Am. Chem. Soc. 1960, 82, 795 (from memory)",
    ),
    (
        "c1ccc2[nH]ncc2c1",
        Kind::Acid,
        13.86,
        0.2,
        "indazole N-H; Serjeant & Dempsey 1979 (from memory)",
    ),
];

#[test]
fn neutral_groups_carry_handbook_constants_and_are_never_sites() {
    for &(smiles, kind, pka, tol, source) in CASES {
        let p = profile(smiles);
        // Pyrazole's and indazole's ring N titrate (pKa 2.5 and 1.3, Perrin 1965); none of the
        // others has a site.
        if !matches!(smiles, "c1cn[nH]c1" | "c1ccc2[nH]ncc2c1") {
            assert!(p.sites.is_empty(), "{smiles}: {:?} ({source})", p.sites);
        }
        let g = p
            .neutral_groups
            .iter()
            .filter(|g| g.kind == kind)
            .min_by(|a, b| (a.pka - pka).abs().total_cmp(&(b.pka - pka).abs()))
            .unwrap_or_else(|| panic!("{smiles}: no neutral {kind:?} group ({source})"));
        assert!(
            (g.pka - pka).abs() <= tol,
            "{smiles}: {} {:.2} vs {pka} ({source})",
            g.group,
            g.pka
        );
        assert!(
            g.pka_low <= pka && pka <= g.pka_high,
            "{smiles}: {pka} outside {:.2}..{:.2} ({source})",
            g.pka_low,
            g.pka_high
        );
    }
}

#[test]
fn a_compound_with_no_site_of_a_kind_reads_by_its_neutral_group() {
    // Acetone: the handbook lists its base constant, about -7.2 (Perrin 1965, from memory).
    let r = profile("CC(C)=O").readings(0);
    let base = r.base.expect("acetone has a base reading");
    assert!((base.pka + 7.2).abs() < 0.5, "{}", base.pka);
    assert!(r.acid.is_none());
    // Ethanolamine keeps its amine as the base and reads as an acid by its OH (about 16,
    // Ballinger & Long 1960, from memory): the titrating site is never replaced.
    let r = profile("NCCO").readings(0);
    assert!((r.base.unwrap().pka - 9.5).abs() < 0.3);
    let acid = r.acid.unwrap();
    assert!(acid.pka > 13.0, "{}", acid.pka);
}

#[test]
fn substituents_move_aryl_ketone_constants_the_hammett_way() {
    // Electron acceptors make the carbonyl O a weaker base, donors a stronger one (positive
    // rho of acetophenone protonation; Stewart & Yates 1958, common practice).
    let value = |smiles: &str| profile(smiles).readings(0).base.unwrap().pka;
    let nitro = value("CC(=O)c1ccc(cc1)[N+](=O)[O-]");
    let parent = value("CC(=O)c1ccccc1");
    let methyl = value("CC(=O)c1ccc(C)cc1");
    assert!(
        nitro < parent && parent < methyl,
        "{nitro} {parent} {methyl}"
    );
}

#[test]
fn neutral_groups_stay_outside_the_workup_range() {
    // What makes a group "neutral in water" is its constant beyond pH 1-13 (common practice);
    // a group whose corrected constant falls inside is a site.
    for smiles in [
        "OCC(F)F",
        "OCC#N",
        "O=C(O)CCO",
        "CC(=O)CC(=O)OC",
        "NC(=O)CC(F)(F)F",
        "OC1CCCCC1",
        "CC(=O)Nc1ccccc1",
        "O=C1CCCCN1",
    ] {
        let p = profile(smiles);
        for g in &p.neutral_groups {
            assert!(
                g.pka < 1.0 || g.pka > 13.0,
                "{smiles}: {} at {:.2} is inside the workup range",
                g.group,
                g.pka
            );
            assert!(p.sites.iter().all(|s| s.atom != g.atom), "{smiles}");
        }
    }
}

#[test]
fn the_cli_lists_neutral_groups_beside_the_sites() {
    let out = phdose("neutral", "json", &["pka", "CC(C)=O", "--format", "json"]);
    let v = json(&out);
    assert_eq!(v[0]["sites"].as_array().unwrap().len(), 0);
    let groups = v[0]["neutral_groups"].as_array().unwrap();
    assert_eq!(groups.len(), 1);
    assert_eq!(groups[0]["kind"], "base");
    assert_eq!(groups[0]["group"], "ketone or aldehyde O");
    let text = stdout(&phdose("neutral", "text", &["pka", "CC(C)=O"]));
    assert!(text.contains("stays neutral in water"), "{text}");
}

#[test]
fn branched_alcohols_are_weaker_acids_than_primary_ones() {
    // Ethanol 15.9 and tert-butanol 19.2 (Ballinger & Long 1960, from memory); a secondary
    // alcohol is read midway.
    let read = |smiles: &str| {
        profile(smiles)
            .neutral_groups
            .iter()
            .find(|g| g.kind == Kind::Acid)
            .map(|g| g.pka)
            .unwrap_or_else(|| panic!("{smiles}: no alcohol"))
    };
    let (primary, secondary, tertiary) = (read("CCO"), read("CCC(C)O"), read("CC(C)(C)O"));
    assert!(primary < secondary && secondary < tertiary);
    assert!((secondary - (15.9 + 19.2) / 2.0).abs() < 0.4, "{secondary}");
}
