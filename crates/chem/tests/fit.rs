//! Fits of measured titrations: synthetic titrations from known parameters with seeded noise are
//! recovered within two standard errors; a textbook's worked titration gives back its answer;
//! unidentifiable fits say so; refusals; saving a fitted ingredient to the user library.

use saltwise_chem::fit::{self, FitError, Unknown};
use saltwise_chem::measured::{MeasuredPoint, MeasuredTitration};
use saltwise_chem::qc::QcError;
use saltwise_chem::user_library::{
    MAX_USER_LIBRARY_BYTES, Provenance, USER_LIBRARY_FILE, UserLibrary, fitted_entry,
};
use saltwise_chem::{Conditions, Library, Recipe};

fn lib() -> Library {
    Library::built_in().expect("built-in library")
}

/// A small seeded generator (SplitMix64) and Box–Muller normal draws, so the noise is the same
/// on every run (SplitMix64 constants as published by Steele, Lea and Flood, from memory).
struct Noise(u64);

impl Noise {
    fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    fn uniform(&mut self) -> f64 {
        ((self.next_u64() >> 11) as f64 + 0.5) / (1u64 << 53) as f64
    }

    fn normal(&mut self, sigma: f64) -> f64 {
        let (u1, u2) = (self.uniform(), self.uniform());
        sigma * (-2.0 * u1.ln()).sqrt() * (2.0 * std::f64::consts::PI * u2).cos()
    }
}

/// Noise of a pH reading, pH (a bench meter reads to ±0.01, common practice, no source).
const SIGMA_PH: f64 = 0.01;

fn titration(titrant: &str, normality: f64, sample_g: f64, ml: &[f64]) -> MeasuredTitration {
    MeasuredTitration {
        name: "synthetic".into(),
        titrant: titrant.into(),
        normality,
        sample_g,
        points: ml
            .iter()
            .map(|&v| MeasuredPoint {
                titrant: v,
                ph: 7.0,
                temp_c: None,
            })
            .collect(),
        source_file: "synthetic.csv".into(),
        imported: "2025-01-01".into(),
        ..MeasuredTitration::default()
    }
}

/// Readings made from the model at known values, with seeded noise added.
fn synthetic(
    recipe: &Recipe,
    mut t: MeasuredTitration,
    unknowns: &[Unknown],
    truth: &[f64],
    seed: u64,
) -> MeasuredTitration {
    let ph = fit::simulate(&lib(), Conditions::default(), recipe, &t, unknowns, truth)
        .expect("simulate");
    let mut noise = Noise(seed);
    for (p, v) in t.points.iter_mut().zip(ph) {
        p.ph = (v + noise.normal(SIGMA_PH)).clamp(0.0, 14.0);
    }
    t
}

fn volumes(to: f64, step: f64) -> Vec<f64> {
    let n = (to / step).round() as usize;
    (0..=n).map(|i| i as f64 * step).collect()
}

fn assert_within_two_se(f: &fit::Fit, name: &str, truth: f64) {
    let p = f.parameter(name).expect("parameter");
    let se = p.std_error.expect("a standard error");
    assert!(
        (p.value - truth).abs() <= 2.0 * se,
        "{name}: fitted {} ± {se}, true {truth}",
        p.value
    );
    assert!(
        p.determined,
        "{name} should be determined: {:?}",
        f.warnings
    );
}

/// An invented product: "Kestrel Oven Degreaser", 2 % of 50 % lye in water.
fn degreaser() -> Recipe {
    Recipe::in_grams(&[("water", 980.0), ("sodium_hydroxide_50", 20.0)])
}

