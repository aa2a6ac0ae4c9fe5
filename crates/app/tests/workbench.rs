//! The workbench driven as a person drives it: by the labels on the screen.
#![expect(
    clippy::unwrap_used,
    reason = "tests fail loudly on a missing widget or file"
)]

mod common;

use std::path::Path;

use common::{citric_project, type_into};
use egui::{Key, Modifiers};
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable as _;
use saltwise::{Command, ConfigStore, Workbench};
use saltwise_chem::project::Project;
use saltwise_chem::{Conditions, Library, Recipe, RecipeLine, report};

fn harness(project: Project, config_dir: &Path) -> Harness<'static, Workbench> {
    Harness::builder()
        .with_size([1600.0, 1000.0])
        .build_ui_state(
            |ui, app: &mut Workbench| app.show(ui),
            Workbench::with_project(project, ConfigStore::at(config_dir)),
        )
}

fn expected_ph(project: &Project) -> f64 {
    let library = Library::built_in().unwrap();
    let conditions = Conditions {
        temp_c: project.settings.temp_c,
        activity: project.settings.activity,
    };
    report::evaluate(&library, project.recipe(), conditions)
        .unwrap()
        .solution
        .ph
}

#[test]
fn adding_citric_acid_from_the_picker_and_typing_its_amount_shows_the_computed_ph() {
    let dir = tempfile::tempdir().unwrap();
    let start = Project::with_recipe(Recipe {
        lines: vec![RecipeLine::grams("water", 500.0)],
        qs_to_g: None,
        water_hardness: None,
    });
    let mut h = harness(start, dir.path());

    type_into(&mut h, "Search the library", "citric");
    h.get_by_label("Add citric acid monohydrate").click();
    h.run();
    assert_eq!(h.state().project().recipe().lines.len(), 2);

    type_into(&mut h, "Amount of line 2", "12.5");
    let project = h.state().project().clone();
    assert_eq!(project.recipe().lines[1].amount.value, 12.5);

    let ph = expected_ph(&project);
    h.get_by_label(&format!("pH {ph:.2}"));
    let shown = h.state().engine().solved().unwrap().solution.ph;
    assert!((shown - ph).abs() < 1e-12, "window {shown}, core {ph}");
}

#[test]
fn choosing_another_adjuster_redraws_the_dose_curve() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness(citric_project(), dir.path());
    let before = h.state().engine().curve().unwrap().clone().unwrap();
    assert_eq!(before.adjuster, "sodium_hydroxide_50");
    assert!(
        before.points.last().unwrap().ph > before.points[0].ph,
        "alkali raises pH"
    );

    h.get_by_label("pH adjuster").click();
    h.run();
    h.get_by_label("hydrochloric acid 36 %").click();
    h.run();

    let after = h.state().engine().curve().unwrap().clone().unwrap();
    assert_eq!(after.adjuster, "hydrochloric_acid_36");
    assert!(
        after.points.last().unwrap().ph < after.points[0].ph,
        "acid lowers pH"
    );
    assert_ne!(before.points, after.points);
}

#[test]
fn a_saved_project_reopens_with_the_same_recipe() {
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("rinse.ron");
    let mut h = harness(citric_project(), dir.path());
    h.state_mut().project_mut().recipe_mut().lines[1]
        .amount
        .value = 7.25;
    h.run();
    assert!(h.state().is_dirty());
    assert!(
        h.state().title().starts_with('•'),
        "unsaved mark in {}",
        h.state().title()
    );

    h.state_mut().queue(Command::SaveToPath(file.clone()));
    h.run();
    assert!(!h.state().is_dirty());
    assert_eq!(h.state().title(), "rinse.ron — Saltwise");
    let saved = h.state().project().clone();

    h.state_mut().queue(Command::New);
    h.run();
    assert!(h.state().project().recipe().lines.is_empty());

    h.state_mut().queue(Command::OpenPath(file.clone()));
    h.run();
    assert_eq!(h.state().project().recipe(), saved.recipe());
    assert_eq!(h.state().project().settings, saved.settings);
    assert_eq!(h.state().file_path(), Some(file.as_path()));

    // The file is remembered in the config folder for the next session.
    let (config, problem) = ConfigStore::at(dir.path()).load();
    assert!(problem.is_none());
    assert_eq!(config.recent_files.first(), Some(&file));
}

