//! Measured titrations in the window: readings pasted or imported, the fit of chosen unknowns
//! with its standard errors, and the fitted ingredient saved to the user's library.

mod common;

use common::{Folders, harness_in};
use egui_kittest::kittest::Queryable as _;
use saltwise::Command;
use saltwise_chem::project::Project;
use saltwise_chem::qc::{Titrant, Titration};
use saltwise_chem::{Conditions, Constants, Library, Recipe};

/// An invented drain opener as the recipe says it: 2 % of a 50 % lye.
fn drain_opener() -> Project {
    let mut p = Project::with_recipe(Recipe::in_grams(&[
        ("water", 980.0),
        ("sodium_hydroxide_50", 20.0),
    ]));
    p.name = "Ostrava drain opener".into();
    p
}

/// Readings of 10 g of the product as it really is — the lye at 47 % — titrated with 0.1 N HCl,
/// read by a meter 0.05 pH high with seeded noise of about 0.01 pH (its mean taken out); written with semicolons
/// and decimal commas, as a spreadsheet in many locales exports them.
fn readings() -> String {
    let lib = Library::built_in().expect("built-in library");
    let constants = Constants::new(&lib, Conditions::default());
    let truth = Recipe::in_grams(&[
        ("water", 980.0 + 20.0 * 0.53),
        ("sodium_hydroxide", 20.0 * 0.47),
    ])
    .batch(&lib)
    .expect("valid recipe");
    let titrant = Titrant::find(&lib, "hydrochloric_acid_36", 0.1).expect("a titrant");
    let t = Titration::new(&lib, &constants, &truth, 10.0, &titrant).expect("a titration");
    let mut seed: u64 = 0x5eed;
    let mut noise = || {
        // SplitMix64, then a uniform draw scaled to a standard deviation of 0.01 pH.
        seed = seed.wrapping_add(0x9e37_79b9_7f4a_7c15);
        let mut z = seed;
        z = (z ^ (z >> 30)).wrapping_mul(0xbf58_476d_1ce4_e5b9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94d0_49bb_1331_11eb);
        let u = ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 53) as f64;
        (u - 0.5) * 0.01 * 12f64.sqrt()
    };
    // Centred, so that the offset the readings carry is exactly 0.05 pH.
    let draws: Vec<f64> = (0..=40).map(|_| noise()).collect();
    let mean = draws.iter().sum::<f64>() / draws.len() as f64;
    let mut text = String::from("mL;pH\n");
    for (i, e) in draws.iter().enumerate() {
        let ml = i as f64 * 0.75;
        let ph = t.ph_at(ml) + 0.05 + (e - mean);
        text += &format!("{ml:.2};{ph:.3}\n").replace('.', ",");
    }
    text
}

/// Scrolls the widget named `label` into view and clicks it, as a person does.
fn press(h: &mut egui_kittest::Harness<'_, saltwise::Workbench>, label: &str) {
    h.get_by_label(label).scroll_to_me();
    h.run();
    h.get_by_label(label).click();
    h.run();
}

fn option(h: &mut egui_kittest::Harness<'_, saltwise::Workbench>, name: &str) {
    h.get_by_role_and_label(egui::accesskit::Role::Button, name)
        .click();
    h.run();
}

#[test]
fn pasted_readings_are_fitted_and_the_fitted_lye_is_saved_to_the_library() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    let mut h = harness_in(drain_opener(), &folders);
    h.get_by_label("Measured titration and fit").click();
    h.run();
    h.get_by_label("Pasted readings").focus();
    h.run();
    // Pasted, as from a spreadsheet (typed text would lose its line breaks).
    h.event(egui::Event::Paste(readings()));
    h.run();
    press(&mut h, "Add pasted readings");
    h.run();
    let measured = &h.state().project().measured;
    assert_eq!(measured.len(), 1);
    assert_eq!(measured[0].points.len(), 41);
    assert_eq!(measured[0].titrant, "hydrochloric_acid_36");
    assert!(h.query_by_label_contains("Imported 41 readings").is_some());

    press(&mut h, "Effective assay of");
    h.run();
    press(&mut h, "Assay fitted");
    h.run();
    option(&mut h, "sodium hydroxide 50 % solution");
    press(&mut h, "Fit");
    h.run();
    let fit = match &h.state().panels_fit_result() {
        Some(Ok(f)) => f.clone(),
        other => panic!("{other:?}"),
    };
    // The readings were made at 47 % and +0.05 pH: both come back within two standard errors.
    let assay = fit.parameter("assay:sodium_hydroxide_50").unwrap();
    let se = assay.std_error.unwrap();
    assert!(
        (assay.value - 47.0).abs() < 2.0 * se,
        "{} ± {se}",
        assay.value
    );
    let offset = fit.parameter("meter-offset").unwrap();
    let se = offset.std_error.unwrap();
    assert!(
        (offset.value - 0.05).abs() < 2.0 * se,
        "{} ± {se}",
        offset.value
    );
    assert!(fit.rms_ph < 0.02, "{}", fit.rms_ph);
    assert!(h.query_all_by_label_contains("RMS residual").count() >= 1);
    assert!(
        h.query_by_label_contains("Correlation of the parameters")
            .is_some()
    );

    common::type_into(&mut h, "Fitted ingredient id", "lot_9_lye");
    press(&mut h, "Save to my library");
    h.run();
    let file = folders
        .data
        .join(saltwise_chem::user_library::USER_LIBRARY_FILE);
    let text = std::fs::read_to_string(&file).expect("the user library was written");
    assert!(text.contains("lot_9_lye"));
    let base = h.state().engine().base_library().unwrap();
    let saved = base.entry("lot_9_lye").expect("usable at once");
    assert!((saved.ingredient.assay * 100.0 - assay.value).abs() < 1e-6);
    assert!(h.query_by_label_contains("Saved 'lot_9_lye'").is_some());
}

#[test]
fn bad_readings_are_refused_with_their_line_and_kept_for_correcting() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(drain_opener(), &Folders::under(dir.path()));
    h.get_by_label("Measured titration and fit").click();
    h.run();
    h.get_by_label("Pasted readings").focus();
    h.run();
    h.event(egui::Event::Paste("0;12,9\n1;twelve\n".into()));
    h.run();
    press(&mut h, "Add pasted readings");
    h.run();
    assert!(h.state().project().measured.is_empty());
    assert!(
        h.query_by_label_contains("Could not import the pasted readings")
            .is_some()
    );
    assert!(h.query_all_by_label_contains("line 2").count() >= 1);
    // The text stays in the field, to be corrected.
    assert!(h.query_all_by_label_contains("twelve").count() >= 1);
}

#[test]
fn a_readings_file_is_imported_under_its_name_and_saved_with_the_project() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(drain_opener(), &Folders::under(dir.path()));
    h.run();
    let path = dir.path().join("lot-9.csv");
    std::fs::write(&path, readings()).unwrap();
    h.state_mut().queue(Command::ImportReadingsFromPath(path));
    h.run();
    let measured = h.state().project().measured.clone();
    assert_eq!(measured.len(), 1);
    assert_eq!(measured[0].name, "lot-9.csv");
    assert_eq!(measured[0].source_file, "lot-9.csv");
    let back = Project::from_ron(&h.state().project().to_ron().unwrap(), "test").unwrap();
    assert_eq!(back.measured, measured);
    // One undo step takes it out again.
    h.state_mut().queue(Command::Undo);
    h.run();
    assert!(h.state().project().measured.is_empty());
}
