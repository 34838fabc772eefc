//! A written workup (the TOML procedure of `phdose check`): read, simulated step by step and
//! checked. Any panic is a bug; errors and reported problems are fine.
#![no_main]

use std::sync::OnceLock;

use libfuzzer_sys::fuzz_target;
use phdose::acidity::Handbook;
use phdose::equilibrium::Reagent;
use phdose::store::Store;

fn tables() -> &'static (Handbook, Vec<Reagent>) {
    static T: OnceLock<(Handbook, Vec<Reagent>)> = OnceLock::new();
    T.get_or_init(|| {
        let store = Store::in_memory().expect("built-in store");
        let handbook = Handbook::from_store(&store, false).expect("handbook");
        let catalogue = store.reagents().expect("reagents");
        (handbook, catalogue)
    })
}

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    if text.len() > 4000 {
        return;
    }
    let (handbook, catalogue) = tables();
    let _ = phdose::workup::procedure::check(text, handbook, catalogue);
});
