//! Numbers and text typed by hand are checked where they are typed, with the reason beside the
//! field; recipes that cannot be made are refused in the readout instead of getting a pH; the
//! model's validity limits are spelled out beside the pH.

mod common;

use common::{Folders, citric_project, harness_in, type_into};
use egui_kittest::kittest::Queryable as _;
use saltwise_chem::formula::Formula;
use saltwise_chem::library::{Ingredient, LibraryData, Release, System};
use saltwise_chem::project::Project;
use saltwise_chem::{Recipe, RecipeError, RecipeLine};

fn project_of(lines: Vec<RecipeLine>, qs_to_g: Option<f64>) -> Project {
    let mut p = Project::with_recipe(Recipe {
        lines,
        qs_to_g,
        water_hardness: None,
    });
    p.name = "Bench trial".into();
    p
}

#[test]
fn a_negative_amount_is_refused_beside_the_field_and_the_amount_kept() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(citric_project(), &Folders::under(dir.path()));
    type_into(&mut h, "Amount of line 2", "-5");
    h.get_by_label(
        "Amount -5 is not allowed: it is negative; amounts are finite numbers from 0 to 10 000 000 in their unit",
    );
    assert_eq!(h.state().project().recipe().lines[1].amount.value, 10.0);
    assert!(!h.state().is_dirty(), "nothing changed");

    // An accepted amount takes the refusal away.
    type_into(&mut h, "Amount of line 2", "12");
    assert_eq!(h.state().project().recipe().lines[1].amount.value, 12.0);
    assert!(
        h.query_by_label_contains("Amount -5 is not allowed")
            .is_none(),
        "the reason goes once a good value is typed"
    );
}

#[test]
fn an_amount_that_is_not_a_number_is_refused_beside_the_field() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(citric_project(), &Folders::under(dir.path()));
    type_into(&mut h, "Amount of line 2", "ten");
    h.get_by_label(
        "Amount: 'ten' is not a number; amounts are finite numbers from 0 to 10 000 000 in their unit",
    );
    assert_eq!(h.state().project().recipe().lines[1].amount.value, 10.0);
    type_into(&mut h, "Amount of line 2", "inf");
    h.get_by_label_contains("Amount inf is not allowed: it is not a finite number");
    assert_eq!(h.state().project().recipe().lines[1].amount.value, 10.0);
    // A decimal comma is read as people mean it.
    type_into(&mut h, "Amount of line 2", "12,5");
    assert_eq!(h.state().project().recipe().lines[1].amount.value, 12.5);
}

#[test]
fn a_batch_size_of_zero_is_refused_beside_the_field() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(Project::demo(), &Folders::under(dir.path()));
    type_into(&mut h, "Batch size", "0");
    h.get_by_label(
        "q.s. batch size 0 g is not allowed: it is too low; a q.s. batch size is above 0 g and at most 100 000 000 g",
    );
    assert_eq!(h.state().project().recipe().qs_to_g, Some(1000.0));
}

#[test]
fn a_temperature_outside_the_model_is_refused_beside_the_field() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(citric_project(), &Folders::under(dir.path()));
    type_into(&mut h, "Temperature", "120");
    h.get_by_label(
        "Temperature 120 °C is not allowed: it is too high; temperatures are 0–95 °C, the range of the temperature model",
    );
    assert_eq!(h.state().project().settings.temp_c, 25.0);
    type_into(&mut h, "Temperature", "40");
    assert_eq!(h.state().project().settings.temp_c, 40.0);
}

#[test]
fn a_target_ph_outside_minus_one_to_fifteen_is_refused_beside_the_field() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(Project::demo(), &Folders::under(dir.path()));
    type_into(&mut h, "Target pH value", "16");
    h.get_by_label("Target pH 16 is not allowed: it is too high; a target pH is from −1 to 15");
    assert_eq!(h.state().project().settings.target_ph, Some(5.0));
}

