//! The command-line contract of concentrates and hard water: `ph --json` ions, activity,
//! complexes, saturation and fallback ions, `--activity pitzer`, and `--hardness`.

mod common;

use common::*;

fn find<'a>(list: &'a serde_json::Value, key: &str, id: &str) -> &'a serde_json::Value {
    list.as_array()
        .expect("a list")
        .iter()
        .find(|x| x[key] == id)
        .unwrap_or_else(|| panic!("{id} not in {list}"))
}

#[test]
fn brine_under_pitzer_reports_every_ion_with_its_coefficient() {
    // 1 mol/kg NaCl: γ± = 0.657 (Robinson & Stokes, Electrolyte Solutions, 1959, appendix 8.10,
    // from memory), within 1 %.
    let v = json(&[
        "ph",
        "water=1000g",
        "sodium_chloride=58.44g",
        "--activity",
        "pitzer",
        "--json",
    ]);
    assert_eq!(v["activity"], "pitzer");
    let ions = &v["ions"];
    let na = find(ions, "id", "sodium");
    let cl = find(ions, "id", "chloride");
    assert_eq!(na["charge"], 1);
    assert_eq!(cl["charge"], -1);
    assert!((na["molality"].as_f64().unwrap() - 1.0).abs() < 1e-3);
    let mean = (na["gamma"].as_f64().unwrap() * cl["gamma"].as_f64().unwrap()).sqrt();
    assert!((mean - 0.657).abs() / 0.657 < 0.01, "γ± {mean}");
    for id in ["hydron", "hydroxide"] {
        find(ions, "id", id);
    }
    assert!(
        v["fallback_ions"]
            .as_array()
            .unwrap()
            .iter()
            .all(|x| x != "sodium")
    );
}

#[test]
fn automatic_model_is_named_and_takes_pitzer_for_a_concentrate() {
    let dilute = json(&["ph", "water=1000g", "sodium_chloride=1g", "--json"]);
    assert_eq!(dilute["activity"], "davies");
    assert_eq!(dilute["activity_requested"], "auto");
    let brine = json(&["ph", "water=1000g", "sodium_chloride=200g", "--json"]);
    assert_eq!(brine["activity"], "pitzer");
}

#[test]
fn hard_water_with_edta_reports_complexes_and_saturation() {
    // 300 ppm as CaCO₃ hard water with 1 % tetrasodium EDTA (39 % solution): calcium is taken
    // up as CaY²⁻ (log K 10.65, Martell & Smith as printed in Harris, from memory), so the
    // free calcium is tiny and calcite is undersaturated.
    let v = json(&[
        "ph",
        "water=974.4g",
        "tetrasodium_edta_39=25.6g",
        "--hardness",
        "300",
        "--json",
    ]);
    let complexes = &v["complexes"];
    let cay = find(complexes, "id", "calcium_edta");
    assert_eq!(cay["metal"], "calcium");
    assert_eq!(cay["ligand"], "edta/6");
    let free_ca = find(&v["ions"], "id", "calcium")["molality"]
        .as_f64()
        .unwrap();
    assert!(free_ca < 1e-7 && cay["molality"].as_f64().unwrap() > 2.0e-3);
    let calcite = find(&v["saturation"], "solid", "calcite");
    assert!(calcite["saturation_index"].as_f64().unwrap() < 0.0);
    assert!(v["chelant_capacity"]["ppm_caco3"].as_f64().unwrap() > 2000.0);
    assert_eq!(v["water_hardness"]["ppm_caco3"], 300.0);
    // Forms of a system are SYSTEM/FORM, FORM the protons removed: carbonic/2 is CO₃²⁻.
    assert_eq!(find(&v["ions"], "id", "carbonic/2")["charge"], -2);
}

