//! Black-box tests of `saltwise-cli compare` and `ph --project FILE --variant NAME`: one row
//! per variant of every file, agreeing with `ph`, costs from the variants' prices.
#![expect(
    clippy::unwrap_used,
    reason = "tests fail loudly on a missing file or value"
)]

mod common;

use std::path::Path;

use common::*;
use saltwise_chem::project::Project;
use saltwise_chem::{Recipe, RecipeLine};

/// A project of two variants: citric acid alone (all priced, current), and citric acid with
/// trisodium citrate (the citrate unpriced). Invented prices.
fn write_two_variants(dir: &Path) -> String {
    let mut p = Project::with_recipe(Recipe {
        lines: vec![RecipeLine::grams("citric_acid_monohydrate", 10.0)],
        qs_to_g: Some(1000.0),
        water_hardness: None,
    });
    p.name = "Fernhill descaler trial (invented)".into();
    p.rename_variant(0, "Acid only").unwrap();
    p.variant_mut()
        .prices
        .insert("citric_acid_monohydrate".into(), 3.0);
    p.copy_current();
    p.rename_variant(1, "Acid and salt").unwrap();
    p.recipe_mut()
        .lines
        .push(RecipeLine::grams("trisodium_citrate_dihydrate", 8.0));
    p.set_current(0);
    let path = dir.join("descaler.ron");
    p.save(&path).unwrap();
    path.display().to_string()
}

fn v1_file() -> String {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("../../tests/data/project-v1.ron")
        .display()
        .to_string()
}

#[test]
fn compare_lists_every_variant_of_every_file_and_agrees_with_ph() {
    let dir = tempfile::tempdir().unwrap();
    let file = write_two_variants(dir.path());
    let v1 = v1_file();
    let out = json(&["compare", &file, &v1, "--json"]);
    let rows = out["variants"].as_array().expect("variants");
    let names: Vec<(&str, &str)> = rows
        .iter()
        .map(|r| (r["file"].as_str().unwrap(), r["name"].as_str().unwrap()))
        .collect();
    assert_eq!(
        names,
        [
            (file.as_str(), "Acid only"),
            (file.as_str(), "Acid and salt"),
            (v1.as_str(), "Main")
        ]
    );
    for r in rows {
        let (f, name) = (r["file"].as_str().unwrap(), r["name"].as_str().unwrap());
        let ph = json(&["ph", "--project", f, "--variant", name, "--json"]);
        for key in ["ph", "buffer_capacity", "ionic_strength"] {
            let (a, b) = (r[key].as_f64().unwrap(), ph[key].as_f64().unwrap());
            assert!(
                (a - b).abs() <= 1e-12 * b.abs().max(1.0),
                "{name} {key}: {a} vs {b}"
            );
        }
        // `cautions` counts the cautions; the closing deferral to the safety data sheet is
        // not one of them.
        let shown = ph["cautions"].as_array().unwrap().len();
        assert_eq!(
            r["cautions"].as_u64().unwrap() as usize,
            shown.saturating_sub(1)
        );
    }
    // The salt raises the pH of the acid alone.
    assert!(rows[1]["ph"].as_f64().unwrap() > rows[0]["ph"].as_f64().unwrap() + 0.5);
    // The same variant from items: the project adds nothing hidden.
    let items = json(&[
        "ph",
        "citric_acid_monohydrate=10g",
        "--qs-to",
        "1000g",
        "--json",
    ]);
    assert!((rows[0]["ph"].as_f64().unwrap() - items["ph"].as_f64().unwrap()).abs() < 1e-12);
}

#[test]
fn cost_per_kg_comes_from_the_prices_and_is_null_when_one_is_missing() {
    let dir = tempfile::tempdir().unwrap();
    let file = write_two_variants(dir.path());
    let out = json(&["compare", &file, "--json"]);
    let rows = out["variants"].as_array().unwrap();
    // 10 g at 3.0 per kg in a 1 kg batch, q.s. water free: 0.030 per kg (arithmetic).
    let cost = rows[0]["cost_per_kg"].as_f64().expect("priced");
    assert!((cost - 0.030).abs() < 1e-12, "{cost}");
    assert!(rows[1]["cost_per_kg"].is_null());
    assert_eq!(rows[1]["missing_prices"][0], "trisodium_citrate_dihydrate");
    // Buffer-forming ingredients as weighed: 10 g and 18 g in 1 kg.
    assert!((rows[0]["buffer_forming_g_per_kg"].as_f64().unwrap() - 10.0).abs() < 1e-9);
    assert!((rows[1]["buffer_forming_g_per_kg"].as_f64().unwrap() - 18.0).abs() < 1e-9);
}

#[test]
fn ph_of_a_project_defaults_to_its_current_variant() {
    let dir = tempfile::tempdir().unwrap();
    let file = write_two_variants(dir.path());
    let current = json(&["ph", "--project", &file, "--json"]);
    let named = json(&["ph", "--project", &file, "--variant", "Acid only", "--json"]);
    assert_eq!(current["ph"], named["ph"]);
    let text = stdout_ok(&["compare", &file]);
    assert!(
        text.contains("Acid and salt") && text.contains("no price"),
        "{text}"
    );
}

#[test]
fn bad_variant_requests_are_refused_plainly() {
    let dir = tempfile::tempdir().unwrap();
    let file = write_two_variants(dir.path());
    let err = fails(&["ph", "--project", &file, "--variant", "Salt only", "--json"]);
    assert!(
        err.contains("no variant called 'Salt only'")
            && err.contains("'Acid only', 'Acid and salt'"),
        "{err}"
    );
    let err = fails(&["ph", "citric_acid=1g", "--variant", "A"]);
    assert!(err.contains("--project"), "{err}");
    let err = fails(&["compare", "/nonexistent/none.ron", "--json"]);
    assert!(err.contains("none.ron"), "{err}");
    fails(&["compare", "--json"]);
}

#[test]
fn ph_of_a_project_reports_the_active_form_the_project_chose() {
    let dir = tempfile::tempdir().unwrap();
    let mut p = Project::with_recipe(Recipe {
        lines: vec![RecipeLine::grams("citric_acid_monohydrate", 10.0)],
        qs_to_g: Some(1000.0),
        water_hardness: None,
    });
    // Form 1 of citric acid: one proton removed (dihydrogen citrate).
    p.settings.active_forms.insert("citric".into(), 1);
    let file = dir.path().join("chosen.ron");
    p.save(&file).unwrap();
    let file = file.display().to_string();
    let chosen = json(&["ph", "--project", &file, "--json"]);
    let plain = json(&[
        "ph",
        "citric_acid_monohydrate=10g",
        "--qs-to",
        "1000g",
        "--json",
    ]);
    let form = |v: &serde_json::Value| {
        let f = v["active_forms"]
            .as_array()
            .unwrap()
            .iter()
            .find(|f| f["system"] == "citric")
            .unwrap()
            .clone();
        (f["form"].as_u64().unwrap(), f["fraction"].as_f64().unwrap())
    };
    let (chosen_form, chosen_fraction) = form(&chosen);
    let (plain_form, plain_fraction) = form(&plain);
    assert_eq!(
        (chosen_form, plain_form),
        (1, 0),
        "the default is the uncharged acid"
    );
    // Fractions of one system's forms at one pH add to 1 (mass balance), and at pH ~2.6 the
    // undissociated acid dominates.
    assert!(plain_fraction > chosen_fraction && plain_fraction + chosen_fraction <= 1.0);
}