#[test]
fn assay_and_meter_offset_recovered_from_a_caustic_titration() {
    let unknowns = [
        Unknown::Assay("sodium_hydroxide_50".into()),
        Unknown::MeterOffset,
    ];
    // True values chosen for the test: the lye at 47.0 % instead of 50 %, the meter reading
    // 0.05 pH high. 10 g of product hold 2.35 mmol NaOH: 23.5 mL of 0.1 N HCl (stoichiometry).
    let truth = [47.0, 0.05];
    let t = synthetic(
        &degreaser(),
        titration("hcl", 0.1, 10.0, &volumes(32.0, 1.0)),
        &unknowns,
        &truth,
        1,
    );
    let f = fit::fit(&lib(), Conditions::default(), &degreaser(), &t, &unknowns).expect("fit");
    assert!(f.converged, "{}", f.termination);
    assert_within_two_se(&f, "assay:sodium_hydroxide_50", truth[0]);
    assert_within_two_se(&f, "meter-offset", truth[1]);
    // The RMS residual is the noise put in (σ = 0.01), within a factor 1.5 for 33 readings
    // (chi-square spread, common practice, no source).
    assert!(
        f.rms_ph > SIGMA_PH / 1.5 && f.rms_ph < SIGMA_PH * 1.5,
        "{}",
        f.rms_ph
    );
    assert!(f.start_rms_ph > f.rms_ph);
    assert_eq!(f.residuals.len(), 33);
    assert_eq!(f.degrees_of_freedom, 31);
    assert_eq!(f.correlation.len(), 2);
    assert_eq!(f.correlation[0][0], 1.0);
    assert!(f.correlation[0][1].abs() < CORRELATION_LIMIT);
    assert!(f.warnings.is_empty(), "{:?}", f.warnings);
    assert_eq!(f.curve.len(), fit::CURVE_POINTS);
    // Residuals are measured − fitted.
    let r = &f.residuals[3];
    assert!((r.residual - (r.measured_ph - r.fitted_ph)).abs() < 1e-12);
}

const CORRELATION_LIMIT: f64 = fit::CORRELATION_LIMIT;

/// An invented product: "Lindenfield Rinse Base", a salt solution holding an acid of unknown
/// identity.
fn rinse_base() -> Recipe {
    Recipe::in_grams(&[("water", 995.0), ("sodium_chloride", 5.0)])
}

#[test]
fn unknown_acid_amount_and_pka_recovered() {
    let unknowns = [Unknown::UnknownAcid { pka_start: 4.0 }];
    // True values chosen for the test: 20 mmol/kg of a monoprotic acid of pKa 4.76. 50 g hold
    // 1.0 mmol: 10 mL of 0.1 N NaOH to equivalence (stoichiometry).
    let truth = [20.0, 4.76];
    let t = synthetic(
        &rinse_base(),
        titration("naoh", 0.1, 50.0, &volumes(14.0, 0.5)),
        &unknowns,
        &truth,
        7,
    );
    let f = fit::fit(&lib(), Conditions::default(), &rinse_base(), &t, &unknowns).expect("fit");
    assert!(f.converged, "{}", f.termination);
    assert_within_two_se(&f, "unknown-acid:amount", truth[0]);
    assert_within_two_se(&f, "unknown-acid:pka", truth[1]);
    assert_eq!(f.parameter("unknown-acid:pka").map(|p| p.start), Some(4.0));
}

#[test]
fn unknown_base_recovered_with_a_meter_offset() {
    let unknowns = [
        Unknown::UnknownBase { pka_start: 9.0 },
        Unknown::MeterOffset,
    ];
    // True values chosen for the test: 15 mmol/kg of a base whose acid has pKa 9.5 (an amine),
    // the meter 0.03 pH low; 40 g titrated with 0.1 N HCl, 6 mL to equivalence.
    let truth = [15.0, 9.5, -0.03];
    let t = synthetic(
        &rinse_base(),
        titration("hcl", 0.1, 40.0, &volumes(9.0, 0.3)),
        &unknowns,
        &truth,
        11,
    );
    let f = fit::fit(&lib(), Conditions::default(), &rinse_base(), &t, &unknowns).expect("fit");
    assert!(f.converged, "{}", f.termination);
    assert_within_two_se(&f, "unknown-base:amount", truth[0]);
    assert_within_two_se(&f, "unknown-base:pka", truth[1]);
    assert_within_two_se(&f, "meter-offset", truth[2]);
}

#[test]
fn an_assay_that_does_not_move_ph_is_flagged_not_determined() {
    // Sodium chloride brings no acid or base: its assay cannot show in a titration.
    let recipe = Recipe::in_grams(&[
        ("water", 975.0),
        ("sodium_hydroxide_50", 20.0),
        ("sodium_chloride", 5.0),
    ]);
    let unknowns = [
        Unknown::Assay("sodium_hydroxide_50".into()),
        Unknown::Assay("sodium_chloride".into()),
    ];
    let t = synthetic(
        &recipe,
        titration("hcl", 0.1, 10.0, &volumes(30.0, 1.0)),
        &unknowns,
        &[48.0, 100.0],
        3,
    );
    let f = fit::fit(&lib(), Conditions::default(), &recipe, &t, &unknowns).expect("fit");
    let salt = f.parameter("assay:sodium_chloride").expect("parameter");
    assert!(!salt.determined);
    assert!(
        f.warnings
            .iter()
            .any(|w| w.contains("assay:sodium_chloride") && w.contains("flat sensitivity")),
        "{:?}",
        f.warnings
    );
}