#[test]
fn zinc_is_a_metal_ion_whose_hydrolysis_is_listed_among_the_complexes() {
    // 10 mmol ZnSO₄·7H₂O with 1 mol NaOH per kg: the zincate ion Zn(OH)₄²⁻ holds the zinc
    // (log *β4 −41.2, Baes & Mesmer, The Hydrolysis of Cations, 1976, from memory).
    let v = json(&[
        "ph",
        "water=1000g",
        "zinc_sulfate_heptahydrate=2.875g",
        "sodium_hydroxide=40g",
        "--json",
    ]);
    let zn = find(&v["ions"], "id", "zinc");
    assert_eq!(zn["charge"], 2);
    let zincate = find(&v["complexes"], "id", "zincate");
    assert_eq!(zincate["metal"], "zinc");
    assert_eq!(zincate["ligand"], "hydroxide");
    assert_eq!(zincate["charge"], -2);
    assert!(zincate["molality"].as_f64().unwrap() > 5e-3);
    assert!(
        v["ions"]
            .as_array()
            .unwrap()
            .iter()
            .all(|i| !i["id"].as_str().unwrap().starts_with("zinc/"))
    );
    find(&v["saturation"], "solid", "zinc_hydroxide");
}

#[test]
fn the_required_hardness_salts_are_in_the_library() {
    let v = json(&[
        "ph",
        "water=1000g",
        "calcium_chloride_dihydrate=1.47g",
        "magnesium_sulfate_heptahydrate=2.46g",
        "sodium_carbonate=2.0g",
        "--json",
    ]);
    let sat = &v["saturation"];
    // 10 mmol/kg Ca²⁺ with 19 mmol/kg carbonate is far above calcite's Ksp (10^−8.48,
    // Plummer & Busenberg 1982, from memory).
    assert!(
        find(sat, "solid", "calcite")["saturation_index"]
            .as_f64()
            .unwrap()
            > 1.0
    );
    let cautions = v["cautions"].as_array().unwrap();
    assert!(
        cautions
            .iter()
            .any(|c| c["title"].as_str().unwrap().contains("calcite")),
        "a scale caution: {cautions:?}"
    );
}

#[test]
fn bad_hardness_is_refused() {
    let err = fails(&["ph", "water=1000g", "--hardness=-3"]);
    assert!(err.contains("--hardness"), "{err}");
    let err = fails(&[
        "ph",
        "water=1000g",
        "--hardness",
        "100",
        "--hardness-calcium",
        "1.5",
    ]);
    assert!(err.contains("calcium share"), "{err}");
    let err = fails(&["ph", "water=1000g", "--hardness-calcium", "0.5"]);
    assert!(err.contains("--hardness"), "{err}");
}

#[test]
fn precipitate_settles_lime_to_the_saturated_standard_and_lists_the_solid() {
    let v = json(&[
        "ph",
        "water=1000g",
        "calcium_hydroxide=5g",
        "--precipitate",
        "--json",
    ]);
    let p = &v["precipitation"];
    assert_eq!(p["converged"], true);
    // Saturated Ca(OH)₂ at 25 °C: pH 12.454, an IUPAC secondary standard (Buck et al., Pure
    // Appl. Chem. 74 (2002) 2169, from memory).
    assert!((p["ph"].as_f64().unwrap() - 12.454).abs() < 0.05, "{p}");
    let lime = find(&p["formed"], "solid", "portlandite");
    // About 0.020 mol/kg dissolves (CRC Handbook, from memory), so about 0.047 of the 0.0675
    // mol/kg (5 g at 74.09 g/mol, IUPAC atomic weights) settles out.
    let formed = lime["mol_per_kg_water"].as_f64().unwrap();
    assert!((formed - (5.0 / 74.09 - 0.020)).abs() < 0.004, "{formed}");
    let g = lime["g_per_kg_product"].as_f64().unwrap();
    assert!((g - formed * 74.09 * 1.0 / 1.005).abs() < 0.01 * g, "{g}");
    assert!(
        find(&p["saturation"], "solid", "portlandite")["saturation_index"]
            .as_f64()
            .unwrap()
            .abs()
            < 1e-7
    );
    // Without the switch the field is null and the pH is that of everything dissolved.
    let off = json(&["ph", "water=1000g", "calcium_hydroxide=5g", "--json"]);
    assert!(off["precipitation"].is_null());
    assert!(off["ph"].as_f64().unwrap() > p["ph"].as_f64().unwrap());
    // The text output names the solid and its grams.
    let text = stdout_ok(&["ph", "water=1000g", "calcium_hydroxide=5g", "--precipitate"]);
    assert!(text.contains("settled out"), "{text}");
    assert!(text.contains("portlandite"), "{text}");
}
