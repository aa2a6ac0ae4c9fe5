//! Reserve acidity/alkalinity against stoichiometry worked by hand from standard atomic weights.

use saltwise_chem::curve::Doser;
use saltwise_chem::reserve::{Side, reserve};
use saltwise_chem::{Conditions, Constants, Library, Recipe, evaluate};

fn batch(items: &[(&str, f64)]) -> (Library, Constants, saltwise_chem::Batch, f64) {
    let lib = Library::built_in().expect("library");
    let recipe = Recipe::in_grams(items);
    let report = evaluate(&lib, &recipe, Conditions::default()).expect("solves");
    let k = Constants::new(&lib, Conditions::default());
    (lib, k, report.batch, report.solution.ph)
}

#[test]
fn a_strong_acid_needs_its_equivalent_of_naoh() {
    // 1.0 g HCl as 2.778 g of 36 % acid in 97.22 g water. IUPAC standard atomic weights: HCl =
    // 1.008 + 35.45 = 36.458 g/mol, NaOH = 39.997 g/mol; 1.0 g / 36.458 = 0.02743 mol HCl needs
    // 0.02743 × 39.997 = 1.097 g NaOH to reach pH 4 (by hand), less the 1e-4 mol/kg H⁺ left there.
    let (lib, k, b, ph) = batch(&[("water", 97.22), ("hydrochloric_acid_36", 2.778)]);
    let r = reserve(&lib, &k, &b, ph).expect("reserve").expect("acidic");
    assert_eq!(r.side, Side::Acid);
    assert!((r.g_naoh_per_100g - 1.097).abs() < 0.01, "{r:?}");
}

#[test]
fn one_percent_naoh_needs_its_stoichiometric_equivalent_of_acid() {
    // 1 % w/w NaOH: 1.000 g NaOH in 99.000 g water. IUPAC standard atomic weights (abridged):
    // Na 22.990, O 15.999, H 1.008, Cl 35.45, so NaOH = 39.997 g/mol and HCl = 36.458 g/mol.
    // 1.000 g / 39.997 g/mol = 0.025002 mol NaOH needs 0.025002 mol HCl = 0.91151 g HCl
    // = 2.5320 g of the 36 % acid (by hand). At pH 10 about 1.4e-4 mol/kg OH⁻ is left
    // (Kw/a(H⁺) = 10^-3.995, γ ≈ 0.74 by Davies at I ≈ 0.25) in ≈ 0.1 kg water: 1.4e-5 mol, i.e.
    // 0.0014 g less of the acid and 0.0006 g less NaOH-equivalent. So 2.531 g of 36 % acid and a
    // reserve of 1.000 − 0.0006 = 0.9994 g NaOH per 100 g.
    let (lib, k, b, ph) = batch(&[("water", 99.0), ("sodium_hydroxide", 1.0)]);
    let dose = Doser::new(&lib, &k, &b, "hydrochloric_acid_36")
        .expect("an acid")
        .to_target(10.0)
        .expect("reaches pH 10");
    assert!((dose.amount_g - 2.531).abs() < 0.003, "{dose:?}");
    let r = reserve(&lib, &k, &b, ph)
        .expect("reserve")
        .expect("alkaline");
    assert_eq!(r.side, Side::Alkaline);
    assert!((r.g_naoh_per_100g - 0.9994).abs() < 0.001, "{r:?}");
    // Young, How, Walker & Worth, Toxicology in Vitro 2 (1988) 19–26 (from memory): flagged when
    // pH + alkaline reserve/12 ≥ 14.5. A 0.25 mol/kg NaOH solution is near pH 13.3 (pKw 13.995,
    // IAPWS R11-07, less pOH = −log10(0.74 × 0.2525) ≈ 0.73), so 13.3 + 1/12 stays under 14.5.
    assert!((13.1..13.5).contains(&ph), "pH {ph}");
    assert!(r.indicator < 14.5 && !r.flagged, "{r:?}");
}

#[test]
fn a_ten_percent_caustic_is_flagged() {
    // 10 g NaOH per 100 g: a reserve of ≈ 10 g NaOH per 100 g by definition of the reserve, and
    // pH + 10/12 is well past the 14.5 of Young et al. 1988 (from memory).
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
