//! The QC titration in the window, used as a person does: open the section, set the method, read
//! the mL to each end point.

mod common;

use common::{Folders, harness_in, type_into};
use egui_kittest::kittest::Queryable as _;
use saltwise_chem::project::Project;
use saltwise_chem::{Recipe, RecipeLine};

/// Na₂CO₃, 105.988 g/mol from the IUPAC 2021 standard atomic weights (Na 22.990, C 12.011,
/// O 15.999).
const NA2CO3_G_PER_MOL: f64 = 105.988;

/// An invented hard-surface cleaner: 1 % sodium carbonate in water.
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

/// The mL shown for each end point, read back from the engine once the section shows them.
fn end_point_ml(h: &egui_kittest::Harness<'_, saltwise::Workbench>) -> Vec<f64> {
    match h.state().engine().qc() {
        Some(Ok(q)) => q.prediction.end_points.iter().map(|e| e.ml).collect(),
        other => panic!("no titration: {other:?}"),
    }
}

#[test]
fn the_qc_section_predicts_p_and_m_for_a_carbonate_product() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(carbonate_cleaner(), &Folders::under(dir.path()));
    h.get_by_label("QC titration").click();
    h.run();
    let ml = end_point_ml(&h);
    // 10 g of a 1 % solution hold 0.1 g Na₂CO₃ = 0.9435 mmol. With 0.1 N HCl, carbonate goes
    // to hydrogen carbonate by pH 8.3 (P, 9.43 mL) and to CO₂ by pH 4.3 (M, twice that);
    // stoichiometry, the end points sitting within a few per cent of the equivalence points
    // (common practice, no source).
    let mmol = 0.1 / NA2CO3_G_PER_MOL * 1e3;
    let (p_ml, m_ml) = (mmol / 0.1, 2.0 * mmol / 0.1);
    assert_eq!(ml.len(), 2);
    assert!((ml[0] - p_ml).abs() / p_ml < 0.05, "P {} vs {p_ml}", ml[0]);
    assert!((ml[1] - m_ml).abs() / m_ml < 0.03, "M {} vs {m_ml}", ml[1]);
    // The window shows them with their bench names.
    assert!(h.query_by_label_contains("P alkalinity").is_some());
    assert!(h.query_by_label_contains("M alkalinity").is_some());
    let shown = format!("{:.2} mL", ml[1]);
    assert!(
        h.query_all_by_label_contains(&shown[..shown.len() - 4])
            .count()
            >= 1,
        "{shown} not shown"
    );
    assert!(
        h.query_by_label_contains("density taken as 1.00 kg/L")
            .is_some()
    );

    // Twice the sample takes twice the titrant.
    type_into(&mut h, "Sample mass", "20");
    h.run();
    assert_eq!(h.state().project().settings.qc.sample_g, 20.0);
    let doubled = end_point_ml(&h);
    assert!(
        (doubled[1] / ml[1] - 2.0).abs() < 0.01,
        "{doubled:?} vs {ml:?}"
    );
}

#[test]
fn end_points_and_the_factor_are_set_in_the_section_and_saved_with_the_project() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(carbonate_cleaner(), &Folders::under(dir.path()));
    h.get_by_label("QC titration").click();
    h.run();
    type_into(&mut h, "End point pH values", "4.5");
    assert_eq!(h.state().project().settings.qc.end_points_ph, vec![4.5]);
    assert_eq!(end_point_ml(&h).len(), 1);
    // An end point outside pH 0–14 is refused beside the field and changes nothing.
    type_into(&mut h, "End point pH values", "4.5, 15");
    assert!(h.query_by_label_contains("pH 14").is_some());
    assert_eq!(h.state().project().settings.qc.end_points_ph, vec![4.5]);

    h.get_by_label("For an in-use sample").click();
    h.run();
    type_into(&mut h, "In-use sample", "50");
    let factor = match h.state().engine().qc() {
        Some(Ok(q)) => q.prediction.factor.expect("a factor"),
        other => panic!("{other:?}"),
    };
    // F = 100·(m/x₀)/V: the definition in qc.rs (common practice, no source).
    let x0 = end_point_ml(&h)[0];
    let expected = 100.0 * (10.0 / x0) / 50.0;
    assert!((factor.percent_per_ml - expected).abs() < 1e-9 * expected);
    assert!(h.query_by_label_contains("Titration factor:").is_some());
    // The method is part of the project, so it is saved and undone with it.
    let ron = h.state().project().to_ron().unwrap();
    let back = Project::from_ron(&ron, "test").unwrap();
    assert_eq!(back.settings.qc.in_use_sample_ml, Some(50.0));
    assert_eq!(back.settings.qc.end_points_ph, vec![4.5]);
}

#[test]
fn a_base_titrant_is_chosen_automatically_for_an_acidic_product() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = harness_in(common::citric_project(), &Folders::under(dir.path()));
    h.get_by_label("QC titration").click();
    h.run();
    let q = match h.state().engine().qc() {
        Some(Ok(q)) => q.clone(),
        other => panic!("{other:?}"),
    };
    assert_eq!(q.titrant, "sodium_hydroxide");
    // 10 g of 10 g citric acid monohydrate (210.14 g/mol, IUPAC atomic weights) in 910 g hold
    // 0.523 mmol, 1.569 mmol of acid protons; all three are titrated by pH 8.3 (pKa₃ 6.4,
    // Martell & Smith, from memory): 15.7 mL of 0.1 N NaOH.
    let expected = 10.0 / 910.0 * 10.0 / 210.14 * 3.0 * 1e3 / 0.1;
    let ml = q.prediction.end_points[0].ml;
    assert!(
        (ml - expected).abs() / expected < 0.02,
        "{ml} vs {expected}"
    );
    assert!(
        h.query_by_label_contains("acidity to phenolphthalein")
            .is_some()
    );
}
