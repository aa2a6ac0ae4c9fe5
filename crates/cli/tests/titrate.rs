//! Black-box tests of `saltwise-cli titrate` on the real binary: end points, curve, titration
//! factor, carbonation and refusals.

mod common;

use common::*;

/// An invented product: "Harbourline Caustic Rinse", 0.4 % NaOH in water.
const CAUSTIC_RINSE: &[&str] = &["water=996g", "sodium_hydroxide=4g"];

/// An invented product: "Dunmore Scale Lift", 1 % anhydrous citric acid in water.
const SCALE_LIFT: &[&str] = &["water=990g", "citric_acid=10g"];

fn titrate<'a>(product: &[&'a str], flags: &[&'a str]) -> Vec<&'a str> {
    let mut args = vec!["titrate"];
    args.extend_from_slice(product);
    args.extend_from_slice(flags);
    args
}

#[test]
fn caustic_sample_with_hydrochloric_acid_json() {
    let v = json(&titrate(
        CAUSTIC_RINSE,
        &[
            "--sample",
            "50g",
            "--titrant",
            "hcl",
            "--normality",
            "0.1",
            "--json",
        ],
    ));
    // Stoichiometry: 50 g × 0.4 % / 39.997 g/mol NaOH = 5.0004 mmol, so 50.004 mL of 0.1 N HCl at
    // equivalence (definition of normality; IUPAC atomic weights, from memory).
    let expected = 50.0 * 0.004 / 39.997 * 1e3 / 0.1;
    let e = v["endpoints"].as_array().unwrap();
    // Default end points with an acid titrant: pH 8.3 and 4.3 (P and M, common practice, no source).
    assert_eq!(e.len(), 2);
    assert_eq!(e[0]["ph"].as_f64(), Some(8.3));
    assert_eq!(e[1]["ph"].as_f64(), Some(4.3));
    let p = e[0]["ml"].as_f64().unwrap();
    let m = e[1]["ml"].as_f64().unwrap();
    // 0.02 mL for the OH⁻ left at pH 8.3; the free H⁺ at pH 4.3 puts M ~0.06 mL past
    // (charge balance with Davies γ ≈ 0.82, from memory).
    assert!((p - expected).abs() < 0.02, "{p}");
    assert!((0.04..0.09).contains(&(m - expected)), "{m}");
    assert_eq!(v["titrant"], "hydrochloric_acid_36");
    assert_eq!(v["titrant_density_kg_per_l"].as_f64(), Some(1.0));
    // No --in-use-sample-ml, no titration factor.
    assert!(v.get("titration_factor").is_none());
    let points = v["points"].as_array().unwrap();
    assert_eq!(points.len(), 101);
    assert_eq!(points[0]["ml"].as_f64(), Some(0.0));
    assert!(points[0]["ph"].as_f64().unwrap() > 12.0);
}

#[test]
fn titration_factor_for_an_in_use_sample() {
    // An invented product: "Tidemark CIP Base", 20 % of 50 % lye (10 % NaOH).
    let v = json(&titrate(
        &["water=800g", "sodium_hydroxide_50=200g"],
        &[
            "--sample",
            "1g",
            "--titrant",
            "hydrochloric_acid",
            "--normality",
            "0.1",
            "--endpoint",
            "8.3",
            "--in-use-sample-ml",
            "10",
            "--json",
        ],
    ));
    // 1 g holds 2.500 mmol NaOH: 25.00 mL of 0.1 N; factor 100 × (1 g / 25 mL) / 10 g = 0.400 %
    // per mL (stoichiometry and the factor's definition, common practice, no source).
    let f = v["titration_factor"].as_f64().unwrap();
    assert!((f - 0.4).abs() < 1e-3, "{f}");
    assert_eq!(v["in_use_sample_ml"].as_f64(), Some(10.0));
    assert_eq!(v["endpoints"].as_array().unwrap().len(), 1);
}

#[test]
fn acidity_with_sodium_hydroxide_csv_and_text() {
    let csv = stdout_ok(&titrate(
        SCALE_LIFT,
        &[
            "--sample",
            "10g",
            "--titrant",
            "naoh",
            "--normality",
            "0.1",
            "--points",
            "11",
            "--csv",
        ],
    ));
    let mut lines = csv.lines();
    assert_eq!(lines.next(), Some("ml,ph"));
    let rows: Vec<(f64, f64)> = lines
        .map(|l| {
            let (a, b) = l.split_once(',').expect("two columns");
            (a.parse().unwrap(), b.parse().unwrap())
        })
        .collect();
    assert_eq!(rows.len(), 11);
    // A base titrant raises pH all the way (charge balance, from memory).
    assert!(rows.windows(2).all(|w| w[1].1 > w[0].1));
    // 10 g of 1 % citric acid: 0.5205 mmol × 3 protons ≈ 15.6 mL of 0.1 N to pH 8.3 (Martell & Smith
    // pKa values, from memory); the curve runs 25 % past it.
    let last = rows[10].0;
    assert!((last / 1.25 / 15.6 - 1.0).abs() < 0.01, "{last}");
    let text = stdout_ok(&titrate(
        SCALE_LIFT,
        &["--sample", "10g", "--titrant", "naoh", "--normality", "0.1"],
    ));
    assert!(text.contains("end point pH 8.30:"), "{text}");
    assert!(text.contains("1.00 kg/L"), "{text}");
}

#[test]
fn carbonated_caustic_has_p_below_m() {
    let pm = |percent: &str| {
        let v = json(&titrate(
            CAUSTIC_RINSE,
            &[
                "--sample",
                "50g",
                "--titrant",
                "hcl",
                "--normality",
                "0.1",
                "--carbonated",
                percent,
                "--json",
            ],
        ));
        let e = v["endpoints"].as_array().unwrap().clone();
        (e[0]["ml"].as_f64().unwrap(), e[1]["ml"].as_f64().unwrap())
    };
    // All hydroxide carbonated: P = M/2; half: P = 0.75 M (Standard Methods 2320 B alkalinity
    // relationships, from memory); 1.5 % for the end points.
    let (p, m) = pm("100%");
    assert!((p / m - 0.5).abs() < 0.015, "{p} {m}");
    let (p, m) = pm("50");
    assert!((p / m - 0.75).abs() < 0.015, "{p} {m}");
}

#[test]
fn a_sample_already_past_the_end_point_needs_no_titrant() {
    let v = json(&titrate(
        SCALE_LIFT,
        &[
            "--sample",
            "10g",
            "--titrant",
            "hcl",
            "--normality",
            "0.1",
            "--json",
        ],
    ));
    // An acidic sample has no P or M alkalinity (common practice, no source).
    for e in v["endpoints"].as_array().unwrap() {
        assert_eq!(e["ml"].as_f64(), Some(0.0));
        assert_eq!(e["at_start"], true);
    }
}

#[test]
fn bad_titrations_are_errors_not_panics() {
    let base = ["--titrant", "hcl", "--normality", "0.1"];
    let cases: Vec<(Vec<&str>, &str)> = vec![
        (
            titrate(CAUSTIC_RINSE, &[&["--sample", "0g"][..], &base].concat()),
            "sample 0 g",
        ),
        (
            titrate(
                CAUSTIC_RINSE,
                &[&["--sample", "10g", "--endpoint", "0.5"][..], &base].concat(),
            ),
            "end point pH 0.5 is not reached",
        ),
        (
            titrate(
                CAUSTIC_RINSE,
                &["--sample", "10g", "--titrant", "hcl", "--normality", "0"],
            ),
            "normality",
        ),
        (
            titrate(
                CAUSTIC_RINSE,
                &["--sample", "10g", "--titrant", "hcl", "--normality", "2"],
            ),
            "normality",
        ),
        (
            titrate(
                CAUSTIC_RINSE,
                &["--sample", "10g", "--titrant", "hcl", "--normality", "-0.1"],
            ),
            "normality",
        ),
        (
            titrate(
                CAUSTIC_RINSE,
                &[
                    "--sample",
                    "10g",
                    "--titrant",
                    "vinegar",
                    "--normality",
                    "0.1",
                ],
            ),
            "unknown titrant 'vinegar'",
        ),
        (
            titrate(
                CAUSTIC_RINSE,
                &[
                    "--sample",
                    "10g",
                    "--titrant",
                    "citric_acid",
                    "--normality",
                    "0.1",
                ],
            ),
            "neither a strong acid",
        ),
        (
            titrate(
                SCALE_LIFT,
                &[&["--sample", "10g", "--in-use-sample-ml", "10"][..], &base].concat(),
            ),
            "no titration factor",
        ),
        (
            titrate(
                SCALE_LIFT,
                &[&["--sample", "10g", "--carbonated", "50%"][..], &base].concat(),
            ),
            "caustic",
        ),
        (
            titrate(
                CAUSTIC_RINSE,
                &[&["--sample", "10g", "--points", "1"][..], &base].concat(),
            ),
            "points",
        ),
        (titrate(CAUSTIC_RINSE, &base), "--sample"),
        (
            titrate(
                CAUSTIC_RINSE,
                &[&["--sample", "10g", "--csv", "--json"][..], &base].concat(),
            ),
            "cannot be used with",
        ),
    ];
    for (args, says) in cases {
        let err = fails(&args);
        assert!(err.contains(says), "{args:?}: {err}");
    }
}
