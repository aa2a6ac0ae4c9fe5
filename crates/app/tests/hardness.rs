//! Hard water, ions and scale in the window, used as a person does.

mod common;

use common::{Folders, harness_in, type_into};
use egui_kittest::kittest::Queryable as _;
use saltwise_chem::project::Project;
use saltwise_chem::{Recipe, RecipeLine};

/// An invented hard-surface cleaner: sodium carbonate in water.
fn carbonate_cleaner() -> Project {
    let mut p = Project::with_recipe(Recipe {
        lines: vec![
            RecipeLine::grams("water", 990.0),
            RecipeLine::grams("sodium_carbonate", 10.0),
        ],
        qs_to_g: None,
        water_hardness: None,
    });
    p.name = "Kestrel hard-surface cleaner".into();
    p
}

#[test]
fn hard_water_shows_free_calcium_and_a_scale_caution() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(carbonate_cleaner(), &Folders::under(dir.path()));
    assert!(h.query_by_label_contains("Free Ca²⁺").is_none());
    h.get_by_label("Hard water, ions and scale").click();
    h.run();
    h.get_by_label("Made with hard water").click();
    h.run();
    type_into(&mut h, "Water hardness", "300");
    let recipe = h.state().project().recipe().clone();
    let hardness = recipe.water_hardness.expect("hard water set");
    assert_eq!(hardness.ppm_caco3, 300.0);
    // The readout (and the open section) now name the free calcium and magnesium.
    assert!(h.query_all_by_label_contains("Free Ca²⁺").count() >= 1);
    // 2 mmol/kg Ca²⁺ with 94 mmol/kg carbonate at pH 11 is far above calcite's Ksp
    // (10^−8.48, Plummer & Busenberg 1982, from memory): a scale caution shows.
    let report = h.state().engine().solved().unwrap();
    let si = report.speciation.saturation_index("calcite").unwrap();
    assert!(si > 1.0, "{si}");
    assert!(
        h.query_by_label_contains("Scale: calcite can deposit")
            .is_some()
    );
    // The saturation table marks it too.
    assert!(h.query_all_by_label_contains("can deposit").count() >= 2);
    // Off again: the water is purified, and nothing about calcium is left.
    h.get_by_label("Made with hard water").click();
    h.run();
    assert!(h.state().project().recipe().water_hardness.is_none());
    assert_eq!(h.query_all_by_label_contains("Free Ca²⁺").count(), 0);
}

#[test]
fn a_hardness_out_of_range_is_refused_beside_the_field() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(carbonate_cleaner(), &Folders::under(dir.path()));
    h.get_by_label("Hard water, ions and scale").click();
    h.run();
    h.get_by_label("Made with hard water").click();
    h.run();
    type_into(&mut h, "Water hardness", "20000");
    assert!(h.query_by_label_contains("10 000 ppm").is_some());
    assert_eq!(
        h.state()
            .project()
            .recipe()
            .water_hardness
            .unwrap()
            .ppm_caco3,
        250.0
    );
}

#[test]
fn the_ion_list_names_the_model_and_the_estimated_coefficients() {
    let dir = tempfile::tempdir().unwrap();
    let mut project = carbonate_cleaner();
    project.settings.activity = saltwise_chem::ActivityModel::Pitzer;
    let mut h = harness_in(project, &Folders::under(dir.path()));
    h.get_by_label("Hard water, ions and scale").click();
    h.run();
    h.get_by_label("Every ion (Pitzer activity model)").click();
    h.run();
    h.get_by_label("carbonic/2");
    // Na⁺ with CO₃²⁻ has published parameters (Harvie, Møller & Weare 1984): not estimated.
    let report = h.state().engine().solved().unwrap();
    assert!(
        !report
            .speciation
            .fallback_ions()
            .contains(&"carbonic/2".to_owned())
    );
}

