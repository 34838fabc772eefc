//! Amounts, volumes, pH lists, temperatures and pKa lists as typed on the command line, and
//! the conversion of an amount to moles. Any panic is a bug; errors are fine.
#![no_main]

use libfuzzer_sys::fuzz_target;
use phdose::store::measured::parse_constants;
use phdose::units::{parse_amount, parse_ph_list, parse_temperature, parse_volume};

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    if let Ok(amount) = parse_amount(text) {
        let _ = amount.to_moles(Some(122.12), Some(0.05));
        let _ = amount.to_moles(None, None);
    }
    let _ = parse_volume(text);
    let _ = parse_ph_list(text);
    let _ = parse_temperature(text);
    let _ = parse_constants(text);
});
