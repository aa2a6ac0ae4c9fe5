//! Black-box tests of the real `saltwise-cli` binary: the documented contract scripts rely on.

mod common;

use common::*;

use saltwise_chem::project::Project;
use serde_json::Value;

const BUFFER: &[&str] = &[
    "water=900g",
    "citric_acid_monohydrate=20g",
    "trisodium_citrate_dihydrate=15g",
];

#[test]
fn ph_json_carries_the_documented_fields() {
    let mut args = vec!["ph"];
    args.extend(BUFFER);
    args.extend(["--temp", "25", "--json"]);
    let v = json(&args);
    for key in [
        "ph",
        "p_h_conc",
        "ionic_strength",
        "buffer_capacity",
        "temperature_c",
        "water_kg",
        "species",
    ] {
        assert!(v.get(key).is_some(), "missing {key}");
    }
    let ph = v["ph"].as_f64().unwrap();
    assert!((3.0..5.0).contains(&ph), "citrate buffer pH {ph}");
    let species = v["species"].as_array().unwrap();
    assert_eq!(species.len(), 4, "citric acid has four forms");
    let total: f64 = species
        .iter()
        .map(|s| s["fraction"].as_f64().unwrap())
        .sum();
    assert!((total - 1.0).abs() < 1e-12);
    for s in species {
        assert!(s["system"].is_string() && s["charge"].is_i64() && s["molality"].is_f64());
    }
}

#[test]
fn the_cli_gives_the_same_ph_as_the_library() {
    let lib = saltwise_chem::Library::built_in().unwrap();
    let recipe = saltwise_chem::Recipe {
        lines: vec![
            saltwise_chem::RecipeLine::grams("water", 500.0),
            saltwise_chem::RecipeLine::grams("borax", 4.0),
        ],
        qs_to_g: None,
        water_hardness: None,
    };
    let direct =
        saltwise_chem::evaluate(&lib, &recipe, saltwise_chem::Conditions::default()).unwrap();
    let v = json(&["ph", "water=500g", "borax=4g", "--json"]);
    assert!((v["ph"].as_f64().unwrap() - direct.solution.ph).abs() < 1e-12);
}

#[test]
fn qs_fills_the_batch_with_water() {
    let v = json(&["ph", "sodium_benzoate=5g", "--qs-to", "1kg", "--json"]);
    assert!((v["batch_mass_g"].as_f64().unwrap() - 1000.0).abs() < 1e-9);
    assert!((v["water_kg"].as_f64().unwrap() - 0.995).abs() < 1e-9);
}

#[test]
fn curve_csv_has_the_header_and_every_point() {
    let mut args = vec!["curve"];
    args.extend(BUFFER);
    args.extend([
        "--dose",
        "sodium_hydroxide_50=0..20g",
        "--points",
        "201",
        "--csv",
    ]);
    let out = run(&args);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8(out.stdout).unwrap();
    let mut lines = text.lines();
    assert_eq!(lines.next(), Some("dose_g,ph,buffer_capacity"));
    let rows: Vec<Vec<f64>> = lines
        .map(|l| l.split(',').map(|x| x.parse().unwrap()).collect())
        .collect();
    assert_eq!(rows.len(), 201);
    assert_eq!(rows[0][0], 0.0);
    assert!((rows[200][0] - 20.0).abs() < 1e-12);
    assert!(
        rows.windows(2).all(|w| w[1][1] >= w[0][1]),
        "pH rises with NaOH"
    );
}

#[test]
fn curve_accepts_moles_and_reports_end_points() {
    let v = json(&[
        "curve",
        "water=1000g",
        "acetic_acid=6.005g",
        "--dose",
        "sodium_hydroxide=0..0.2mol",
        "--points",
        "401",
        "--json",
    ]);
    let eq = v["equivalence_points"].as_array().unwrap();
    assert_eq!(eq.len(), 1);
    // 0.1 mol acetic acid needs 0.1 mol NaOH = 4.0 g (stoichiometry).
    assert!((eq[0]["dose_g"].as_f64().unwrap() - 4.0).abs() < 0.04);
}

#[test]
fn dose_finds_the_adjuster_amount() {
    let mut args = vec!["dose"];
    args.extend(BUFFER);
    args.extend([
        "--adjuster",
        "sodium_hydroxide_50",
        "--target-ph",
        "5.5",
        "--json",
    ]);
    let v = json(&args);
    assert!(v["amount_g"].as_f64().unwrap() > 0.0);
    assert!((v["ph_reached"].as_f64().unwrap() - 5.5).abs() < 1e-6);
}