#[test]
fn two_grades_of_the_same_alkali_cannot_be_told_apart() {
    // Both lines bring only NaOH: any mix of their assays with the same total fits equally well.
    let recipe = Recipe::in_grams(&[
        ("water", 986.0),
        ("sodium_hydroxide_50", 10.0),
        ("sodium_hydroxide", 4.0),
    ]);
    let unknowns = [
        Unknown::Assay("sodium_hydroxide_50".into()),
        Unknown::Assay("sodium_hydroxide".into()),
    ];
    let t = synthetic(
        &recipe,
        titration("hcl", 0.1, 10.0, &volumes(30.0, 1.0)),
        &unknowns,
        &[48.0, 97.0],
        5,
    );
    let f = fit::fit(&lib(), Conditions::default(), &recipe, &t, &unknowns).expect("fit");
    assert!(
        f.parameters.iter().all(|p| !p.determined),
        "{:?}",
        f.parameters
    );
    assert!(
        f.warnings
            .iter()
            .any(|w| w.contains("cannot tell them apart") || w.contains("singular")),
        "{:?}",
        f.warnings
    );
}

#[test]
fn refusals() {
    let l = lib();
    let c = Conditions::default();
    let r = degreaser();
    let assay = [Unknown::Assay("sodium_hydroxide_50".into())];
    let mut t = titration("hcl", 0.1, 10.0, &[0.0, 5.0, 10.0]);
    // Fewer readings than parameters.
    let two = [assay[0].clone(), Unknown::MeterOffset];
    let mut one = t.clone();
    one.points.truncate(1);
    assert!(matches!(
        fit::fit(&l, c, &r, &one, &two),
        Err(FitError::TooFewPoints {
            points: 1,
            parameters: 2,
            ..
        })
    ));
    // No readings.
    let mut empty = t.clone();
    empty.points.clear();
    assert_eq!(
        fit::fit(&l, c, &r, &empty, &assay),
        Err(FitError::NoReadings)
    );
    // A titrant that is not a strong acid or base.
    t.titrant = "sodium_chloride".into();
    assert!(matches!(
        fit::fit(&l, c, &r, &t, &assay),
        Err(FitError::Qc(QcError::NotStrong { .. }))
    ));
    // A sample of 0 g.
    t.titrant = "hcl".into();
    t.sample_g = 0.0;
    let e = fit::fit(&l, c, &r, &t, &assay).expect_err("0 g refused");
    assert!(matches!(e, FitError::Limit(_)), "{e}");
    assert!(e.to_string().contains("sample"), "{e}");
    // An assay of an ingredient the recipe does not hold; nothing to fit; twice the same.
    t.sample_g = 10.0;
    assert!(matches!(
        fit::fit(&l, c, &r, &t, &[Unknown::Assay("citric_acid".into())]),
        Err(FitError::NotInRecipe { .. })
    ));
    assert_eq!(fit::fit(&l, c, &r, &t, &[]), Err(FitError::NoUnknowns));
    assert!(matches!(
        fit::fit(
            &l,
            c,
            &r,
            &t,
            &[
                Unknown::UnknownAcid { pka_start: 4.0 },
                Unknown::UnknownBase { pka_start: 9.0 }
            ]
        ),
        Err(FitError::Twice { .. })
    ));
}

#[test]
fn unknowns_parse() {
    assert_eq!(
        Unknown::parse("assay:sodium_hydroxide_50"),
        Ok(Unknown::Assay("sodium_hydroxide_50".into()))
    );
    assert_eq!(
        Unknown::parse("unknown-acid:4.8"),
        Ok(Unknown::UnknownAcid { pka_start: 4.8 })
    );
    assert_eq!(
        Unknown::parse("unknown-base:9.2"),
        Ok(Unknown::UnknownBase { pka_start: 9.2 })
    );
    assert_eq!(Unknown::parse("meter-offset"), Ok(Unknown::MeterOffset));
    for bad in [
        "assay:",
        "unknown-acid",
        "unknown-acid:x",
        "unknown-acid:40",
        "slope",
        "meter-offset:1",
    ] {
        assert!(
            matches!(
                Unknown::parse(bad),
                Err(FitError::BadUnknown { .. } | FitError::Limit(_))
            ),
            "{bad}"
        );
    }
}

