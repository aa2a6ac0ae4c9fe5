//! Black-box tests of `saltwise-cli design`: feeding the masses back through `ph --json` hits
//! the targets, and bad input is refused plainly.

mod common;

use common::*;

/// Designs, then feeds the two masses back to `ph --json` with the same items and flags.
fn feed_back(items: &[&str], flags: &[&str], acid: &str, base: &str, ph: f64, cap: f64) {
    let (ph_s, cap_s) = (ph.to_string(), cap.to_string());
    let mut a = vec!["design"];
    a.extend(items);
    a.extend(flags);
    a.extend([
        "--acid",
        acid,
        "--base",
        base,
        "--target-ph",
        &ph_s,
        "--capacity",
        &cap_s,
        "--json",
    ]);
    let d = json(&a);
    let g = |k: &str| d[k].as_f64().expect("number");
    let acid_item = format!("{acid}={}g", g("acid_g"));
    let base_item = format!("{base}={}g", g("base_g"));
    let mut p = vec!["ph"];
    p.extend(items);
    p.extend([acid_item.as_str(), base_item.as_str()]);
    p.extend(flags);
    p.push("--json");
    let v = json(&p);
    let got_ph = v["ph"].as_f64().expect("ph");
    let got_cap = v["buffer_capacity"].as_f64().expect("capacity");
    // The contract of `design` (README): 0.005 pH and 1 % capacity.
    assert!((got_ph - ph).abs() < 0.005, "{got_ph} vs {ph}");
    assert!((got_cap / cap - 1.0).abs() < 0.01, "{got_cap} vs {cap}");
}

#[test]
fn citrate_in_water_feeds_back() {
    feed_back(
        &["water=1000g"],
        &[],
        "citric_acid_monohydrate",
        "trisodium_citrate_dihydrate",
        4.5,
        0.05,
    );
}

#[test]
fn phosphate_with_salt_qs_and_temperature_feeds_back() {
    feed_back(
        &["sodium_chloride=5g", "sodium_benzoate=1g"],
        &["--qs-to", "500g", "--temp", "37", "--activity", "davies"],
        "sodium_dihydrogen_phosphate",
        "disodium_hydrogen_phosphate",
        6.8,
        0.03,
    );
}

#[test]
fn ideal_acetate_feeds_back() {
    feed_back(
        &["water=800g"],
        &["--activity", "ideal"],
        "acetic_acid",
        "sodium_acetate_trihydrate",
        5.0,
        0.1,
    );
}

#[test]
fn bad_input_is_an_error_not_a_panic() {
    let go = |acid: &str, base: &str, ph: &str, cap: &str| {
        fails(&[
            "design",
            "water=1000g",
            "--acid",
            acid,
            "--base",
            base,
            "--target-ph",
            ph,
            "--capacity",
            cap,
        ])
    };
    let (a, b) = ("acetic_acid", "sodium_acetate_trihydrate");
    assert!(go(a, "disodium_hydrogen_phosphate", "5", "0.05").contains("system"));
    assert!(go("acetic_acidd", b, "5", "0.05").contains("unknown ingredient"));
    assert!(go(a, b, "5", "0").contains("above 0"));
    assert!(go(a, b, "5", "-1").contains("above 0"));
    assert!(go(a, b, "11", "0.05").contains("sodium_carbonate"));
    assert!(go(a, b, "4.7", "50").contains("not reachable"));
    assert!(go(a, b, "99", "0.05").contains("not allowed"));
    fails(&["design", "water=1000g", "--acid", a, "--base", b]);
}
