//! Every parser of user text on random input (proptest): SMILES (through molecule, sites, pKa
//! and site interplay), SMARTS (through matching), amounts, volumes, pH lists, temperatures,
//! pKa lists, and the TOML procedure of `phdose check` (an example file with a stretch
//! replaced by random text, read and simulated). None may panic; a failure is a `ParseError` whose position lies inside the
//! text (or just past its end), and text that reads is accepted again when written back.
//! The fuzz targets in fuzz/ search the same paths far longer; these keep them honest in
//! `cargo test`.

use std::sync::OnceLock;

use phdose::acidity::{Handbook, Profile};
use phdose::chem::molecule::Molecule;
use phdose::chem::smarts::Pattern;
use phdose::store::measured::parse_constants;
use phdose::units::{parse_amount, parse_ph_list, parse_temperature, parse_volume};
use phdose::{Error, ParseError};
use proptest::prelude::*;
use proptest::test_runner::Config;

fn handbook() -> &'static Handbook {
    static H: OnceLock<Handbook> = OnceLock::new();
    H.get_or_init(|| Handbook::builtin_measured().unwrap())
}

fn position_inside(e: &ParseError, text: &str) {
    assert!(e.position <= text.len(), "{e:?}");
    assert!(text.is_char_boundary(e.position), "{e:?}");
}

/// SMILES-like text: the characters SMILES uses, plus a few that it does not.
fn smiles_text() -> impl Strategy<Value = String> {
    proptest::string::string_regex(r"[CNOSPFIBrcnosp0-9()\[\]=#@+\-.:/\\%H*$ ]{0,24}").unwrap()
}

fn smarts_text() -> impl Strategy<Value = String> {
    proptest::string::string_regex(r"[CNOScnos#0-9()\[\]=~@!&,;:$*+\-HhDdXxRrvVaA^ ]{0,20}")
        .unwrap()
}

fn quantity_text() -> impl Strategy<Value = String> {
    proptest::string::string_regex(
        r"[0-9.eE+\-, ;:]{0,8}(mmol|mol|µmol|g|mg|kg|mL|L|µL|M|mM|%|sat|equiv|C|°C|K|acid|base)?[ 0-9.]{0,3}",
    )
    .unwrap()
}

/// The built-in tables and reagents, once.
fn catalogue() -> &'static Vec<phdose::equilibrium::Reagent> {
    static C: OnceLock<Vec<phdose::equilibrium::Reagent>> = OnceLock::new();
    C.get_or_init(|| {
        phdose::store::Store::in_memory()
            .unwrap()
            .reagents()
            .unwrap()
    })
}

const PROCEDURE: &str = include_str!("../examples/amine-back-extraction-ph.toml");

proptest! {
    #![proptest_config(Config { cases: 40, ..Config::default() })]

    #[test]
    fn a_damaged_procedure_never_panics(
        start in 0..PROCEDURE.len(),
        len in 0usize..40,
        patch in "[\\PC\n]{0,12}",
    ) {
        let mut text = PROCEDURE.to_string();
        let start = (0..=start).rev().find(|&i| text.is_char_boundary(i)).unwrap();
        let end = (start + len).min(text.len());
        let end = (end..=text.len()).find(|&i| text.is_char_boundary(i)).unwrap();
        text.replace_range(start..end, &patch);
        let _ = phdose::workup::procedure::check(&text, handbook(), catalogue());
    }
}

proptest! {
    #![proptest_config(Config { cases: 300, ..Config::default() })]

    #[test]
    fn smiles_never_panics(text in smiles_text()) {
        match Profile::new(&text, handbook()) {
            Ok(profile) => {
                let constants = profile.constants();
                prop_assert!(constants.macro_pka.iter().all(|p| p.is_finite()));
            }
            Err(Error::Parse(e)) => position_inside(&e, &text),
            Err(_) => {}
        }
        if let Ok(info) = phdose::cli::info::describe(&text) {
            prop_assert!(info.molar_mass.unwrap().is_finite());
        }
    }

    #[test]
    fn smarts_never_panics(text in smarts_text()) {
        match Pattern::parse(&text) {
            Ok(pattern) => {
                let mol = Molecule::from_smiles("OC(=O)c1ccc(N)cc1").unwrap();
                for m in pattern.matches(&mol) {
                    prop_assert_eq!(m.len(), pattern.atom_count());
                }
            }
            Err(e) => position_inside(&e, &text),
        }
    }

    #[test]
    fn quantities_never_panic(text in quantity_text()) {
        match parse_amount(&text) {
            Ok(a) => { let _ = a.to_moles(Some(100.0), Some(0.05)); }
            Err(e) => position_inside(&e, &text),
        }
        match parse_volume(&text) {
            Ok(v) => prop_assert!(v.litres.is_finite()),
            Err(e) => position_inside(&e, &text),
        }
        match parse_ph_list(&text) {
            Ok(list) => prop_assert!(list.iter().all(|p| p.is_finite())),
            Err(e) => position_inside(&e, &text),
        }
        match parse_temperature(&text) {
            Ok(t) => prop_assert!(t.is_finite()),
            Err(e) => position_inside(&e, &text),
        }
        match parse_constants(&text) {
            Ok(list) => prop_assert!(list.iter().all(|(_, p)| p.is_finite())),
            Err(e) => position_inside(&e, &text),
        }
    }

    #[test]
    fn any_text_at_all_is_safe(text in "\\PC{0,16}") {
        let _ = Molecule::from_smiles(&text);
        let _ = Pattern::parse(&text);
        let _ = parse_amount(&text);
        let _ = parse_volume(&text);
        let _ = parse_ph_list(&text);
        let _ = parse_temperature(&text);
        let _ = parse_constants(&text);
    }
}
