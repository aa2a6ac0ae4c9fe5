//! The cautions a person sees: hypochlorite with amines and with acids (also an acid that is only
//! the chosen pH adjuster), the reserve, and the deferral to the safety data sheet with each.

mod common;

use common::{Folders, harness_in};
use egui_kittest::kittest::Queryable as _;
use saltwise_chem::project::Project;
use saltwise_chem::{Recipe, RecipeLine};

fn bleach_with(extra: &str, adjuster: &str) -> Project {
    let mut p = Project::with_recipe(Recipe {
        lines: vec![
            RecipeLine::grams("water", 900.0),
            RecipeLine::grams("sodium_hypochlorite_12", 80.0),
            RecipeLine::grams("sodium_hydroxide", 2.0),
        ],
        qs_to_g: None,
        water_hardness: None,
    });
    p.name = "Harbourline bleach cleaner (invented)".into();
    if !extra.is_empty() {
        p.recipe_mut().lines.push(RecipeLine::grams(extra, 5.0));
    }
    p.settings.adjuster = adjuster.into();
    p
}

#[test]
fn hypochlorite_with_a_primary_amine_warns_of_chloramines_and_defers() {
    let dir = tempfile::tempdir().unwrap();
    let h = harness_in(
        bleach_with("monoethanolamine", "sodium_hydroxide_50"),
        &Folders::under(dir.path()),
    );
    h.get_by_label("Chloramine risk:");
    h.get_by_label("Safety data:");
    assert!(
        h.query_by_label("Chlorine gas risk:").is_none(),
        "no acid, alkaline product"
    );
}

#[test]
fn hypochlorite_with_a_tertiary_amine_has_its_own_wording() {
    let dir = tempfile::tempdir().unwrap();
    let h = harness_in(
        bleach_with("triethanolamine", "sodium_hydroxide_50"),
        &Folders::under(dir.path()),
    );
    h.get_by_label("Hypochlorite with a tertiary amine:");
    assert!(h.query_by_label("Chloramine risk:").is_none());
}

#[test]
fn an_acid_chosen_only_as_the_adjuster_raises_the_chlorine_gas_caution() {
    let dir = tempfile::tempdir().unwrap();
    let h = harness_in(
        bleach_with("", "hydrochloric_acid_36"),
        &Folders::under(dir.path()),
    );
    h.get_by_label("Chlorine gas risk:");
    h.get_by_label_contains("the acid chosen as pH adjuster, hydrochloric acid 36 %");
    h.get_by_label("Safety data:");
}

#[test]
fn the_reserve_alone_comes_with_the_deferral() {
    let dir = tempfile::tempdir().unwrap();
    // The demo reads pH 3.9: below 4, so the acid reserve shows; its lactic acid line is
    // corrosive as supplied, and the safety-data line closes the list.
    let h = harness_in(Project::demo(), &Folders::under(dir.path()));
    h.get_by_label("Acid reserve:");
    h.get_by_label_contains("threshold");
    h.get_by_label_contains("not a classification");
    h.get_by_label("Safety data:");
}
