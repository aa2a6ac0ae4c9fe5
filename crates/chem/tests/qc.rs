//! QC titrations predicted: end point volumes by stoichiometry, alkalinity relations of carbonate,
//! the titration factor, the carbonation scenario, and refusals.

use saltwise_chem::qc::{
    self, EndPoint, QcError, Request, Titrant, TitrantKind, Titration, carbonated, carbonation_p_m,
    predict,
};
use saltwise_chem::{Batch, Conditions, Constants, Library, Recipe};

fn lib() -> Library {
    Library::built_in().expect("built-in library")
}

fn batch(lib: &Library, items: &[(&str, f64)]) -> Batch {
    Recipe::in_grams(items).batch(lib).expect("recipe resolves")
}

/// An invented product: "Harbourline Caustic Rinse", 0.4 % NaOH in water (0.1 mol NaOH per kg).
const CAUSTIC_RINSE: &[(&str, f64)] = &[("water", 996.0), ("sodium_hydroxide", 4.0)];

/// An invented product: "Dunmore Scale Lift", 1 % anhydrous citric acid in water.
const SCALE_LIFT: &[(&str, f64)] = &[("water", 990.0), ("citric_acid", 10.0)];

/// An invented product: "Kestrel Soda Wash", 1 % anhydrous sodium carbonate in water.
const SODA_WASH: &[(&str, f64)] = &[("water", 990.0), ("sodium_carbonate", 10.0)];

/// Molar mass of NaOH, g/mol (IUPAC standard atomic weights, from memory).
const NAOH_G_PER_MOL: f64 = 39.997;

fn end_point(
    lib: &Library,
    product: &[(&str, f64)],
    sample_g: f64,
    titrant: &str,
    n: f64,
    ph: f64,
) -> EndPoint {
    let k = Constants::new(lib, Conditions::default());
    let t = Titrant::find(lib, titrant, n).expect("titrant");
    let titration = Titration::new(lib, &k, &batch(lib, product), sample_g, &t).expect("titration");
    titration.end_point(ph).expect("end point reached")
}

#[test]
fn dilute_caustic_with_tenth_normal_hydrochloric_acid_meets_stoichiometry() {
    let lib = lib();
    // Stoichiometry: 50 g of 0.4 % NaOH hold 0.2 g = 5.0004 mmol NaOH; 1 mol HCl per mol NaOH, so
    // 5.0004 mmol / 0.1 mmol per mL = 50.004 mL at equivalence (definition of normality, from memory).
    let expected_ml = 50.0 * 0.004 / NAOH_G_PER_MOL * 1e3 / 0.1;
    let p = end_point(&lib, CAUSTIC_RINSE, 50.0, "hcl", 0.1, 8.3);
    let m = end_point(&lib, CAUSTIC_RINSE, 50.0, "hcl", 0.1, 4.3);
    // At pH 8.3 the OH⁻ left is ~2e-6 mol/kg in ~0.1 kg of water: 0.002 mL short of equivalence
    // (charge balance, from memory); 0.02 mL covers it.
    assert!(
        (p.ml - expected_ml).abs() < 0.02,
        "P: {} vs {expected_ml}",
        p.ml
    );
    // At pH 4.3 the free H⁺ is 10^-4.3/γ ≈ 6.1e-5 mol/kg (Davies γ ≈ 0.82 at I ≈ 0.05) in ~0.1 kg:
    // ≈ 0.06 mL past equivalence (charge balance and Davies equation, from memory).
    let past = m.ml - expected_ml;
    assert!((0.04..0.09).contains(&past), "M − equivalence = {past} mL");
    assert!(!p.at_start && !m.at_start);
    // meq is mL × normality (definition of normality, from memory).
    assert!((p.meq - p.ml * 0.1).abs() < 1e-12);
}

#[test]
fn sulfuric_acid_counts_two_equivalents_and_titrates_like_hydrochloric() {
    let lib = lib();
    let t = Titrant::find(&lib, "h2so4", 0.1).unwrap();
    assert_eq!(t.id(), "sulfuric_acid");
    // Two protons per H2SO4 in acid–base normality (textbook definition of normality, from memory).
    assert_eq!(t.equivalents_per_mol(), 2.0);
    let hcl = end_point(&lib, CAUSTIC_RINSE, 50.0, "hcl", 0.1, 8.3);
    let h2so4 = end_point(&lib, CAUSTIC_RINSE, 50.0, "h2so4", 0.1, 8.3);
    // Same normality, same equivalents to pH 8.3, where HSO4⁻ (pKa 1.99) is all dissociated
    // (Harris, Quantitative Chemical Analysis, pKa of HSO4⁻, from memory); 0.1 % allows for the
    // different ionic strength.
    assert!(
        (h2so4.ml / hcl.ml - 1.0).abs() < 1e-3,
        "{} vs {}",
        h2so4.ml,
        hcl.ml
    );
}