#[test]
fn library_json_lists_ingredients_systems_and_ions() {
    let v = json(&["library", "--json"]);
    let ingredients = v["ingredients"].as_array().unwrap();
    assert!(ingredients.len() >= 60);
    for i in ingredients {
        for key in ["id", "formula", "molar_mass", "assay", "releases"] {
            assert!(i.get(key).is_some(), "{} lacks {key}", i["id"]);
        }
        for r in i["releases"].as_array().unwrap() {
            assert!(r.get("system").is_some() != r.get("ion").is_some(), "{r}");
            assert!(r["count"].as_u64().unwrap() >= 1);
            if r.get("system").is_some() {
                assert!(r["form"].is_u64());
            }
        }
    }
    let systems = v["systems"].as_array().unwrap();
    assert!(
        systems
            .iter()
            .all(|s| !s["source"].as_str().unwrap().is_empty() && s["pka"].is_array())
    );
    let ions = v["ions"].as_array().unwrap();
    assert!(ions.iter().any(|i| i["id"] == "hydron" && i["charge"] == 1));
    assert!(
        ions.iter()
            .any(|i| i["id"] == "hydroxide" && i["charge"] == -1)
    );
}

#[test]
fn project_files_from_the_workbench_are_read() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("demo.ron");
    Project::demo().save(&path).unwrap();
    let v = json(&["ph", "--project", path.to_str().unwrap(), "--json"]);
    assert!(v["ph"].as_f64().unwrap().is_finite());
}

#[test]
fn bad_input_gets_a_specific_message() {
    assert!(fails(&["ph", "water=900g", "citrc_acid=3g"]).contains("did you mean citric_acid"));
    assert!(fails(&["ph", "water=900g", "citric_acid=3lb"]).contains("'lb' is not a unit"));
    assert!(fails(&["ph", "water=900g", "citric_acid=-3g"]).contains("negative"));
    assert!(fails(&["ph", "water=900g", "citric_acid=NaNg"]).contains("not a finite number"));
    assert!(fails(&["ph", "citric_acid=3g"]).contains("no water"));
    assert!(fails(&["ph", "water=900g", "--temp", "120"]).contains("0–95 °C"));
    assert!(fails(&["ph", "sodium_chloride=600g", "--qs-to", "500g"]).contains("q.s. to 500 g"));
    assert!(
        fails(&[
            "dose",
            "water=900g",
            "citric_acid=10g",
            "--adjuster",
            "lactic_acid_88",
            "--target-ph",
            "5.5"
        ])
        .contains("choose an alkali")
    );
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("broken.ron");
    std::fs::write(
        &path,
        "(\n  format_version: 1,\n  recipe: (lines: [oops]),\n)\n",
    )
    .unwrap();
    let err = fails(&["ph", "--project", path.to_str().unwrap()]);
    assert!(err.contains("line 3, column"), "{err}");
}

/// The `cautions` array of a JSON answer, as (title, text) pairs.
fn cautions(v: &Value) -> Vec<(String, String)> {
    v["cautions"]
        .as_array()
        .expect("cautions is an array")
        .iter()
        .map(|c| {
            (
                c["title"].as_str().unwrap_or_default().to_owned(),
                c["text"].as_str().unwrap_or_default().to_owned(),
            )
        })
        .collect()
}

#[test]
fn a_reserve_always_comes_with_cautions_and_the_deferral_last() {
    // 20 g gluconic acid 50 % per kg water is near pH 2.6 (0.051 mol/kg, pKa 3.86; by hand):
    // an acid reserve, and no ingredient carries a hazard tag.
    let v = json(&["ph", "water=1000g", "gluconic_acid_50=20g", "--json"]);
    assert_eq!(v["reserve"]["side"], "acid");
    let c = cautions(&v);
    assert!(!c.is_empty(), "{v}");
    let (_, last) = c.last().unwrap();
    assert!(
        last.contains("safety data sheet") && last.contains("licensed practice"),
        "{last}"
    );
    let reserve = c
        .iter()
        .find(|(t, _)| t == "Acid reserve")
        .map(|(_, t)| t.clone());
    let reserve = reserve.unwrap_or_default();
    // Young et al. (1988), from memory: the acid-side threshold is −0.5.
    assert!(reserve.contains("threshold -0.5") && reserve.contains("not a classification"));
    assert!(v.to_string().is_ascii(), "JSON stays ASCII");
}