#[test]
fn fitted_unknown_acid_and_assay_saved_to_the_user_library() {
    let l = lib();
    let unknowns = [Unknown::UnknownAcid { pka_start: 4.0 }];
    let t = synthetic(
        &rinse_base(),
        titration("naoh", 0.1, 50.0, &volumes(14.0, 0.5)),
        &unknowns,
        &[20.0, 4.76],
        7,
    );
    let f = fit::fit(&l, Conditions::default(), &rinse_base(), &t, &unknowns).expect("fit");
    // No formula: refused with the reason.
    assert!(fitted_entry(&l, &f, "lot_acid", None, "x").is_err());
    let entry = fitted_entry(
        &l,
        &f,
        "lot_acid",
        Some("C2H4O2"),
        "data synthetic.csv, 2025-01-01",
    )
    .expect("entry");
    let mut user = UserLibrary::default();
    let prov = Provenance {
        id: "lot_acid".into(),
        data_file: "synthetic.csv".into(),
        date: "2025-01-01".into(),
        ..Provenance::default()
    };
    user.add(&l, entry.clone(), prov.clone()).expect("added");
    // The same id twice, or an id of the built-in library, is refused.
    assert!(user.add(&l, entry, prov.clone()).is_err());
    let taken = fitted_entry(&l, &f, "citric_acid", Some("C2H4O2"), "x").expect("entry");
    assert!(user.add(&l, taken, prov).is_err());
    // Written and read back, it extends the library with a usable ingredient.
    let text = user.to_ron().expect("ron");
    let back = UserLibrary::from_ron(&text, "user-library.ron").expect("parse");
    assert_eq!(back, user);
    let extended = back.extend(&l).expect("extends");
    let e = extended.entry("lot_acid").expect("saved ingredient");
    // Acetic acid's formula C2H4O2: 60.05 g/mol (IUPAC atomic weights, from memory).
    assert!((e.molar_mass_g_per_mol - 60.05).abs() < 0.01);
    let s = &extended.systems()[extended.system_index("lot_acid").expect("system")];
    assert!((s.pka[0] - 4.76).abs() < 0.1);

    // The assay of a fitted lye, copied with the fitted assay.
    let f = fitted_lye(&l);
    let entry = fitted_entry(&l, &f, "lye_lot_9", None, "x").expect("entry");
    assert!((entry.ingredients[0].assay - 0.47).abs() < 0.005);
}

/// The degreaser's lye assay fitted to a synthetic HCl titration made at 47 %.
fn fitted_lye(l: &Library) -> fit::Fit {
    let unknowns = [Unknown::Assay("sodium_hydroxide_50".into())];
    let t = synthetic(
        &degreaser(),
        titration("hcl", 0.1, 10.0, &volumes(32.0, 1.0)),
        &unknowns,
        &[47.0],
        2,
    );
    fit::fit(l, Conditions::default(), &degreaser(), &t, &unknowns).expect("fit")
}