#[test]
fn sodium_carbonate_gives_p_half_of_m() {
    let lib = lib();
    // 10 g of 1 % Na2CO3: 0.1 g / 105.99 g/mol = 0.9435 mmol (IUPAC atomic weights, from memory).
    let mmol = 10.0 * 0.01 / 105.99 * 1e3;
    let p = end_point(&lib, SODA_WASH, 10.0, "hydrochloric_acid", 0.1, 8.3);
    let m = end_point(&lib, SODA_WASH, 10.0, "hydrochloric_acid", 0.1, 4.3);
    // Carbonate → hydrogen carbonate at pH 8.3 takes one H⁺, → CO₂ at pH 4.3 two, so P = M/2
    // (Standard Methods for the Examination of Water and Wastewater, 2320 B, alkalinity
    // relationships, from memory). 3 % allows for the end points not lying exactly on the
    // equivalence points in a closed system.
    let ratio = p.ml / m.ml;
    assert!((ratio - 0.5).abs() < 0.015, "P/M = {ratio}");
    // M by stoichiometry: 2 × 0.9435 mmol / 0.1 N = 18.87 mL (from memory, as above); within 2 %.
    assert!(
        (m.ml / (2.0 * mmol / 0.1) - 1.0).abs() < 0.02,
        "M = {} mL",
        m.ml
    );
    assert!((p.ml / (mmol / 0.1) - 1.0).abs() < 0.03, "P = {} mL", p.ml);
}

#[test]
fn citric_acid_acidity_with_sodium_hydroxide() {
    let lib = lib();
    // 10 g of 1 % citric acid: 0.1 g / 192.12 g/mol = 0.5205 mmol, three protons each, all taken
    // by pH 8.3 but ~1.2 % of the third (pKa3 6.40) (Martell & Smith pKa values, from memory):
    // ≈ 15.55 mL of 0.1 N NaOH; 1 % allows for the activity shift of pKa3.
    let meq = 10.0 * 0.01 / 192.12 * 1e3 * 3.0;
    let at_8_3 = end_point(
        &lib,
        SCALE_LIFT,
        10.0,
        "naoh",
        0.1,
        qc::ACIDITY_END_POINT_PH,
    );
    assert!(
        (at_8_3.ml / (meq / 0.1) - 1.0).abs() < 0.01,
        "{} mL",
        at_8_3.ml
    );
    // To pH 7.0 the first two protons are gone and part of the third (same source): less titrant.
    let at_7 = end_point(&lib, SCALE_LIFT, 10.0, "naoh", 0.1, qc::NEUTRAL_ACIDITY_PH);
    assert!(
        at_7.ml < at_8_3.ml && at_7.ml > 2.0 / 3.0 * meq / 0.1,
        "{} mL",
        at_7.ml
    );
}

#[test]
fn a_sample_already_past_an_end_point_takes_no_titrant_and_gives_no_factor() {
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let t = Titrant::find(&lib, "hcl", 0.1).unwrap();
    let titration = Titration::new(&lib, &k, &batch(&lib, SCALE_LIFT), 10.0, &t).unwrap();
    // An acidic sample (pH ≈ 2.2) has no P alkalinity (common practice, no source).
    let e = titration.end_point(8.3).unwrap();
    assert!(e.at_start && e.ml == 0.0, "{e:?}");
    assert!(matches!(
        titration.factor(&e, 10.0),
        Err(QcError::NoFactor { .. })
    ));
}

#[test]
fn an_end_point_never_reached_is_an_error_naming_it() {
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let product = batch(&lib, CAUSTIC_RINSE);
    // 0.1 N HCl alone is about pH 1.1 (definition of pH, from memory): pH 0.5 is never reached.
    let t = Titrant::find(&lib, "hcl", 0.1).unwrap();
    let titration = Titration::new(&lib, &k, &product, 10.0, &t).unwrap();
    match titration.end_point(0.5) {
        Err(
            e @ QcError::EndPointNotReached {
                end_point_ph,
                ph_at_max,
                ..
            },
        ) => {
            assert_eq!(end_point_ph, 0.5);
            assert!(ph_at_max > 1.0, "{ph_at_max}");
            assert!(e.to_string().contains("end point pH 0.5"), "{e}");
        }
        other => panic!("{other:?}"),
    }
    // 50 g of product (5 mmol NaOH) need 5000 mL of 0.001 N acid, past the 1000 mL searched
    // (stoichiometry, from memory).
    let weak = Titrant::find(&lib, "hcl", 0.001).unwrap();
    let titration = Titration::new(&lib, &k, &product, 50.0, &weak).unwrap();
    assert!(matches!(
        titration.end_point(8.3),
        Err(QcError::EndPointNotReached { .. })
    ));
}