#[test]
fn a_largest_dose_of_zero_is_refused_beside_the_field() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(Project::demo(), &Folders::under(dir.path()));
    type_into(&mut h, "Largest dose", "0");
    h.get_by_label(
        "Largest dose 0 g is not allowed: it is too low; the largest dose is above 0 g and at most 1 000 000 g",
    );
    assert_eq!(h.state().project().settings.dose_max_g, 20.0);
}

fn open_custom_form(dir: &std::path::Path) -> egui_kittest::Harness<'static, saltwise::Workbench> {
    let mut h = harness_in(citric_project(), &Folders::under(dir));
    h.get_by_label("Custom ingredient (a weak acid)").click();
    h.run();
    h
}

#[test]
fn custom_ingredient_fields_say_what_is_wrong_as_they_are_typed() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = open_custom_form(dir.path());

    type_into(&mut h, "Assay %", "120");
    h.get_by_label_contains("assay 120 % refused: it is the share of the acid");
    type_into(&mut h, "Assay %", "0");
    h.get_by_label_contains("assay 0 % refused");

    type_into(&mut h, "pKa values", "5.6 4.2");
    h.get_by_label(
        "pKa 4.2 is not above 5.6: give the steps in order, strongest acid first (ascending)",
    );
    type_into(&mut h, "pKa values", "4.2 25");
    h.get_by_label("pKa 25 is outside −5…20, the range a pKa can have here");
    type_into(&mut h, "pKa values", "4.2 x");
    h.get_by_label("pKa 'x' is not a number");

    type_into(&mut h, "Formula", "C6H8Q2");
    let message = Formula::parse("C6H8Q2").unwrap_err().to_string();
    assert!(message.contains("character"), "{message}");
    h.get_by_label(&message);

    // Nothing wrong reaches the project.
    type_into(&mut h, "Name", "Fen acid");
    type_into(&mut h, "Source", "supplier sheet FA-2 (invented)");
    h.get_by_label("Add to the project").click();
    h.run();
    assert!(h.state().project().custom.ingredients.is_empty());
    assert_eq!(h.state().project().recipe().lines.len(), 2);
}

#[test]
fn a_custom_ingredient_with_good_fields_shows_no_reasons_and_is_added() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = open_custom_form(dir.path());
    type_into(&mut h, "Name", "Fen acid");
    type_into(&mut h, "Formula", "C4H4O4");
    type_into(&mut h, "pKa values", "3.0, 4.4");
    type_into(&mut h, "Assay %", "98,5");
    type_into(&mut h, "Source", "supplier sheet FA-2 (invented)");
    assert!(h.query_by_label_contains("is not allowed").is_none());
    assert!(h.query_by_label_contains("is not").is_none());
    h.get_by_label("Add to the project").click();
    h.run();
    let custom = &h.state().project().custom;
    assert_eq!(custom.ingredients.len(), 1);
    assert!((custom.ingredients[0].assay - 0.985).abs() < 1e-12);
    assert_eq!(custom.systems[0].pka, [3.0, 4.4]);
}

/// The readout refuses a recipe with the core's reason, and shows no pH for it.
fn assert_refused_in_readout(project: Project, reason: &str) {
    let dir = tempfile::tempdir().expect("temp dir");
    let h = harness_in(project, &Folders::under(dir.path()));
    h.get_by_label("No pH: the recipe cannot be solved as written.");
    let Some(Err(shown)) = h.state().engine().report() else {
        panic!("the recipe should be refused");
    };
    assert!(shown.contains(reason), "expected '{reason}' in '{shown}'");
    h.get_by_label(shown);
    h.get_by_label("pH —");
    assert!(h.query_by_label_contains("pH 7").is_none());
}

#[test]
fn a_recipe_without_water_is_refused_with_the_reason_instead_of_a_ph() {
    let project = project_of(vec![RecipeLine::grams("sodium_chloride", 5.0)], None);
    assert_refused_in_readout(project, &RecipeError::NoWater.to_string());
}

#[test]
fn more_solids_than_the_qs_batch_is_refused_with_the_reason_instead_of_a_ph() {
    let project = project_of(
        vec![RecipeLine::grams("sodium_chloride", 150.0)],
        Some(100.0),
    );
    assert_refused_in_readout(
        project,
        "q.s. to 100 g is less than the 150 g of the other ingredients",
    );
}

