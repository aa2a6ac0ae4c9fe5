//! Black-box tests of `saltwise-cli tolerance`: the JSON fields, seed reproducibility and the
//! refusals.

mod common;

use common::*;

use serde_json::Value;

const BAND: &[&str] = &[
    "tolerance",
    "water=900g",
    "citric_acid_monohydrate=20g",
    "trisodium_citrate_dihydrate=15g",
    "--vary-all",
    "1%",
    "--vary",
    "citric_acid_monohydrate=2%",
    "--assay",
    "trisodium_citrate_dihydrate=98%..100%",
    "--samples",
    "500",
    "--json",
];

#[test]
fn the_same_seed_gives_the_same_numbers() {
    let with = |seed: &str| {
        let mut a = BAND.to_vec();
        a.extend(["--seed", seed]);
        json(&a)
    };
    let (a, b, c) = (with("5"), with("5"), with("6"));
    // The seeded contract of the command (README); no other source.
    assert_eq!(a, b);
    assert_ne!(a["p05"], c["p05"]);
    for key in ["nominal_ph", "p05", "p50", "p95", "samples", "seed"] {
        assert!(a.get(key).is_some(), "missing {key}");
    }
    assert_eq!(a["samples"], 500);
    assert_eq!(a["seed"], 5);
    let p = |k: &str| a[k].as_f64().expect("number");
    assert!(p("p05") <= p("p50") && p("p50") <= p("p95"));
    let s = a["sensitivity"].as_array().expect("sensitivity");
    assert_eq!(s.len(), 3);
    let size = |v: &Value| v["dph_per_percent"].as_f64().expect("number").abs();
    assert!(size(&s[0]) >= size(&s[1]) && size(&s[1]) >= size(&s[2]));
}

#[test]
fn text_output_names_the_band() {
    let out = run(&[
        "tolerance",
        "water=900g",
        "acetic_acid=6g",
        "--vary-all",
        "1",
        "--samples",
        "50",
    ]);
    assert!(out.status.success());
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("median") && text.contains("sensitivity"),
        "{text}"
    );
}

#[test]
fn bad_input_is_an_error_not_a_panic() {
    let base = ["tolerance", "water=900g", "acetic_acid=6g"];
    let with = |extra: &[&str]| {
        let mut a = base.to_vec();
        a.extend(extra);
        fails(&a)
    };
    assert!(with(&["--samples", "0"]).contains("samples"));
    assert!(with(&["--vary", "borax=1%"]).contains("borax"));
    assert!(with(&["--vary", "acetic_acid"]).contains("ID=P%"));
    assert!(with(&["--vary-all", "-3%"]).contains("not allowed"));
    assert!(with(&["--assay", "acetic_acid=1.0..0.9"]).contains("not allowed"));
    assert!(with(&["--assay", "acetic_acid=98"]).contains("LO..HI"));
    fails(&["tolerance", "water=900g", "acetic_acidd=6g"]);
}
