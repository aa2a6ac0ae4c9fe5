//! Reserve acidity/alkalinity against stoichiometry.

use saltwise_chem::reserve::{Side, reserve};
use saltwise_chem::{Conditions, Constants, Library, Recipe, RecipeLine, evaluate};

fn batch(items: &[(&str, f64)]) -> (Library, Constants, saltwise_chem::Batch, f64) {
    let lib = Library::built_in().expect("library");
    let recipe = Recipe {
        lines: items
            .iter()
            .map(|(i, g)| RecipeLine::grams(i, *g))
            .collect(),
        qs_to_g: None,
    };
    let report = evaluate(&lib, &recipe, Conditions::default()).expect("solves");
    let k = Constants::new(&lib, Conditions::default());
    (lib, k, report.batch, report.solution.ph)
}

#[test]
fn a_strong_acid_needs_its_equivalent_of_naoh() {
    // 1.0 g HCl-equivalent of 36 % acid in 99 g water: 1.0 g HCl = 0.02743 mol needs 1.097 g NaOH
    // (stoichiometry) to reach pH 4, less the tiny 1e-4 mol/kg left at pH 4.
    let (lib, k, b, ph) = batch(&[("water", 97.22), ("hydrochloric_acid_36", 2.778)]);
    let r = reserve(&lib, &k, &b, ph).expect("reserve").expect("acidic");
    assert_eq!(r.side, Side::Acid);
    assert!((r.g_naoh_per_100g - 1.097).abs() < 0.01, "{r:?}");
}

#[test]
fn a_strong_alkali_needs_its_equivalent_of_acid() {
    // 2.0 g NaOH per 100 g: alkaline reserve ≈ 2.0 g NaOH-equivalent (stoichiometry).
    let (lib, k, b, ph) = batch(&[("water", 98.0), ("sodium_hydroxide", 2.0)]);
    let r = reserve(&lib, &k, &b, ph)
        .expect("reserve")
        .expect("alkaline");
    assert_eq!(r.side, Side::Alkaline);
    assert!((r.g_naoh_per_100g - 2.0).abs() < 0.01, "{r:?}");
    assert!((r.indicator - (ph + r.g_naoh_per_100g / 12.0)).abs() < 1e-12);
    // pH ≈ 13.6 + 2/12 stays below the 14.5 threshold (Young et al. 1988, from memory).
    assert!(!r.flagged, "{r:?}");
}

#[test]
fn a_ten_percent_caustic_is_flagged() {
    // 10 g NaOH per 100 g: pH above 14 and a reserve of ≈ 10 g, well past 14.5.
    let (lib, k, b, ph) = batch(&[("water", 90.0), ("sodium_hydroxide", 10.0)]);
    let r = reserve(&lib, &k, &b, ph)
        .expect("reserve")
        .expect("alkaline");
    assert!(
        r.flagged && (r.g_naoh_per_100g - 10.0).abs() < 0.05,
        "{r:?}"
    );
}

#[test]
fn mid_ph_products_have_no_reserve() {
    let (lib, k, b, ph) = batch(&[("water", 100.0), ("sodium_chloride", 1.0)]);
    assert!(reserve(&lib, &k, &b, ph).expect("no error").is_none());
}
