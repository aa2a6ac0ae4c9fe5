//! The pH band under weighing tolerances and assay ranges: collapse at zero tolerance, width
//! against the sensitivity, seeded reproducibility, and the sampled batches against re-resolved
//! recipes.

use saltwise_chem::tolerance::{BandRun, Perturber, ToleranceError, Tolerances, band, percentile};
use saltwise_chem::{Conditions, Constants, Library, Recipe, RecipeLine, evaluate};

/// An invented citrate buffer with salt, weighed in grams.
fn citrate() -> Recipe {
    Recipe::in_grams(&[
        ("water", 900.0),
        ("citric_acid_monohydrate", 20.0),
        ("trisodium_citrate_dihydrate", 15.0),
        ("sodium_chloride", 5.0),
    ])
}

fn setup() -> (Library, Constants) {
    let lib = Library::built_in().expect("library");
    let k = Constants::new(&lib, Conditions::default());
    (lib, k)
}

#[test]
fn zero_tolerances_collapse_onto_the_nominal_ph() {
    let (lib, k) = setup();
    let b = band(&lib, &k, &citrate(), &Tolerances::default(), 200, 3).expect("band");
    let nominal = evaluate(&lib, &citrate(), Conditions::default())
        .expect("solves")
        .solution
        .ph;
    // Identity of the model: no draw moves anything (exact up to solver tolerance, no source).
    assert!((b.nominal_ph - nominal).abs() < 1e-9, "{b:?}");
    for p in [b.p05, b.p50, b.p95] {
        assert!((p - nominal).abs() < 1e-9, "{b:?}");
    }
}

#[test]
fn a_one_line_band_matches_its_sensitivity() {
    let (lib, k) = setup();
    let tol = Tolerances {
        per_ingredient: vec![("citric_acid_monohydrate".into(), 2.0)],
        ..Tolerances::default()
    };
    let b = band(&lib, &k, &citrate(), &tol, 4000, 11).expect("band");
    let s = b
        .sensitivity
        .iter()
        .find(|s| s.id == "citric_acid_monohydrate")
        .expect("ranked");
    // For δ uniform in ±2 % and pH linear in δ, p95 − p05 = 0.9 · 2 · 2 % · |dpH/%| (the
    // quantiles of a uniform distribution, from memory). With 4000 samples each quantile's
    // standard error is √(0.05·0.95/4000)/density ≈ 0.011 of the full ±2 % width (order
    // statistics, from memory), about 1.2 % of the expected band; curvature over ±2 % adds far
    // less. 5 % allows about four standard errors (common practice, no source).
    let expected = 2.0 * 0.9 * 2.0 * s.dph_per_percent.abs();
    let width = b.p95 - b.p05;
    assert!(
        (width / expected - 1.0).abs() < 0.05,
        "width {width}, expected {expected}"
    );
    // Only the citric line varies, so the median stays at the nominal pH within a fraction of
    // the band (symmetry of the uniform draw; common practice, no source).
    assert!((b.p50 - b.nominal_ph).abs() < 0.05 * width, "{b:?}");
}

#[test]
fn the_same_seed_gives_the_same_band_and_another_seed_another() {
    let (lib, k) = setup();
    let tol = Tolerances {
        all_percent: 1.0,
        assay: vec![("citric_acid_monohydrate".into(), 0.98, 1.0)],
        ..Tolerances::default()
    };
    let a = band(&lib, &k, &citrate(), &tol, 300, 42).expect("band");
    let b = band(&lib, &k, &citrate(), &tol, 300, 42).expect("band");
    let c = band(&lib, &k, &citrate(), &tol, 300, 43).expect("band");
    // Determinism of the seeded generator (the contract; no source needed beyond the code).
    assert_eq!(a, b);
    assert_ne!((a.p05, a.p50, a.p95), (c.p05, c.p50, c.p95));
}

#[test]
fn sensitivities_are_sorted_by_size() {
    let (lib, k) = setup();
    let b = band(&lib, &k, &citrate(), &Tolerances::default(), 1, 0).expect("band");
    assert_eq!(b.sensitivity.len(), 4);
    for w in b.sensitivity.windows(2) {
        assert!(w[0].dph_per_percent.abs() >= w[1].dph_per_percent.abs());
    }
    // More acid lowers the pH, more citrate salt raises it (the direction of the salt rule,
    // from memory).
    let by = |id: &str| {
        b.sensitivity
            .iter()
            .find(|s| s.id == id)
            .expect("line")
            .dph_per_percent
    };
    assert!(by("citric_acid_monohydrate") < 0.0);
    assert!(by("trisodium_citrate_dihydrate") > 0.0);
}