#[test]
fn settling_lists_the_calcite_formed_and_the_ph_left() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(carbonate_cleaner(), &Folders::under(dir.path()));
    h.get_by_label("Hard water, ions and scale").click();
    h.run();
    h.get_by_label("Made with hard water").click();
    h.run();
    type_into(&mut h, "Water hardness", "300");
    assert!(h.query_by_label_contains("Settles out").is_none());
    h.get_by_label("Let supersaturated solids settle out")
        .click();
    h.run();
    assert!(h.state().project().settings.precipitate);
    let p = h.state().engine().settled().expect("settled").clone();
    let calcite = p
        .formed
        .iter()
        .find(|f| f.solid == "calcite")
        .expect("calcite forms");
    // 300 ppm as CaCO₃, 70 % of it calcium, is 2.1 mmol Ca²⁺ per kg water; with 94 mmol/kg of
    // carbonate nearly all of it settles (calcite Ksp 10^−8.48, Plummer & Busenberg 1982, from
    // memory): between 90 % and 100 % of 2.1 mmol/kg (stoichiometry).
    let mmol = calcite.mol_per_kg_water * 1e3;
    assert!(mmol > 0.9 * 2.1 && mmol <= 2.1, "{mmol}");
    // The readout and the section both say so, in grams per kg of product.
    assert!(
        h.query_all_by_label_contains("Settles out: calcite")
            .count()
            >= 2
    );
    assert!(h.query_by_label_contains("g per kg of product").is_some());
    // Saved with the project.
    let ron = h.state().project().to_ron().unwrap();
    assert!(
        saltwise_chem::project::Project::from_ron(&ron, "test")
            .unwrap()
            .settings
            .precipitate
    );
}

/// Chooses what the species panel shows, as a person does: open the list, click the entry.
fn choose_species(h: &mut egui_kittest::Harness<'_, saltwise::Workbench>, entry: &str) {
    h.get_by_label("Species system").click();
    h.run();
    h.get_by_role_and_label(egui::accesskit::Role::Button, entry)
        .click();
    h.run();
}

/// An invented dish liquid base: calcium chloride and tetrasodium EDTA in water.
fn chelated_base() -> Project {
    let mut p = Project::with_recipe(Recipe::in_grams(&[
        ("water", 1000.0),
        ("calcium_chloride_dihydrate", 0.147),
        ("tetrasodium_edta_39", 1.95),
    ]));
    p.name = "Wrenfield dish base".into();
    p
}

#[test]
fn the_species_panel_charts_where_calcium_is_against_ph() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(chelated_base(), &Folders::under(dir.path()));
    choose_species(&mut h, "calcium (Ca²⁺): free, bound, settled");
    assert_eq!(
        h.state().project().settings.species_system.as_deref(),
        Some("calcium")
    );
    let d = h.state().engine().metal().expect("a metal chart").clone();
    assert_eq!(d.metal, "calcium");
    // 1 mmol/kg Ca²⁺ with 2 mmol/kg EDTA at the recipe's pH (about 10.5): bound, as log K(CaY²⁻)
    // 10.65 (Martell & Smith, from memory) says.
    assert!(h.query_by_label_contains("mostly with").is_some());
    assert!(h.query_all_by_label_contains("free Ca²⁺").count() >= 1);
    let edta = d.parts.iter().position(|p| p == "edta").expect("edta part");
    let at_ten = d
        .points
        .iter()
        .find(|(ph, _)| (ph - 10.0).abs() < 1e-9)
        .unwrap();
    assert!(at_ten.1[edta] > 0.99);
}

/// An invented zinc mouth-rinse base: zinc sulfate in water.
fn zinc_rinse() -> Project {
    let mut p = Project::with_recipe(Recipe::in_grams(&[
        ("water", 1000.0),
        ("zinc_sulfate_heptahydrate", 0.29),
    ]));
    p.name = "Harrowgate zinc rinse base".into();
    p
}

#[test]
fn the_species_panel_charts_zinc_free_and_as_hydroxo_complexes() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(zinc_rinse(), &Folders::under(dir.path()));
    choose_species(&mut h, "zinc (Zn²⁺): free, bound, settled");
    let d = h.state().engine().metal().expect("a metal chart").clone();
    assert_eq!(d.metal, "zinc");
    assert!(h.query_all_by_label_contains("free Zn²⁺").count() >= 1);
    assert!(
        h.query_all_by_label_contains("as hydroxo complexes")
            .count()
            >= 1
    );
    // Zinc is free at pH 5 and held as hydroxo complexes (zincate) at pH 13: log *β1 −8.96,
    // *β4 −41.2 (Baes & Mesmer, The Hydrolysis of Cations, 1976, from memory).
    let hydroxo = d
        .parts
        .iter()
        .position(|p| p == "hydroxide")
        .expect("hydroxo part");
    let share = |ph: f64| {
        d.points
            .iter()
            .min_by(|a, b| (a.0 - ph).abs().total_cmp(&(b.0 - ph).abs()))
            .map(|p| p.1[hydroxo])
            .expect("points")
    };
    assert!(share(5.0) < 0.01, "{}", share(5.0));
    assert!(share(13.0) > 0.99, "{}", share(13.0));
}
