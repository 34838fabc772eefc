//! SMILES text -> molecule -> components -> sites and pKa -> site interplay, canonical key,
//! formula, logP: everything `phdose pka` and `phdose info` do with one structure. Any panic
//! is a bug; errors are fine.
#![no_main]

use std::sync::OnceLock;

use libfuzzer_sys::fuzz_target;
use phdose::acidity::{Handbook, Profile};

fn handbook() -> &'static Handbook {
    static H: OnceLock<Handbook> = OnceLock::new();
    H.get_or_init(|| Handbook::builtin_measured().expect("built-in tables load"))
}

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    // Just past the SMILES length limit; longer inputs only slow the search down.
    if text.len() > 1100 {
        return;
    }
    if let Ok(profile) = Profile::new(text, handbook()) {
        let _ = profile.constants();
        let _ = profile.protolytes(1e-3);
    }
    let _ = phdose::cli::info::describe(text);
    let _ = phdose::chem::canon::key(text);
});