#[test]
fn an_assay_above_100_percent_is_refused_with_the_reason_instead_of_a_ph() {
    let mut project = project_of(
        vec![
            RecipeLine::grams("water", 100.0),
            RecipeLine::grams("custom_fen_acid", 1.0),
        ],
        None,
    );
    project.custom = LibraryData {
        systems: vec![System {
            id: "custom_fen_acid".into(),
            name: "fen acid".into(),
            charge_of_fully_protonated: 0,
            forms: Vec::new(),
            pka: vec![4.4],
            dh_kj_mol: vec![0.0],
            dcp_j_mol_k: Vec::new(),
            pka_ionic_strength: 0.0,
            pka_ionic_strengths: Vec::new(),
            source: "invented".into(),
        }],
        ions: Vec::new(),
        ingredients: vec![Ingredient {
            id: "custom_fen_acid".into(),
            name: "fen acid".into(),
            formula: "C4H4O4".into(),
            assay: 1.2,
            releases: vec![Release::System {
                id: "custom_fen_acid".into(),
                count: 1,
                form: 0,
            }],
            water_per_formula: None,
            hazards: Vec::new(),
            note: String::new(),
        }],
        ..LibraryData::default()
    };
    assert_refused_in_readout(project, "assay 1.2 is outside (0, 1]");
}

/// Every validity warning of the solved recipe is shown in the readout under its heading.
fn assert_warnings_shown(project: Project, expected: &str) {
    let dir = tempfile::tempdir().expect("temp dir");
    let h = harness_in(project, &Folders::under(dir.path()));
    let warnings = h
        .state()
        .engine()
        .solved()
        .expect("solves")
        .warnings
        .clone();
    assert!(
        warnings.iter().any(|w| w.contains(expected)),
        "expected '{expected}' among {warnings:?}"
    );
    h.get_by_label("Limits of this prediction");
    // Shown as sentences: the first letter capitalised.
    for w in &warnings {
        let mut shown = w.clone();
        shown.replace_range(..1, &w[..1].to_uppercase());
        h.get_by_label(&shown);
    }
}

#[test]
fn brine_beyond_the_activity_model_is_flagged_plainly_in_the_readout() {
    let mut project = project_of(
        vec![
            RecipeLine::grams("water", 1000.0),
            RecipeLine::grams("sodium_chloride", 300.0),
        ],
        None,
    );
    project.settings.activity = saltwise_chem::ActivityModel::Davies;
    assert_warnings_shown(project, "is above 0.5 mol/kg");
}

#[test]
fn brine_takes_the_pitzer_model_when_the_model_is_automatic() {
    let project = project_of(
        vec![
            RecipeLine::grams("water", 1000.0),
            RecipeLine::grams("sodium_chloride", 300.0),
        ],
        None,
    );
    let dir = tempfile::tempdir().unwrap();
    let h = harness_in(project, &Folders::under(dir.path()));
    let report = h.state().engine().solved().unwrap();
    assert_eq!(
        report.solution.activity,
        saltwise_chem::ActivityModel::Pitzer
    );
    // 5.1 mol/kg NaCl is inside the Pitzer parameters' range: nothing to flag.
    assert!(report.warnings.is_empty(), "{:?}", report.warnings);
    assert!(
        h.query_by_label("Pitzer (chosen for this recipe)")
            .is_some()
    );
}

#[test]
fn a_ph_outside_the_models_range_is_flagged_plainly_in_the_readout() {
    let project = project_of(vec![RecipeLine::grams("sodium_hydroxide_50", 1000.0)], None);
    assert_warnings_shown(project, "outside");
}

#[test]
fn an_ordinary_recipe_shows_no_limits() {
    let dir = tempfile::tempdir().unwrap();
    let h = harness_in(citric_project(), &Folders::under(dir.path()));
    assert!(h.state().engine().solved().unwrap().warnings.is_empty());
    assert!(h.query_by_label("Limits of this prediction").is_none());
}