#[test]
fn bad_inputs_are_typed_errors() {
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let product = batch(&lib, CAUSTIC_RINSE);
    let t = Titrant::find(&lib, "hcl", 0.1).unwrap();
    for g in [0.0, -1.0, f64::NAN, 2e4] {
        assert!(
            matches!(
                Titration::new(&lib, &k, &product, g, &t),
                Err(QcError::Limit(_))
            ),
            "sample {g} g"
        );
    }
    for n in [0.0, -0.1, 1.5, f64::INFINITY] {
        assert!(
            matches!(Titrant::find(&lib, "hcl", n), Err(QcError::Limit(_))),
            "normality {n}"
        );
    }
    // 1 N is the largest normality allowed (the density 1.00 kg/L is taken up to it).
    assert!(Titrant::find(&lib, "hcl", 1.0).is_ok());
    assert!(matches!(
        Titrant::find(&lib, "citric_acid", 0.1),
        Err(QcError::NotStrong { .. })
    ));
    assert!(matches!(
        Titrant::find(&lib, "sodium_carbonate", 0.1),
        Err(QcError::NotStrong { .. })
    ));
    match Titrant::find(&lib, "unobtainium", 0.1) {
        Err(e @ QcError::UnknownTitrant { .. }) => {
            assert!(e.to_string().contains("hydrochloric_acid_36 (HCl)"), "{e}")
        }
        other => panic!("{other:?}"),
    }
    let titration = Titration::new(&lib, &k, &product, 10.0, &t).unwrap();
    assert!(matches!(titration.end_point(15.0), Err(QcError::Limit(_))));
    assert!(matches!(
        titration.curve(10.0, 1),
        Err(QcError::Points { .. })
    ));
}

#[test]
fn titrants_by_id_formula_or_id_without_grade() {
    let lib = lib();
    for (name, id, kind) in [
        ("hcl", "hydrochloric_acid_36", TitrantKind::Acid),
        ("HCl", "hydrochloric_acid_36", TitrantKind::Acid),
        (
            "hydrochloric_acid",
            "hydrochloric_acid_36",
            TitrantKind::Acid,
        ),
        (
            "hydrochloric_acid_36",
            "hydrochloric_acid_36",
            TitrantKind::Acid,
        ),
        ("naoh", "sodium_hydroxide", TitrantKind::Base),
        (
            "sodium_hydroxide_50",
            "sodium_hydroxide_50",
            TitrantKind::Base,
        ),
        ("koh", "potassium_hydroxide", TitrantKind::Base),
        ("hno3", "nitric_acid", TitrantKind::Acid),
    ] {
        let t = Titrant::find(&lib, name, 0.1).unwrap();
        assert_eq!((t.id(), t.kind()), (id, kind), "{name}");
    }
}

#[test]
fn titration_factor_matches_titrating_the_in_use_solution() {
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    // An invented product: "Tidemark CIP Base", 20 % of 50 % lye, so 10 % NaOH.
    let product = batch(&lib, &[("water", 800.0), ("sodium_hydroxide_50", 200.0)]);
    let t = Titrant::find(&lib, "hcl", 0.1).unwrap();
    let titration = Titration::new(&lib, &k, &product, 1.0, &t).unwrap();
    let e = titration.end_point(8.3).unwrap();
    let factor = titration.factor(&e, 10.0).unwrap();
    // 1 g of product holds 0.1 g NaOH = 2.500 mmol, 25.00 mL of 0.1 N; 100 × (1 g / 25 mL) / 10 g
    // = 0.400 % per mL (stoichiometry and the factor's definition in qc.rs, from memory).
    assert!(
        (factor - 100.0 * (1.0 / (0.1 / NAOH_G_PER_MOL * 1e4)) / 10.0).abs() < 1e-3,
        "{factor}"
    );
    // Common practice, no source: c / x for a 10 mL sample of a 1 % in-use solution. 1 % of the
    // product in water: 2 g of lye in 998 g of water; 10 mL taken as 10 g.
    let in_use = batch(&lib, &[("water", 998.0), ("sodium_hydroxide_50", 2.0)]);
    let x = Titration::new(&lib, &k, &in_use, 10.0, &t)
        .unwrap()
        .end_point(8.3)
        .unwrap()
        .ml;
    assert!(
        (1.0 / x / factor - 1.0).abs() < 0.005,
        "c/x = {} vs {factor}",
        1.0 / x
    );
}