#[test]
fn the_user_library_file_is_read_added_to_atomically_and_a_bad_one_never_overwritten() {
    let l = lib();
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("data").join(USER_LIBRARY_FILE);
    // No file yet: an empty library.
    assert_eq!(
        UserLibrary::read_file(&path).expect("no file"),
        UserLibrary::default()
    );
    let f = fitted_lye(&l);
    let prov = |id: &str| Provenance {
        id: id.into(),
        data_file: "lye.csv".into(),
        date: "2026-12-04".into(),
        ..Provenance::default()
    };
    let entry = fitted_entry(&l, &f, "lye_lot_9", None, "x").expect("entry");
    // The first save makes the folder and the file.
    let saved = UserLibrary::add_to_file(&path, &l, entry, prov("lye_lot_9")).expect("saved");
    assert_eq!(UserLibrary::read_file(&path).expect("read back"), saved);
    // The second keeps the previous copy beside it.
    let entry = fitted_entry(&l, &f, "lye_lot_10", None, "x").expect("entry");
    UserLibrary::add_to_file(&path, &l, entry, prov("lye_lot_10")).expect("saved");
    let backup = path.with_extension("ron.bak");
    let previous = std::fs::read_to_string(&backup).expect("backup kept");
    assert_eq!(
        UserLibrary::from_ron(&previous, "backup").expect("parse"),
        saved
    );
    // A taken id is refused and the file is left as it was.
    let before = std::fs::read(&path).expect("file");
    let entry = fitted_entry(&l, &f, "lye_lot_9", None, "x").expect("entry");
    assert!(UserLibrary::add_to_file(&path, &l, entry, prov("lye_lot_9")).is_err());
    assert_eq!(std::fs::read(&path).expect("file"), before);
    // A broken file is an error naming it, and adding to it does not overwrite it.
    std::fs::write(&path, "(not a user library").expect("write");
    let e = UserLibrary::read_file(&path).expect_err("broken");
    assert!(e.to_string().contains(USER_LIBRARY_FILE), "{e}");
    let entry = fitted_entry(&l, &f, "lye_lot_11", None, "x").expect("entry");
    assert!(UserLibrary::add_to_file(&path, &l, entry, prov("lye_lot_11")).is_err());
    assert_eq!(
        std::fs::read_to_string(&path).expect("file"),
        "(not a user library"
    );
    // An oversized one is refused before it is read.
    let big = vec![b' '; usize::try_from(MAX_USER_LIBRARY_BYTES).expect("fits") + 1];
    std::fs::write(&path, big).expect("write");
    let e = UserLibrary::read_file(&path).expect_err("too large");
    assert!(e.to_string().contains("at most"), "{e}");
}

/// The worked titration curve of a textbook: 50.00 mL of 0.02000 M MES (pKa 6.27) titrated with
/// 0.1000 M NaOH, equivalence at 10.00 mL (D. C. Harris, Quantitative Chemical Analysis, W. H.
/// Freeman, chapter on acid–base titrations, the table "titration curve for MES treated with
/// NaOH"; from memory). The book computes it with concentrations for activities and
/// Kw = 1.00e-14, so the check fits it the same way, ideal. Each value was also worked by hand
/// here with the book's method (quadratic at 0 mL, Henderson–Hasselbalch before equivalence, the
/// conjugate base's Kb at 10.00 mL, excess OH⁻ after), and every one agrees to the 0.01 shown.
const TEXTBOOK_MES: [(f64, f64); 16] = [
    (0.00, 3.99),
    (0.50, 4.99),
    (1.00, 5.32),
    (2.00, 5.67),
    (3.00, 5.90),
    (4.00, 6.09),
    (5.00, 6.27),
    (6.00, 6.45),
    (7.00, 6.64),
    (8.00, 6.87),
    (9.00, 7.22),
    (9.50, 7.55),
    (9.90, 8.27),
    (10.00, 9.25),
    (10.10, 10.22),
    (11.00, 11.21),
];

#[test]
fn a_textbook_titration_gives_back_its_acid_amount_and_pka() {
    let mut t = titration("naoh", 0.1, 50.0, &TEXTBOOK_MES.map(|(ml, _)| ml));
    for (p, (_, ph)) in t.points.iter_mut().zip(TEXTBOOK_MES) {
        p.ph = ph;
    }
    let ideal = Conditions {
        activity: saltwise_chem::ActivityModel::Ideal,
        ..Conditions::default()
    };
    // The sample is the acid in water: 50.00 mL taken as 50.00 g (the book's mol/L as mol/kg).
    let water = Recipe::in_grams(&[("water", 1000.0)]);
    let unknowns = [Unknown::UnknownAcid { pka_start: 5.0 }];
    let f = fit::fit(&lib(), ideal, &water, &t, &unknowns).expect("fit");
    assert!(f.converged, "{}", f.termination);
    // The book's answer: 0.02000 M, i.e. 20.0 mmol/kg, and pKa 6.27. The model's titrant adds
    // 0.4 % NaOH by mass to the water it brings and its pKw is 13.995 (IAPWS R11-07), not
    // 14.00: both move the recovered values by well under the tolerances.
    let amount = f.parameter("unknown-acid:amount").expect("amount");
    let pka = f.parameter("unknown-acid:pka").expect("pKa");
    assert!((amount.value - 20.0).abs() < 0.1, "amount {}", amount.value);
    assert!((pka.value - 6.27).abs() < 0.01, "pKa {}", pka.value);
    assert!(amount.determined && pka.determined, "{:?}", f.warnings);
    // The table is rounded to 0.01 pH: the residuals are of that size.
    assert!(f.rms_ph < 0.02, "rms {}", f.rms_ph);
}
