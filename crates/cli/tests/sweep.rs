//! Black-box tests of `saltwise-cli sweep` and the drift figures of `ph --json`, on the real binary.

mod common;

use common::*;

const BUFFER: &[&str] = &[
    "water=900g",
    "acetic_acid=6g",
    "sodium_acetate_trihydrate=10g",
];

/// Parses CSV rows of two numbers after the expected header.
fn rows(csv: &str, header: &str) -> Vec<(f64, f64)> {
    let mut lines = csv.lines();
    assert_eq!(lines.next(), Some(header));
    lines
        .map(|l| {
            let (a, b) = l.split_once(',').expect("two columns");
            (a.parse().expect("number"), b.parse().expect("number"))
        })
        .collect()
}

#[test]
fn dilution_rows_agree_with_ph_of_the_diluted_recipe() {
    let mut args = vec!["sweep"];
    args.extend(BUFFER);
    args.extend(["--dilute", "1..100", "--points", "5", "--csv"]);
    let r = rows(&stdout_ok(&args), "dilution,ph");
    assert_eq!(r.len(), 5);
    let mut ph = vec!["ph"];
    ph.extend(BUFFER);
    ph.push("--json");
    let mass = json(&ph)["batch_mass_g"].as_f64().unwrap();
    for (d, p) in r {
        // The diluted recipe: (d − 1) × the batch mass of water added (definition of the dilution).
        let water = format!("water={}g", (d - 1.0) * mass);
        let mut more = ph.clone();
        more.insert(1, &water);
        let direct = json(&more)["ph"].as_f64().unwrap();
        assert!((p - direct).abs() < 1e-3, "d = {d}: {p} vs {direct}");
    }
}

#[test]
fn temperature_rows_agree_with_ph_at_that_temperature() {
    let mut args = vec!["sweep"];
    args.extend(BUFFER);
    args.extend(["--temp-range", "5..65", "--points", "4", "--csv"]);
    let r = rows(&stdout_ok(&args), "temp_c,ph");
    assert_eq!(r.len(), 4);
    for (t, p) in r {
        let temp = t.to_string();
        let mut ph = vec!["ph"];
        ph.extend(BUFFER);
        ph.extend(["--temp", &temp, "--json"]);
        let direct = json(&ph)["ph"].as_f64().unwrap();
        assert!((p - direct).abs() < 1e-3, "{t} °C: {p} vs {direct}");
    }
    // JSON carries the same points.
    let mut args = vec!["sweep"];
    args.extend(BUFFER);
    args.extend(["--temp-range", "5..65", "--points", "4", "--json"]);
    let v = json(&args);
    let points = v["points"].as_array().unwrap();
    assert_eq!(points.len(), 4);
    assert!(points[0]["temp_c"].is_f64() && points[0]["ph"].is_f64());
}

#[test]
fn bad_sweeps_are_errors_not_panics() {
    for bad in [
        &["sweep", "water=1000g", "--dilute", "0.5..10"][..],
        &["sweep", "water=1000g", "--dilute", "1..ten"],
        &["sweep", "water=1000g", "--dilute", "10..2"],
        &["sweep", "water=1000g", "--temp-range", "0..100"],
        &["sweep", "water=1000g", "--temp-range", "-5..20"],
        &["sweep", "water=1000g", "--dilute", "1..10", "--points", "1"],
        &["sweep", "water=1000g"],
        &[
            "sweep",
            "water=1000g",
            "--dilute",
            "1..10",
            "--temp-range",
            "0..20",
        ],
    ] {
        fails(bad);
    }
    let e = fails(&["sweep", "water=1000g", "--temp-range", "0..100"]);
    assert!(e.contains("0–95 °C"), "{e}");
}

#[test]
fn ph_json_carries_drift_and_active_forms() {
    let v = json(&["ph", "water=1000g", "--json"]);
    // 5.6, common textbook value for rain in equilibrium with atmospheric CO2 (from memory), with
    // K_H(CO2) of Plummer & Busenberg (1982).
    let air = v["drift"]["open_to_air_ph"].as_f64().unwrap();
    assert!((air - 5.6).abs() < 0.05, "{air}");
    // Unbuffered water: 1 mmol/kg of strong acid takes pH from 7 to about 3 (from memory).
    assert!(v["drift"]["acid_1mmol_per_kg"].as_f64().unwrap() < -3.5);
    assert!(v["drift"]["base_1mmol_per_kg"].as_f64().unwrap() > 3.5);
    assert_eq!(v["active_forms"].as_array().unwrap().len(), 0);
    let v = json(&[
        "ph",
        "water=1000g",
        "sodium_benzoate=4g",
        "lactic_acid_88=8g",
        "--json",
    ]);
    let forms = v["active_forms"].as_array().unwrap();
    let benzoic = forms.iter().find(|f| f["system"] == "benzoic").unwrap();
    assert_eq!(benzoic["form"], 0);
    let f = benzoic["fraction"].as_f64().unwrap();
    assert!(f > 0.5 && f < 1.0, "{f}");
    let text = stdout_ok(&[
        "ph",
        "water=1000g",
        "sodium_benzoate=4g",
        "lactic_acid_88=8g",
    ]);
    assert!(
        text.contains("\ndrift\n") && text.contains("\nactive forms\n"),
        "{text}"
    );
}
