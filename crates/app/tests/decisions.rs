//! The decision tools in the window, used as a person does: variants side by side with their
//! prices and overlaid curves, the tolerance band, buffer design and the chosen active form.

mod common;

use common::{Folders, citric_project, harness_in, type_into};
use egui::{Key, Modifiers};
use egui_kittest::kittest::Queryable as _;
use saltwise::BandState;

/// Clicks the entry `name` of the open drop-down list.
fn option(h: &mut egui_kittest::Harness<'_, saltwise::Workbench>, name: &str) {
    h.get_by_role_and_label(egui::accesskit::Role::Button, name)
        .click();
    h.run();
}

/// Opens the design form and chooses citric acid and trisodium citrate as the pair.
fn choose_citrate_pair(h: &mut egui_kittest::Harness<'_, saltwise::Workbench>) {
    h.get_by_label("Buffer design").click();
    h.run();
    h.get_by_label("Design acid form").click();
    h.run();
    option(h, "citric acid monohydrate");
    h.get_by_label("Design salt form").click();
    h.run();
    option(h, "trisodium citrate dihydrate");
}

#[test]
fn a_new_variant_copies_the_current_one_and_both_are_compared() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(citric_project(), &Folders::under(dir.path()));
    h.get_by_label("Compare variants (1)");
    h.get_by_label("New variant").click();
    h.run();
    assert_eq!(h.state().project().variants().len(), 2);
    assert_eq!(h.state().project().variant().name, "Main (copy)");
    // The copy is current and edited live; the first keeps its recipe.
    h.state_mut().project_mut().recipe_mut().lines[1]
        .amount
        .value = 20.0;
    h.run();
    // A second variant opens the comparison.
    h.get_by_label("Compare variants (2)");
    let rows: Vec<f64> = h
        .state()
        .engine()
        .variant_rows()
        .map(|r| r.summary.as_ref().unwrap().ph)
        .collect();
    assert!(
        rows[1] < rows[0],
        "twice the citric acid reads lower: {rows:?}"
    );
    // Both curves are on the overlay, by name.
    assert!(h.state().engine().variant_rows().all(|r| r.curve.is_ok()));
    assert!(
        h.query_all_by_label("Main (copy)").count() >= 2,
        "the chooser and the table"
    );
    h.get_by_label("Make Main current").click();
    h.run();
    assert_eq!(h.state().project().current(), 0);
    assert!((h.state().project().recipe().lines[1].amount.value - 10.0).abs() < 1e-12);
    // Undo steps back to the copy being current.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert_eq!(h.state().project().current(), 1);
}

#[test]
fn a_variant_is_renamed_and_removed_and_the_last_one_stays() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(citric_project(), &Folders::under(dir.path()));
    h.get_by_label("New variant").click();
    h.run();
    h.get_by_label("Rename variant").click();
    h.run();
    type_into(&mut h, "New variant name", "Potassium salt");
    assert_eq!(h.state().project().variant().name, "Potassium salt");
    h.get_by_label("Remove variant").click();
    h.run();
    assert_eq!(h.state().project().variants().len(), 1);
    assert_eq!(h.state().project().variant().name, "Main");
    // One variant left: Remove is off and clicking it does nothing.
    h.get_by_label("Remove variant").click();
    h.run();
    assert_eq!(h.state().project().variants().len(), 1);
}

#[test]
fn prices_typed_per_ingredient_give_the_cost_per_kg() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(citric_project(), &Folders::under(dir.path()));
    h.get_by_label("Prices").click();
    h.run();
    type_into(&mut h, "Price per kg of citric acid monohydrate", "2,5");
    let prices = &h.state().project().variant().prices;
    assert_eq!(prices.get("citric_acid_monohydrate"), Some(&2.5));
    // 10 g at 2.5 per kg in 910 g of product; water is free: 0.025 / 0.910 = 0.02747 per kg
    // (arithmetic, no source needed).
    h.get_by_label_contains("Cost per kg of product: 0.02747");
    type_into(&mut h, "Price per kg of citric acid monohydrate", "cheap");
    h.get_by_label_contains("is not a number");
    assert_eq!(
        h.state()
            .project()
            .variant()
            .prices
            .get("citric_acid_monohydrate"),
        Some(&2.5),
        "refused text leaves the price as it was"
    );
}

