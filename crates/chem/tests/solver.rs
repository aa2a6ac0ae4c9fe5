//! The solver's own checks: analytic buffer capacity against finite differences, solver status
//! at the edges, dose curves and doses to target.

use saltwise_chem::curve::Doser;
use saltwise_chem::solver::{self, Composition};
use saltwise_chem::{
    ActivityModel, Conditions, Constants, DoseError, Library, Recipe, SolveStatus,
};

fn lib() -> Library {
    Library::built_in().expect("built-in library")
}

/// Adds δ mol/kg of a strong base (Na⁺ + OH⁻) to a composition.
fn with_base(c: &Composition, delta: f64) -> Composition {
    let mut c = c.clone();
    c.spectator_charge += delta;
    c.spectator_z2 += delta;
    c.spectator_abs_charge += delta;
    c.proton_excess -= delta;
    c
}

#[test]
fn buffer_capacity_matches_finite_differences() {
    // β = dC_b/dpH (Van Slyke's definition) at fixed activity coefficients: compared with a central
    // difference of added strong base, the activity coefficients held at the solved ionic
    // strength. Both sides are the same derivative, so they agree to the difference's own error
    // (δ² truncation and pH rounding, both under 1e-9 relative here).
    let lib = lib();
    for activity in [ActivityModel::Ideal, ActivityModel::Davies] {
        let k = Constants::new(
            &lib,
            Conditions {
                temp_c: 25.0,
                activity,
            },
        );
        for items in [
            vec![
                ("water", 1000.0),
                ("citric_acid", 10.0),
                ("sodium_hydroxide", 3.0),
            ],
            vec![
                ("water", 1000.0),
                ("phosphoric_acid_85", 2.0),
                ("sodium_hydroxide", 1.0),
            ],
            vec![("water", 1000.0), ("sodium_chloride", 1.0)],
            vec![("water", 100.0), ("sodium_carbonate", 10.0)],
        ] {
            let batch = Recipe::in_grams(&items).batch(&lib).unwrap();
            let c = batch.composition(&lib).unwrap();
            let s = solver::solve(&k, &c, None);
            let i = s.ionic_strength;
            let at_i = solver::solve_at_ionic_strength(&k, &c, i, Some(s.ph));
            // At the self-consistent I the fixed-I solve is the same state.
            assert!((at_i.ph - s.ph).abs() < 1e-10, "{items:?}");
            // δ moves pH by 1e-5: truncation ~1e-10, rounding of pH ~1e-15/1e-5.
            let d = 1e-5 * s.buffer_capacity;
            let up = solver::solve_at_ionic_strength(&k, &with_base(&c, d), i, Some(s.ph)).ph;
            let down = solver::solve_at_ionic_strength(&k, &with_base(&c, -d), i, Some(s.ph)).ph;
            let numeric = 2.0 * d / (up - down);
            let rel = (at_i.buffer_capacity / numeric - 1.0).abs();
            assert!(
                rel < 1e-6,
                "{items:?} {activity:?}: analytic {} vs numeric {numeric} (rel {rel:e})",
                at_i.buffer_capacity
            );
        }
    }
}

#[test]
fn out_of_range_solutions_are_reported_not_hidden() {
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let c = Composition {
        spectator_charge: -500.0,
        spectator_abs_charge: 500.0,
        spectator_z2: 500.0,
        proton_excess: 500.0,
        ..Composition::default()
    };
    let s = solver::solve(&k, &c, None);
    assert_eq!(s.status, SolveStatus::BelowRange);
    assert!(s.ph.is_finite());
    let c = Composition {
        spectator_charge: 500.0,
        spectator_abs_charge: 500.0,
        spectator_z2: 500.0,
        proton_excess: -500.0,
        ..Composition::default()
    };
    assert_eq!(solver::solve(&k, &c, None).status, SolveStatus::AboveRange);
}

#[test]
fn warm_start_gives_the_same_answer() {
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let batch = Recipe::in_grams(&[
        ("water", 500.0),
        ("citric_acid_monohydrate", 5.0),
        ("borax", 3.0),
    ])
    .batch(&lib)
    .unwrap();
    let c = batch.composition(&lib).unwrap();
    let cold = solver::solve(&k, &c, None);
    let warm = solver::solve(
        &k,
        &c,
        Some(solver::Guess {
            ph: 12.0,
            ionic_strength: 2.0,
        }),
    );
    assert!((cold.ph - warm.ph).abs() < 1e-10);
}