#[test]
fn a_scaled_line_solves_like_the_recipe_weighed_that_way() {
    // q.s., a hydrate and an ingredient below 100 % assay: the sampled batch must match the
    // recipe re-resolved with that line's grams (identity of the model; no source).
    let (lib, k) = setup();
    let mut recipe = Recipe::in_grams(&[
        ("lactic_acid_88", 8.0),
        ("sodium_lactate_60", 10.0),
        ("sodium_acetate_trihydrate", 3.0),
    ]);
    recipe.qs_to_g = Some(500.0);
    let p = Perturber::new(&lib, &k, &recipe, &Tolerances::default()).expect("prepares");
    let moved = p.solve(&[0.03, -0.02, 0.05], &[]);
    let mut scaled = recipe.clone();
    for (line, f) in scaled.lines.iter_mut().zip([1.03, 0.98, 1.05]) {
        line.amount.value *= f;
    }
    let direct = evaluate(&lib, &scaled, Conditions::default()).expect("solves");
    assert!((moved.ph - direct.solution.ph).abs() < 1e-9);
}

#[test]
fn an_assay_draw_solves_like_the_substance_and_water_it_implies() {
    // 10 g of "88 %" lactic acid that assays 85 %: 8.5 g acid (as 9.659 g of the 88 % grade)
    // and 1.5 g water in all, i.e. 10 − 9.659 = 0.341 g water besides (by hand).
    let (lib, k) = setup();
    let recipe = Recipe::in_grams(&[("water", 200.0), ("lactic_acid_88", 10.0)]);
    let tol = Tolerances {
        assay: vec![("lactic_acid_88".into(), 0.85, 0.85)],
        ..Tolerances::default()
    };
    let p = Perturber::new(&lib, &k, &recipe, &tol).expect("prepares");
    let drawn = p.solve(&[0.0, 0.0], &[0.85]);
    let as_grade = 10.0 * 0.85 / 0.88;
    let mut same = Recipe::in_grams(&[("water", 200.0 + 10.0 - as_grade)]);
    same.lines
        .push(RecipeLine::grams("lactic_acid_88", as_grade));
    let direct = evaluate(&lib, &same, Conditions::default()).expect("solves");
    assert!((drawn.ph - direct.solution.ph).abs() < 1e-9);
}

#[test]
fn bad_specifications_are_refused() {
    let (lib, k) = setup();
    let r = citrate();
    assert!(matches!(
        band(&lib, &k, &r, &Tolerances::default(), 0, 1),
        Err(ToleranceError::Samples { samples: 0 })
    ));
    let not_there = Tolerances {
        per_ingredient: vec![("borax".into(), 1.0)],
        ..Tolerances::default()
    };
    assert!(matches!(
        band(&lib, &k, &r, &not_there, 10, 1),
        Err(ToleranceError::NotInRecipe { .. })
    ));
    let inverted = Tolerances {
        assay: vec![("citric_acid_monohydrate".into(), 1.0, 0.9)],
        ..Tolerances::default()
    };
    assert!(matches!(
        band(&lib, &k, &r, &inverted, 10, 1),
        Err(ToleranceError::BadAssay { .. })
    ));
    let negative = Tolerances {
        all_percent: -1.0,
        ..Tolerances::default()
    };
    assert!(matches!(
        band(&lib, &k, &r, &negative, 10, 1),
        Err(ToleranceError::BadTolerance { .. })
    ));
}

#[test]
fn percentiles_interpolate_between_order_statistics() {
    // Rank p·(n−1) with linear interpolation (the "type 7" rule, from memory): for 0..=10 the
    // 5th percentile is 0.5 and the median 5.
    let v: Vec<f64> = (0..=10).map(f64::from).collect();
    assert!((percentile(&v, 0.05) - 0.5).abs() < 1e-12);
    assert!((percentile(&v, 0.5) - 5.0).abs() < 1e-12);
}

#[test]
fn a_band_drawn_in_parts_equals_the_band_drawn_at_once() {
    let (lib, k) = setup();
    let tol = Tolerances {
        all_percent: 2.0,
        assay: vec![("citric_acid_monohydrate".into(), 0.97, 1.0)],
        ..Tolerances::default()
    };
    let whole = band(&lib, &k, &citrate(), &tol, 250, 7).expect("band");
    let p = Perturber::new(&lib, &k, &citrate(), &tol).expect("perturber");
    let mut run = BandRun::new(250, 7).expect("run");
    // Uneven parts, as a window's frames would draw them (the contract; no source needed).
    for part in [1, 24, 100, 1000] {
        assert!(!run.is_done());
        p.advance(&mut run, part);
    }
    assert!(run.is_done());
    assert_eq!(run.drawn(), 250);
    assert_eq!(p.finish(&run), whole);
    assert!(BandRun::new(0, 1).is_err(), "no samples is refused");
}