#[test]
fn the_tolerance_band_shows_beside_the_readout_and_holds_the_nominal_ph() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(citric_project(), &Folders::under(dir.path()));
    h.get_by_label("Tolerances and pH band").click();
    h.run();
    h.get_by_label_contains("Set a tolerance above 0 %");
    type_into(&mut h, "Tolerance of every line", "5");
    for _ in 0..50 {
        if !h.state().engine().is_busy() {
            break;
        }
        h.run();
    }
    let Some(BandState::Done(Ok(band))) = h.state().engine().band() else {
        panic!("the band is drawn");
    };
    assert!(band.p05 < band.nominal_ph && band.nominal_ph < band.p95);
    assert_eq!(band.samples, 1000);
    assert!(
        h.query_all_by_label_contains("pH band under the tolerances")
            .count()
            >= 2,
        "readout and chart legend"
    );
    h.get_by_label_contains("pH change per +1 % of a line's amount");
}

#[test]
fn a_designed_buffer_goes_into_the_recipe() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(citric_project(), &Folders::under(dir.path()));
    choose_citrate_pair(&mut h);
    h.get_by_label("Work out amounts").click();
    h.run();
    h.get_by_label("Put these amounts into the recipe").click();
    h.run();
    let report = h.state().engine().solved().unwrap();
    // The form's defaults: pH 5.5 and 0.02 mol/kg water per pH; the contract asks for
    // the pH within 0.005 and the capacity within 1 %.
    assert!(
        (report.solution.ph - 5.5).abs() < 0.005,
        "{}",
        report.solution.ph
    );
    assert!((report.solution.buffer_capacity - 0.02).abs() < 0.0002);
    let lines = &h.state().project().recipe().lines;
    assert_eq!(
        lines.len(),
        3,
        "the citric acid line took its grams, the salt was added"
    );
}

#[test]
fn a_pair_out_of_reach_says_so() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(citric_project(), &Folders::under(dir.path()));
    choose_citrate_pair(&mut h);
    // Far more capacity than the model's cap of 5 mol/kg water of the system can give.
    type_into(&mut h, "Design buffer capacity", "4");
    h.get_by_label("Work out amounts").click();
    h.run();
    h.get_by_label_contains("A buffer capacity of 4 mol/kg water per pH is not reachable");
}

#[test]
fn the_active_form_is_chosen_in_the_species_panel_and_saved() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(citric_project(), &Folders::under(dir.path()));
    h.get_by_label("Active form of the system").click();
    h.run();
    option(&mut h, "dihydrogen citrate");
    h.run();
    assert_eq!(
        h.state().project().settings.active_forms.get("citric"),
        Some(&1)
    );
    let data = h.state().engine().species().unwrap();
    assert_eq!(data.active, 1);
    let shown = format!("{:.3}", data.fractions_now[1] * 100.0);
    assert!(!shown.is_empty());
    h.get_by_label_contains("% at this pH");
}

#[test]
fn the_hand_wash_demo_opens_with_both_variants_compared_and_its_band() {
    let dir = tempfile::tempdir().unwrap();
    let file = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("../../assets/demo/harbourline-hand-wash.ron");
    let mut h = harness_in(
        saltwise_chem::project::Project::default(),
        &Folders::under(dir.path()),
    );
    h.state_mut().queue(saltwise::Command::OpenPath(file));
    for _ in 0..20 {
        h.run();
    }
    assert_eq!(h.state().project().variants().len(), 2);
    h.get_by_label("Compare variants (2)");
    h.get_by_label("Make Salts only current");
    let costs: Vec<Option<f64>> = h
        .state()
        .engine()
        .variant_rows()
        .map(|r| r.summary.as_ref().unwrap().cost_per_kg)
        .collect();
    assert!(
        costs.iter().all(Option::is_some),
        "every line is priced: {costs:?}"
    );
    assert!(matches!(
        h.state().engine().band(),
        Some(BandState::Done(Ok(_)))
    ));
}

#[test]
fn a_tolerance_left_on_a_line_switched_off_says_why_and_can_be_taken_off() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(citric_project(), &Folders::under(dir.path()));
    h.get_by_label("Tolerances and pH band").click();
    h.run();
    h.get_by_label("Own tolerance of citric acid monohydrate")
        .click();
    h.run();
    type_into(&mut h, "Tolerance of citric acid monohydrate", "3");
    assert_eq!(
        h.state().project().settings.tolerances.per_ingredient,
        vec![("citric_acid_monohydrate".to_owned(), 3.0)]
    );
    h.get_by_label("Use line 2").click();
    h.run();
    assert!(
        h.query_all_by_label_contains("No pH band").count() >= 2,
        "readout and section"
    );
    h.get_by_label("Own tolerance of citric acid monohydrate")
        .click();
    h.run();
    assert!(
        h.state()
            .project()
            .settings
            .tolerances
            .per_ingredient
            .is_empty()
    );
    assert!(h.state().engine().band().is_none(), "nothing set, no band");
}
