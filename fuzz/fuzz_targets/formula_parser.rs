//! Fuzz the formula parser: any text must give a formula with a finite molar mass or an error.
#![no_main]

use libfuzzer_sys::fuzz_target;
use saltwise_chem::formula::Formula;

fuzz_target!(|data: &[u8]| {
    if let Ok(text) = std::str::from_utf8(data) {
        if let Ok(f) = Formula::parse(text) {
            assert!(f.molar_mass_g_per_mol().is_finite());
        }
    }
});
