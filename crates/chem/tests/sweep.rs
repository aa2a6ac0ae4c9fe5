//! Sweeps: pH against dilution with water and against temperature, and refusals of bad ranges.

use saltwise_chem::report::evaluate_with;
use saltwise_chem::sweep::{self, SweepError};
use saltwise_chem::{ActivityModel, Conditions, Constants, Library, Recipe, RecipeLine};

fn lib() -> Library {
    Library::built_in().expect("built-in library")
}

fn ideal() -> Conditions {
    Conditions {
        temp_c: 25.0,
        activity: ActivityModel::Ideal,
    }
}

#[test]
fn diluted_hydrochloric_acid_matches_the_exact_ideal_result() {
    // Exact, ideal: a strong acid at molality c has [H+] = c/2 + sqrt(c²/4 + Kw) (charge balance
    // with water autoionisation, from memory); c is the acid over the water after dilution, ≈ 0.01/d.
    let lib = lib();
    let k = Constants::new(&lib, ideal());
    let recipe = Recipe {
        lines: vec![
            RecipeLine::grams("water", 1000.0),
            RecipeLine::moles("hydrochloric_acid_36", 0.01),
        ],
        qs_to_g: None,
        water_hardness: None,
    };
    let report = evaluate_with(&lib, &k, &recipe).unwrap();
    let b = &report.batch;
    let points = sweep::dilution_sweep(&lib, &k, b, 1.0, 100.0, 3).unwrap();
    assert_eq!(points.len(), 3);
    for (p, d) in points.iter().zip([1.0, 10.0, 100.0]) {
        assert!((p.x / d - 1.0).abs() < 1e-12, "{p:?}");
        let water_kg = b.totals.water_kg + (d - 1.0) * b.total_mass_g * 1e-3;
        let c = 0.01 / water_kg;
        let h = c / 2.0 + (c * c / 4.0 + k.kw).sqrt();
        assert!(
            (p.ph + h.log10()).abs() < 1e-3,
            "d = {d}: {} vs {}",
            p.ph,
            -h.log10()
        );
    }
    // pH 2, 3, 4 to within the water the acid brings (definition of pH, from memory).
    assert!((points[2].ph - 4.0).abs() < 0.01);
}

#[test]
fn diluted_acetate_buffer_agrees_with_the_solver_on_the_diluted_recipe() {
    // Consistency: a sweep point is the recipe with (d − 1) × its mass of water added, solved
    // (definition of the dilution in sweep.rs); Davies activities.
    let lib = lib();
    let k = Constants::new(&lib, Conditions::default());
    let lines = vec![
        RecipeLine::grams("water", 1000.0),
        RecipeLine::moles("acetic_acid", 0.05),
        RecipeLine::moles("sodium_acetate_trihydrate", 0.05),
    ];
    let recipe = Recipe {
        lines: lines.clone(),
        qs_to_g: None,
        water_hardness: None,
    };
    let report = evaluate_with(&lib, &k, &recipe).unwrap();
    let mass = report.batch.total_mass_g;
    let points = sweep::dilution_sweep(&lib, &k, &report.batch, 1.0, 1000.0, 7).unwrap();
    for p in &points {
        let mut more = lines.clone();
        more.push(RecipeLine::grams("water", (p.x - 1.0) * mass));
        let direct = evaluate_with(
            &lib,
            &k,
            &Recipe {
                lines: more,
                qs_to_g: None,
                water_hardness: None,
            },
        )
        .unwrap();
        assert!(
            (p.ph - direct.solution.ph).abs() < 1e-3,
            "{p:?} vs {}",
            direct.solution.ph
        );
    }
    // Log spacing: 1, 3.16, 10, … 1000 (definition of the sweep).
    assert!((points[2].x - 10.0).abs() < 1e-9, "{points:?}");
    // A buffer rises slowly towards neutral on dilution (common practice, no source).
    assert!(points.windows(2).all(|w| w[1].ph >= w[0].ph));
}

#[test]
fn pure_water_follows_the_neutral_ph_of_iapws() {
    // Neutral pH = pKw/2, pKw at 0.1 MPa from IAPWS R11-07 (Bandura & Lvov, J. Phys. Chem. Ref.
    // Data 35 (2006) 15), computed with the Python package `thermo` (Kweq_IAPWS with the IAPWS-95
    // density of `chemicals`); tolerance 0.005 on pKw, so 0.0025 on pH.
    let pkw = [
        (0.0, 14.946),
        (10.0, 14.534),
        (20.0, 14.165),
        (30.0, 13.833),
        (40.0, 13.534),
        (50.0, 13.264),
        (60.0, 13.020),
        (80.0, 12.598),
    ];
    let lib = lib();
    let recipe = Recipe::in_grams(&[("water", 1000.0)]);
    let report = evaluate_with(&lib, &Constants::new(&lib, ideal()), &recipe).unwrap();
    let points =
        sweep::temperature_sweep(&lib, Conditions::default(), &report.batch, 0.0, 80.0, 9).unwrap();
    assert_eq!(points.len(), 9);
    for (t, p) in pkw {
        let got = points.iter().find(|q| (q.x - t).abs() < 1e-9).unwrap();
        assert!(
            (got.ph - p / 2.0).abs() < 0.0025,
            "{t} °C: {} vs {}",
            got.ph,
            p / 2.0
        );
    }
}

#[test]
fn bad_ranges_are_refused_with_a_reason() {
    // Input rules of the sweep (definition in sweep.rs and the limits table).
    assert!(matches!(
        sweep::dilution_points(0.5, 10.0, 5),
        Err(SweepError::Dilution { .. })
    ));
    assert!(matches!(
        sweep::dilution_points(1.0, f64::NAN, 5),
        Err(SweepError::Dilution { .. })
    ));
    assert!(matches!(
        sweep::dilution_points(10.0, 2.0, 5),
        Err(SweepError::EmptyRange { .. })
    ));
    assert!(matches!(
        sweep::dilution_points(1.0, 10.0, 1),
        Err(SweepError::Points { points: 1 })
    ));
    let e = sweep::temperature_points(0.0, 100.0, 5).unwrap_err();
    assert!(e.to_string().contains("0–95 °C"), "{e}");
    assert!(sweep::temperature_points(-1.0, 20.0, 5).is_err());
    assert_eq!(
        sweep::temperature_points(0.0, 95.0, 2).unwrap(),
        vec![0.0, 95.0]
    );
}