#[test]
fn effects_are_said_in_one_vocabulary() {
    // Citric acid lowers pH, trisodium citrate raises it, water does nothing (the salt rule,
    // common practice, no source).
    let mut args = vec!["ph"];
    args.extend(BUFFER);
    args.push("sodium_chloride=5g");
    args.push("--json");
    let v = json(&args);
    let effect = |id: &str| {
        v["ingredients"]
            .as_array()
            .unwrap()
            .iter()
            .find(|i| i["id"] == id)
            .map(|i| i["effect"].as_str().unwrap_or_default().to_owned())
            .unwrap_or_default()
    };
    assert_eq!(effect("citric_acid_monohydrate"), "lowers pH");
    assert_eq!(effect("trisodium_citrate_dihydrate"), "raises pH");
    assert_eq!(effect("water"), "no effect");
    assert_eq!(effect("sodium_chloride"), "no effect");
    let salt = v["ingredients"][3]["reason"].as_str().unwrap();
    assert_eq!(
        salt,
        "Na+ and Cl- come from a strong base and a strong acid: neither reacts with water"
    );
    // Text output: the same words, superscript charges, and molality per kg of water.
    let mut args = vec!["ph"];
    args.extend(BUFFER);
    args.push("sodium_chloride=5g");
    let out = run(&args);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("lowers pH: citric acid gives a proton to water: Ka = 7.4×10⁻⁴"),
        "{text}"
    );
    assert!(
        text.contains("Na⁺ and Cl⁻ come from a strong base and a strong acid"),
        "{text}"
    );
    assert!(text.contains("mol/kg water"), "{text}");
    assert!(
        !text.contains("acidifies") && !text.contains("basifies"),
        "{text}"
    );
}

#[test]
fn a_mistyped_id_gets_the_nearest_ids() {
    let err = fails(&["ph", "citrc=1g", "water=100g"]);
    assert!(
        err.contains("unknown ingredient 'citrc'; did you mean citric_acid"),
        "{err}"
    );
}

#[test]
fn a_zero_batch_is_refused_without_contradiction() {
    let err = fails(&["ph", "water=100g", "--qs-to", "0g"]);
    assert!(err.contains("q.s. batch size 0 g is not allowed"), "{err}");
    assert!(err.contains("above 0 g"), "{err}");
    assert!(!err.contains("0 or more"), "{err}");
}

#[test]
fn dose_and_curve_carry_the_cautions_of_an_acid_adjuster_on_hypochlorite() {
    // Acid into hypochlorite releases chlorine (common practice, no source).
    let v = json(&[
        "dose",
        "water=900g",
        "sodium_hypochlorite_12=100g",
        "--adjuster",
        "hydrochloric_acid_36",
        "--target-ph",
        "9",
        "--json",
    ]);
    let c = cautions(&v);
    assert!(
        c.iter()
            .any(|(t, x)| t == "Chlorine gas risk" && x.contains("pH adjuster")),
        "{v}"
    );
    assert!(
        c.last()
            .is_some_and(|(_, x)| x.contains("safety data sheet")),
        "{v}"
    );
    assert!(
        v["amount_g"].as_f64().unwrap() > 0.0,
        "the documented fields stay"
    );
    let v = json(&[
        "curve",
        "water=900g",
        "sodium_hypochlorite_12=100g",
        "--dose",
        "hydrochloric_acid_36=0..1g",
        "--points",
        "5",
        "--json",
    ]);
    let c = cautions(&v);
    assert!(c.iter().any(|(t, _)| t == "Chlorine gas risk"), "{v}");
    assert_eq!(v["points"].as_array().unwrap().len(), 5);
    // Text output carries them too.
    let out = run(&[
        "dose",
        "water=900g",
        "sodium_hypochlorite_12=100g",
        "--adjuster",
        "hydrochloric_acid_36",
        "--target-ph",
        "9",
    ]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("Chlorine gas risk") && text.contains("safety data sheet"),
        "{text}"
    );
}

#[test]
fn projects_open_through_the_checked_loader() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("typo.ron");
    let mut p = Project::demo();
    p.recipe_mut().lines[0].ingredient = "lactic_acd_88".into();
    p.save(&path).unwrap();
    let err = fails(&["ph", "--project", path.to_str().unwrap()]);
    assert!(err.contains("unknown ingredient 'lactic_acd_88'"), "{err}");
    assert!(err.contains("line ") && err.contains("column"), "{err}");
}

#[test]
fn every_demo_project_loads_and_solves() {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../../assets/demo");
    let mut seen = 0;
    for entry in std::fs::read_dir(&dir).expect("the demo folder") {
        let path = entry.expect("an entry").path();
        if path.extension().and_then(|e| e.to_str()) != Some("ron") {
            continue;
        }
        let p = path.to_string_lossy().into_owned();
        let v = json(&["ph", "--project", &p, "--json"]);
        assert!(v["ph"].as_f64().is_some_and(f64::is_finite), "{p}");
        assert_eq!(v["converged"], true, "{p}");
        seen += 1;
    }
    assert!(seen >= 4, "{seen} demo projects");
}
