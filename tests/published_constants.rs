//! Constants the solver uses, against published values: Kb of named bases at 25 °C and pKa at
//! other temperatures.

use saltwise_chem::ActivityModel::Ideal;
use saltwise_chem::explain::explain_ingredient;
use saltwise_chem::{Conditions, Constants};
use saltwise_reference_tests::{assert_close, library};

/// The constants of the built-in library at a temperature (activities do not enter Ka or Kb).
fn constants_at(temp_c: f64) -> Constants {
    Constants::new(
        &library(),
        Conditions {
            temp_c,
            activity: Ideal,
        },
    )
}

/// pKb of the one released ion of an ingredient that takes a proton.
fn pkb_of(ingredient: &str) -> f64 {
    let lib = library();
    let c = constants_at(25.0);
    let Some(i) = lib.entry_index(ingredient) else {
        panic!("no ingredient {ingredient}")
    };
    let kbs: Vec<f64> = explain_ingredient(&lib, &c, i)
        .ions
        .iter()
        .filter_map(|ion| ion.kb)
        .collect();
    assert_eq!(kbs.len(), 1, "{ingredient}: {kbs:?}");
    -kbs[0].log10()
}

#[test]
fn kb_of_ammonia_matches_the_handbook() {
    // Ammonia, Kb = 1.8e-5 at 25 °C, pKb 4.75 (CRC Handbook of Chemistry and Physics,
    // dissociation constants of inorganic bases, from memory).
    assert_close("pKb(NH3)", pkb_of("ammonia_25"), 4.75, 0.01);
}

#[test]
fn kb_of_acetate_matches_the_handbook() {
    // Acetate, Kb = 5.7e-10 at 25 °C, pKb 9.24 (the value in textbook tables of conjugate
    // bases, e.g. Harris, Quantitative Chemical Analysis, from memory).
    assert_close(
        "pKb(acetate)",
        pkb_of("sodium_acetate_trihydrate"),
        9.24,
        0.01,
    );
}

#[test]
fn ammonium_pka_against_temperature() {
    // Bates & Pinching, J. Res. Natl. Bur. Stand. 42 (1949) 419 (from memory):
    // pKa(NH4+) = 2835.76/T − 0.6322 + 0.001225·T → 10.084 (0 °C), 9.730 (10), 8.807 (40),
    // 8.539 (50).
    let lib = library();
    let Some(sys) = lib.system_index("ammonium") else {
        panic!("no ammonium system")
    };
    for (temp_c, published) in [(0.0, 10.084), (10.0, 9.730), (40.0, 8.807), (50.0, 8.539)] {
        let pka = -constants_at(temp_c).ka(sys)[0].log10();
        assert_close(&format!("pKa(NH4+) at {temp_c} °C"), pka, published, 0.005);
    }
}

#[test]
fn acetic_acid_pka_against_temperature() {
    // Harned & Ehlers, J. Am. Chem. Soc. 55 (1933) 652 (from memory): Ka·1e5 = 1.657 (0 °C),
    // 1.754 (25 °C), 1.633 (50 °C), i.e. pKa 4.781, 4.756, 4.787.
    let lib = library();
    let Some(sys) = lib.system_index("acetic") else {
        panic!("no acetic system")
    };
    for (temp_c, published) in [(0.0, 4.781), (25.0, 4.756), (50.0, 4.787)] {
        let pka = -constants_at(temp_c).ka(sys)[0].log10();
        assert_close(
            &format!("pKa(acetic) at {temp_c} °C"),
            pka,
            published,
            0.005,
        );
    }
}
