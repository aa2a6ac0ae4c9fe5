//! The charts say what their marks mean: a legend entry for every curve, the target band and the
//! current recipe, on both charts.

mod common;

use common::{Folders, harness_in};
use egui_kittest::kittest::Queryable as _;
use saltwise_chem::project::Project;

#[test]
fn the_dose_curve_legend_names_the_target_band_and_every_mark() {
    let dir = tempfile::tempdir().unwrap();
    // The demo has a target of pH 5.0 ± 0.1 and an equivalence point on its curve.
    let h = harness_in(Project::demo(), &Folders::under(dir.path()));
    for entry in [
        "Target band, pH 5.00 ± 0.10",
        "Current recipe",
        "Equivalence point",
        "Dose to target",
    ] {
        h.get_by_label(entry);
    }
}

#[test]
fn the_species_chart_has_a_legend_of_its_forms_and_the_current_ph() {
    let dir = tempfile::tempdir().unwrap();
    let h = harness_in(Project::demo(), &Folders::under(dir.path()));
    // The lactic acid system is the first in the demo recipe; its two forms are in the legend
    // (and in the table below the chart).
    assert!(h.query_all_by_label("lactic acid").count() >= 2);
    assert!(h.query_all_by_label("lactate").count() >= 2);
    h.get_by_label_contains("Current recipe, pH");
}

#[test]
fn the_readout_shows_the_drift_and_the_species_panel_the_active_form() {
    let dir = tempfile::tempdir().unwrap();
    let h = harness_in(Project::demo(), &Folders::under(dir.path()));
    let drift = *h.state().engine().drift().unwrap().as_ref().unwrap();
    // Acid lowers the pH of the lactate buffer a little, base raises it.
    assert!(drift.acid_1mmol_per_kg < 0.0 && drift.base_1mmol_per_kg > 0.0);
    h.get_by_label(&format!(
        "1 mmol/kg product of strong acid: {:+.2} pH",
        drift.acid_1mmol_per_kg
    ));
    h.get_by_label(&format!("open to air: pH {:.2}", drift.open_to_air_ph));
    // Lactic acid, pKa 3.86 (the library's source), at the demo's pH 3.86: about half is the
    // undissociated, active acid.
    let data = h.state().engine().species().unwrap();
    assert_eq!(data.forms[data.active], "lactic acid");
    h.get_by_label_contains("% at this pH");
    let shown = h
        .query_all_by_label_contains("% at this pH")
        .any(|n| format!("{n:?}").contains("value: \"4"));
    assert!(shown, "about 40–50 % undissociated");
}

#[test]
fn the_in_use_view_charts_dilution_and_temperature_from_the_products_own_point() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(Project::demo(), &Folders::under(dir.path()));
    h.get_by_label("In use: dilution and temperature").click();
    h.run();
    h.get_by_label("pH against dilution");
    h.get_by_label("pH against temperature");
    h.get_by_label("Current recipe, 25.0 °C");
    let state = h.state();
    let ph = state.engine().solved().unwrap().solution.ph;
    let sweeps = state.engine().sweeps().unwrap().as_ref().unwrap();
    // Undiluted (1:1, log10 = 0) is the product itself; at 25 °C likewise.
    assert!((sweeps.dilution[0].y - ph).abs() < 1e-9);
    let at_25 = sweeps
        .temperature
        .iter()
        .find(|p| (p.x - 25.0).abs() < 1e-9)
        .unwrap();
    assert!((at_25.y - ph).abs() < 1e-6, "{} vs {ph}", at_25.y);
    // Diluting a weak-acid buffer with water moves its pH towards neutral (common practice,
    // no source): up, for this acidic product.
    assert!(sweeps.dilution.last().unwrap().y > ph);
}