#[test]
fn ctrl_z_undoes_a_typed_amount_and_ctrl_shift_z_redoes_it() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness(citric_project(), dir.path());
    type_into(&mut h, "Amount of line 2", "30");
    assert_eq!(h.state().project().recipe().lines[1].amount.value, 30.0);

    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert_eq!(h.state().project().recipe().lines[1].amount.value, 10.0);
    assert!(!h.state().is_dirty());

    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::Z);
    h.run();
    assert_eq!(h.state().project().recipe().lines[1].amount.value, 30.0);
}

#[test]
fn new_with_unsaved_changes_asks_first_and_discarding_goes_ahead() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness(citric_project(), dir.path());
    h.get_by_label("Remove line 1").click();
    h.run();
    assert_eq!(h.state().project().recipe().lines.len(), 1);

    h.state_mut().queue(Command::New);
    h.run();
    assert!(h.state().prompt().is_some(), "asks before dropping changes");
    h.get_by_label("Cancel").click();
    h.run();
    assert_eq!(h.state().project().recipe().lines.len(), 1);

    h.state_mut().queue(Command::Quit);
    h.run();
    assert!(!h.state().quit_requested());
    h.get_by_label("Discard changes").click();
    h.run();
    assert!(h.state().quit_requested());
}

#[test]
fn a_frame_that_changes_nothing_solves_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness(citric_project(), dir.path());
    let solves = h.state().engine().solve_count();
    h.run_steps(5);
    assert_eq!(h.state().engine().solve_count(), solves);
}

#[test]
fn the_demo_project_opens_without_a_panic() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness(Project::demo(), dir.path());
    h.run();
    assert!(h.state().engine().report().is_some());
}

#[test]
fn the_degreaser_demo_file_opens_solves_and_finds_its_citric_dose() {
    let dir = tempfile::tempdir().unwrap();
    let file =
        Path::new(env!("CARGO_MANIFEST_DIR")).join("../../assets/demo/tidewater-degreaser.ron");
    let mut h = harness(Project::default(), dir.path());
    h.state_mut().queue(Command::OpenPath(file));
    h.run();
    assert!(
        h.state().project().name.starts_with("Tidewater"),
        "{:?}",
        h.state().status_text()
    );
    let report = h.state().engine().solved().unwrap();
    assert!(report.solution.ph > 11.5, "starts above its target");
    let curve = h.state().engine().curve().unwrap().as_ref().unwrap();
    let dose = curve.to_target.as_ref().unwrap().as_ref().unwrap();
    assert!((dose.ph_reached - 11.5).abs() < 1e-6);
}

#[test]
fn dragging_an_amount_updates_the_ph_readout_in_the_same_frame() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness(citric_project(), dir.path());
    let start = h.get_by_label("Amount of line 2").rect().center();
    h.drag_at(start);
    h.step();
    for dx in [20.0, 60.0, 120.0] {
        h.hover_at(start + egui::vec2(dx, 0.0));
        h.step();
        let project = h.state().project().clone();
        assert_ne!(
            project.recipe().lines[1].amount.value,
            10.0,
            "the drag moved the amount"
        );
        // One frame only: the readout drawn in it already shows the new recipe's pH.
        h.get_by_label(&format!("pH {:.2}", expected_ph(&project)));
    }
    h.drop_at(start + egui::vec2(120.0, 0.0));
    h.run();
    assert!(h.state().can_undo(), "the whole drag is one undo step");
    h.state_mut().queue(Command::Undo);
    h.run();
    assert_eq!(h.state().project().recipe().lines[1].amount.value, 10.0);
}