#[test]
fn acetic_acid_titration_has_its_equivalence_point_at_one_equivalent() {
    // 0.100 mol acetic acid with solid NaOH: the end point is at 0.100 mol = 4.000 g NaOH
    // (stoichiometry; NaOH 39.997 g/mol from the atomic weights).
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let acid_g = 0.1 * lib.entry("acetic_acid").unwrap().molar_mass_g_per_mol;
    let batch = Recipe::in_grams(&[("water", 1000.0), ("acetic_acid", acid_g)])
        .batch(&lib)
        .unwrap();
    let doser = Doser::new(&lib, &k, &batch, "sodium_hydroxide").unwrap();
    let curve = doser.curve(8.0, 512);
    assert_eq!(curve.equivalence.len(), 1, "{:?}", curve.equivalence);
    let naoh_g = 0.1 * lib.entry("sodium_hydroxide").unwrap().molar_mass_g_per_mol;
    assert!(
        (curve.equivalence[0].dose_g - naoh_g).abs() < 0.01 * naoh_g,
        "{:?}",
        curve.equivalence
    );
    // The pH at the end point is that of 0.1 mol/kg sodium acetate: above 8.5 (8.88 ideal from
    // the charge balance with Goldberg 2002's pKa 4.756, reproduced by scipy in tests/python).
    assert!(curve.equivalence[0].ph > 8.3 && curve.equivalence[0].ph < 9.3);
}

#[test]
fn phosphoric_acid_shows_two_end_points() {
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let batch = Recipe::in_grams(&[("water", 1000.0), ("phosphoric_acid_85", 11.53)])
        .batch(&lib)
        .unwrap(); // ≈ 0.1 mol
    let curve = Doser::new(&lib, &k, &batch, "sodium_hydroxide")
        .unwrap()
        .curve(12.0, 600);
    // pKa3 = 12.35 is too close to water's own end to show: two end points (common practice, no source).
    assert_eq!(curve.equivalence.len(), 2, "{:?}", curve.equivalence);
    assert!((curve.equivalence[0].dose_g - 4.0).abs() < 0.1);
    assert!((curve.equivalence[1].dose_g - 8.0).abs() < 0.15);
}

#[test]
fn dose_to_target_lands_on_the_target() {
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let batch = Recipe::in_grams(&[
        ("water", 900.0),
        ("citric_acid_monohydrate", 20.0),
        ("trisodium_citrate_dihydrate", 15.0),
    ])
    .batch(&lib)
    .unwrap();
    let doser = Doser::new(&lib, &k, &batch, "sodium_hydroxide_50").unwrap();
    let d = doser.to_target(5.5).unwrap();
    assert!((d.ph_reached - 5.5).abs() < 1e-8);
    // Re-solve independently at that dose: the same pH.
    assert!((doser.solve(d.amount_g, None).ph - 5.5).abs() < 1e-8);
    let acid = Doser::new(&lib, &k, &batch, "lactic_acid_88")
        .unwrap()
        .to_target(3.2)
        .unwrap();
    assert!((acid.ph_reached - 3.2).abs() < 1e-8 && acid.amount_g > 0.0);
}

#[test]
fn unreachable_targets_say_why() {
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let batch = Recipe::in_grams(&[("water", 1000.0), ("sodium_chloride", 5.0)])
        .batch(&lib)
        .unwrap();
    let wrong_way = Doser::new(&lib, &k, &batch, "sodium_hydroxide_50")
        .unwrap()
        .to_target(4.0)
        .unwrap_err();
    assert!(
        wrong_way.to_string().contains("choose an acid"),
        "{wrong_way}"
    );
    // 25 % ammonia alone is about pH 12.3 (a weak base at ≈ 20 mol/kg): it cannot reach pH 13.
    let too_far = Doser::new(&lib, &k, &batch, "ammonia_25")
        .unwrap()
        .to_target(13.0)
        .unwrap_err();
    assert!(
        matches!(too_far, DoseError::Unreachable { .. }),
        "{too_far}"
    );
    assert!(too_far.to_string().contains("only reaches pH"), "{too_far}");
    let not = Doser::new(&lib, &k, &batch, "sodium_chloride").unwrap_err();
    assert!(matches!(not, DoseError::NotAnAdjuster { .. }));
}