#[test]
fn carbonation_turns_hydroxide_alkalinity_into_carbonate_alkalinity() {
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let product = batch(&lib, CAUSTIC_RINSE);
    let t = Titrant::find(&lib, "hcl", 0.1).unwrap();
    let fresh = carbonation_p_m(&lib, &k, &product, 50.0, &t, 0.0).unwrap();
    let half = carbonation_p_m(&lib, &k, &product, 50.0, &t, 50.0).unwrap();
    let all = carbonation_p_m(&lib, &k, &product, 50.0, &t, 100.0).unwrap();
    // Hydroxide alone: P = M (Standard Methods 2320 B alkalinity relationships, from memory);
    // M exceeds P only by the free H⁺ at pH 4.3 (0.06 mL, see the first test).
    assert!((fresh.m.ml - fresh.p.ml) < 0.1, "{fresh:?}");
    // M, the total alkalinity, does not change when CO₂ is taken up (same source). Here it falls
    // a little: at pH 4.3 about 1 % of the carbonate is still HCO₃⁻ (pKa1 6.35, Harris,
    // Quantitative Chemical Analysis, from memory), and the sample weighs the CO₂ taken up
    // (0.2 % at most here); hence 1 %.
    for aged in [&half, &all] {
        assert!((aged.m.ml / fresh.m.ml - 1.0).abs() < 0.01, "{aged:?}");
        assert!(aged.m.ml < fresh.m.ml, "{aged:?}");
    }
    // Half the OH⁻ as carbonate: P = OH + CO3/2 = 0.5 + 0.25 = 0.75 of M; all of it: P = M/2
    // (same source: OH = 2P − M, CO3 = 2(M − P)); 1.5 % allows for the end points.
    assert!((half.p.ml / half.m.ml - 0.75).abs() < 0.015, "{half:?}");
    assert!((all.p.ml / all.m.ml - 0.5).abs() < 0.015, "{all:?}");
    // The scenario is for caustic products, with an acid titrant.
    assert!(matches!(
        carbonated(&lib, &k, &batch(&lib, SCALE_LIFT), 50.0),
        Err(QcError::NotCaustic { .. })
    ));
    let base = Titrant::find(&lib, "naoh", 0.1).unwrap();
    assert!(matches!(
        carbonation_p_m(&lib, &k, &product, 50.0, &base, 50.0),
        Err(QcError::NeedsAcidTitrant { .. })
    ));
    assert!(matches!(
        carbonated(&lib, &k, &product, 120.0),
        Err(QcError::Limit(_))
    ));
}

#[test]
fn prediction_has_default_end_points_and_a_curve_past_the_last() {
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let product = batch(&lib, SODA_WASH);
    let request = Request {
        sample_g: 10.0,
        end_points_ph: Vec::new(),
        points: qc::DEFAULT_POINTS,
        in_use_sample_ml: Some(10.0),
        carbonated_percent: None,
    };
    let acid = Titrant::find(&lib, "hcl", 0.1).unwrap();
    let p = predict(&lib, &k, &product, &acid, &request).unwrap();
    let phs: Vec<f64> = p.end_points.iter().map(|e| e.ph).collect();
    // Defaults: 8.3 and 4.3 with an acid titrant (P and M alkalinity, common practice, no source).
    assert_eq!(phs, [8.3, 4.3]);
    assert_eq!(p.points.len(), 101);
    assert_eq!(p.points[0].ml, 0.0);
    assert!((p.points[0].ph - p.start_ph).abs() < 1e-9);
    // The curve ends 25 % past the last end point (qc.rs) and falls all the way with an acid.
    let last = p.end_points[1].ml;
    assert!((p.points[100].ml / last - 1.25).abs() < 1e-9);
    assert!(p.points.windows(2).all(|w| w[1].ph < w[0].ph));
    // The factor is taken at the first end point.
    let f = p.factor.unwrap();
    assert_eq!(f.end_point_ph, 8.3);
    assert!((f.percent_per_ml - 100.0 * (10.0 / p.end_points[0].ml) / 10.0).abs() < 1e-12);
    // The curve passes through the end points: interpolated pH at the M volume is 4.3 within 0.1
    // (consistency of the curve and the root solve).
    let i = p.points.iter().position(|q| q.ml > last).unwrap();
    let (a, b) = (p.points[i - 1], p.points[i]);
    let ph = a.ph + (b.ph - a.ph) * (last - a.ml) / (b.ml - a.ml);
    assert!((ph - 4.3).abs() < 0.1, "{ph}");
    // With a base titrant the default is 8.3 alone (acidity, common practice, no source).
    let base = Titrant::find(&lib, "naoh", 0.1).unwrap();
    let b = predict(&lib, &k, &batch(&lib, SCALE_LIFT), &base, &request).unwrap();
    assert_eq!(b.end_points.len(), 1);
    assert_eq!(b.end_points[0].ph, 8.3);
    assert!(b.points.windows(2).all(|w| w[1].ph > w[0].ph));
}