#[test]
fn zoom_commands_change_the_zoom_and_remember_it() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness(citric_project(), dir.path());
    h.key_press_modifiers(Modifiers::COMMAND, Key::Plus);
    h.run();
    let zoom = h.state().user_config().zoom;
    assert!(zoom > 1.0);
    let (saved, _) = ConfigStore::at(dir.path()).load();
    assert!((saved.zoom - zoom).abs() < 1e-6);
    h.state_mut().queue(Command::ZoomOut);
    h.run();
    assert!((h.state().user_config().zoom - 1.0).abs() < 1e-4);
}

#[test]
fn a_custom_weak_acid_from_the_form_joins_the_recipe_and_solves() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness(citric_project(), dir.path());
    h.get_by_label("Custom ingredient (a weak acid)").click();
    h.run();
    type_into(&mut h, "Name", "Marsh acid");
    type_into(&mut h, "Formula", "C4H6O4");
    type_into(&mut h, "pKa values", "4.2 5.6");
    type_into(&mut h, "Source", "supplier data sheet MA-7 (invented)");
    h.get_by_label("Add to the project").click();
    h.run();

    let project = h.state().project().clone();
    assert_eq!(project.custom.ingredients.len(), 1);
    let line = project.recipe().lines.last().unwrap();
    assert_eq!(line.ingredient, "custom_marsh_acid");
    let report = h.state().engine().solved().unwrap();
    assert!(report.systems.iter().any(|s| {
        h.state().engine().library().unwrap().systems()[s.system].id == "custom_marsh_acid"
    }));
}

#[test]
fn the_demo_with_its_percent_lines_saves_and_reopens_unchanged() {
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("cleanser.ron");
    let mut h = harness(Project::demo(), dir.path());
    h.state_mut().queue(Command::SaveToPath(file.clone()));
    h.run();
    assert_eq!(
        h.state().file_path(),
        Some(file.as_path()),
        "{:?}",
        h.state().status_text()
    );
    h.state_mut().queue(Command::New);
    h.run();
    h.state_mut().queue(Command::OpenPath(file));
    h.run();
    assert_eq!(h.state().project(), &Project::demo());
}

#[test]
fn switching_a_line_from_percent_to_grams_keeps_its_mass() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness(Project::demo(), dir.path());
    let ph = h.state().engine().solved().unwrap().solution.ph;
    h.get_by_label("Unit of line 1").click();
    h.run();
    h.get_by_role_and_label(egui::accesskit::Role::Button, "g")
        .click();
    h.run();
    let line = &h.state().project().recipe().lines[0];
    assert_eq!(line.amount.unit, saltwise_chem::Unit::Gram);
    assert!(
        (line.amount.value - 8.0).abs() < 1e-9,
        "0.8 % of 1000 g is 8 g, got {}",
        line.amount.value
    );
    let after = h.state().engine().solved().unwrap().solution.ph;
    assert!((after - ph).abs() < 1e-9, "same batch, same pH");
}

#[test]
fn a_product_below_ph_4_shows_its_acid_reserve_among_the_cautions() {
    let dir = tempfile::tempdir().unwrap();
    // The demo cleanser base sits below pH 4 before its pH is adjusted.
    let mut h = harness(Project::demo(), dir.path());
    h.run();
    h.get_by_label_contains("Acid reserve");
    h.get_by_label_contains("screening indicator (Young et al. 1988), not a classification");
    // Raised to pH 5 with sodium hydroxide it has none.
    let mut adjusted = Project::demo();
    adjusted
        .recipe_mut()
        .lines
        .push(RecipeLine::grams("sodium_hydroxide_50", 5.445));
    let mut h = harness(adjusted, dir.path());
    h.run();
    assert!(h.query_by_label_contains("Acid reserve").is_none());
}
