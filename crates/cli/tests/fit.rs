//! Black-box tests of `saltwise-cli fit` on the real binary: the JSON contract, text output,
//! saving to the user library in a data folder of the test's own, and every refusal.

mod common;

use std::path::Path;
use std::process::{Command, Output};

use common::*;
use serde_json::Value;

/// Runs the binary with the user library in `data_dir`.
fn run_in(data_dir: &Path, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_saltwise-cli"))
        .env("SALTWISE_DATA_DIR", data_dir)
        .args(args)
        .output()
        .expect("run saltwise-cli")
}

fn json_in(data_dir: &Path, args: &[&str]) -> Value {
    let out = run_in(data_dir, args);
    assert!(
        out.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).expect("JSON on stdout")
}

fn fails_in(data_dir: &Path, args: &[&str]) -> (i32, String) {
    let out = run_in(data_dir, args);
    let err = String::from_utf8_lossy(&out.stderr).into_owned();
    assert!(!out.status.success(), "{args:?} should fail");
    assert!(!err.contains("panicked"), "{args:?} panicked: {err}");
    assert!(err.starts_with("error"), "{args:?}: {err}");
    (out.status.code().unwrap_or(-1), err)
}

/// "Measured" readings: the predicted titration of the product as actually made — an invented
/// "Kestrel Oven Degreaser" whose lye assayed 47 % instead of 50 % (18.8 g of 50 % lye for 20 g)
/// — read by a meter 0.05 pH high, with a small alternating error of ±0.004 pH.
fn measured_csv(dir: &Path, separator: &str) -> String {
    let csv = stdout_ok(&[
        "titrate",
        "water=981.2g",
        "sodium_hydroxide_50=18.8g",
        "--sample",
        "10g",
        "--titrant",
        "hcl",
        "--normality",
        "0.1",
        "--points",
        "31",
        "--csv",
    ]);
    let mut out = format!("mL{separator}pH\n");
    for (i, line) in csv.lines().skip(1).enumerate() {
        let (ml, ph) = line.split_once(',').expect("ml,ph");
        let ph: f64 = ph.parse().expect("pH");
        let noise = if i % 2 == 0 { 0.004 } else { -0.004 };
        let cell = |v: f64| {
            let s = format!("{v:.4}");
            if separator == ";" {
                s.replace('.', ",")
            } else {
                s
            }
        };
        let ml: f64 = ml.parse().expect("mL");
        out += &format!("{}{separator}{}\n", cell(ml), cell(ph + 0.05 + noise));
    }
    let path = dir.join(if separator == ";" {
        "lot-9.txt"
    } else {
        "lot-9.csv"
    });
    std::fs::write(&path, out).expect("write data");
    path.display().to_string()
}

const PRODUCT: &[&str] = &["water=980g", "sodium_hydroxide_50=20g"];

fn fit_args<'a>(data: &'a str, extra: &[&'a str]) -> Vec<&'a str> {
    let mut a = vec!["fit"];
    a.extend_from_slice(PRODUCT);
    a.extend_from_slice(&[
        "--data",
        data,
        "--titrant",
        "hcl",
        "--normality",
        "0.1",
        "--sample",
        "10g",
    ]);
    a.extend_from_slice(extra);
    a
}

#[test]
fn json_contract_recovers_assay_and_offset() {
    let dir = tempfile::tempdir().expect("temp dir");
    let data = measured_csv(dir.path(), ",");
    let v = json_in(
        dir.path(),
        &fit_args(
            &data,
            &[
                "--fit",
                "assay:sodium_hydroxide_50",
                "--fit",
                "meter-offset",
                "--json",
            ],
        ),
    );
    let p = v["parameters"].as_array().expect("parameters");
    assert_eq!(p.len(), 2);
    assert_eq!(p[0]["name"], "assay:sodium_hydroxide_50");
    assert_eq!(p[1]["name"], "meter-offset");
    // The product was made with 47 % lye and read 0.05 pH high (how the data were made, above);
    // the ±0.004 pH alternating error moves the fit by well under 0.1 % and 0.005 pH.
    let assay = p[0]["value"].as_f64().expect("value");
    let offset = p[1]["value"].as_f64().expect("value");
    assert!((assay - 47.0).abs() < 0.1, "{assay}");
    assert!((offset - 0.05).abs() < 0.005, "{offset}");
    assert!(p[0]["std_error"].as_f64().expect("std error") > 0.0);
    let c = v["correlation"].as_array().expect("correlation");
    assert_eq!(c.len(), 2);
    assert_eq!(c[0][0].as_f64(), Some(1.0));
    let rms = v["rms_ph"].as_f64().expect("rms");
    assert!(rms < 0.01, "{rms}");
    assert!(v["warnings"].as_array().expect("warnings").is_empty());
    assert_eq!(v["residuals"].as_array().expect("residuals").len(), 31);
}

#[test]
fn text_output_and_decimal_commas() {
    let dir = tempfile::tempdir().expect("temp dir");
    let data = measured_csv(dir.path(), ";");
    let out = run_in(
        dir.path(),
        &fit_args(
            &data,
            &[
                "--fit",
                "assay:sodium_hydroxide_50",
                "--fit",
                "meter-offset",
            ],
        ),
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8(out.stdout).expect("UTF-8");
    assert!(text.contains("31 readings"), "{text}");
    assert!(text.contains("assay:sodium_hydroxide_50"), "{text}");
    assert!(text.contains("RMS residual"), "{text}");
    assert!(text.contains("correlation"), "{text}");
}

#[test]
fn titrant_by_mass_reads_grams() {
    let dir = tempfile::tempdir().expect("temp dir");
    let data = measured_csv(dir.path(), ",");
    // Grams at 1.00 kg/L are the same numbers as mL: the same fit.
    let v = json_in(
        dir.path(),
        &fit_args(
            &data,
            &[
                "--fit",
                "assay:sodium_hydroxide_50",
                "--titrant-by-mass",
                "--json",
            ],
        ),
    );
    assert_eq!(v["titrant_by_mass"], true);
    let assay = v["parameters"][0]["value"].as_f64().expect("value");
    assert!((assay - 47.0).abs() < 0.3, "{assay}");
}

#[test]
fn flat_parameter_warns() {
    let dir = tempfile::tempdir().expect("temp dir");
    let data = measured_csv(dir.path(), ",");
    let mut args = vec![
        "fit",
        "water=975g",
        "sodium_hydroxide_50=20g",
        "sodium_chloride=5g",
    ];
    args.extend_from_slice(&[
        "--data",
        &data,
        "--titrant",
        "hcl",
        "--normality",
        "0.1",
        "--sample",
        "10g",
        "--fit",
        "assay:sodium_chloride",
        "--fit",
        "meter-offset",
        "--json",
    ]);
    let v = json_in(dir.path(), &args);
    let w = v["warnings"].as_array().expect("warnings");
    assert!(
        w.iter().any(|w| w
            .as_str()
            .is_some_and(|w| w.contains("assay:sodium_chloride"))),
        "{w:?}"
    );
    assert_eq!(v["parameters"][0]["determined"], false);
}

#[test]
fn saves_the_fitted_ingredient_to_the_user_library() {
    let dir = tempfile::tempdir().expect("temp dir");
    let data = measured_csv(dir.path(), ",");
    let v = json_in(
        dir.path(),
        &fit_args(
            &data,
            &[
                "--fit",
                "assay:sodium_hydroxide_50",
                "--save-to-library",
                "lye_lot_9",
                "--json",
            ],
        ),
    );
    assert_eq!(v["saved_to_library"]["id"], "lye_lot_9");
    let file = dir.path().join("user-library.ron");
    let text = std::fs::read_to_string(&file).expect("user library written");
    assert!(text.contains("lye_lot_9"));
    assert!(text.contains("data_file: \"lot-9.csv\""), "{text}");
    // The saved ingredient is usable by every command: 10 g of 47 % lye in 990 g of water is
    // 0.1175 mol NaOH per ~0.995 kg water, pH near 13 (stoichiometry, Kw).
    let out = run_in(dir.path(), &["ph", "water=990g", "lye_lot_9=10g", "--json"]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let ph: Value = serde_json::from_slice(&out.stdout).expect("JSON");
    let ph = ph["ph"].as_f64().expect("ph");
    assert!((12.8..13.2).contains(&ph), "{ph}");
    // The same name again is refused, and the file is left as it was.
    let (code, err) = fails_in(
        dir.path(),
        &fit_args(
            &data,
            &[
                "--fit",
                "assay:sodium_hydroxide_50",
                "--save-to-library",
                "lye_lot_9",
            ],
        ),
    );
    assert_eq!(code, 1);
    assert!(err.contains("already in the user library"), "{err}");
    assert_eq!(std::fs::read_to_string(&file).expect("file"), text);
}

#[test]
fn bad_input_is_an_error_never_a_panic() {
    let dir = tempfile::tempdir().expect("temp dir");
    let d = dir.path();
    let write = |name: &str, text: &str| {
        let p = d.join(name);
        std::fs::write(&p, text).expect("write");
        p.display().to_string()
    };
    let empty = write("empty.csv", "mL,pH\n");
    let (code, err) = fails_in(d, &fit_args(&empty, &["--fit", "meter-offset"]));
    assert_eq!(code, 1);
    assert!(err.contains("no readings"), "{err}");

    let words = write("words.csv", "mL,pH\n0,12.9\n1,twelve\n");
    let (code, err) = fails_in(d, &fit_args(&words, &["--fit", "meter-offset"]));
    assert_eq!(code, 1);
    assert!(err.contains("line 3, column 2"), "{err}");

    let one = write("one.csv", "0,12.9\n");
    let (code, err) = fails_in(
        d,
        &fit_args(
            &one,
            &[
                "--fit",
                "assay:sodium_hydroxide_50",
                "--fit",
                "meter-offset",
            ],
        ),
    );
    assert_eq!(code, 1);
    assert!(
        err.contains("1 readings cannot determine 2 parameters"),
        "{err}"
    );

    let good = write("good.csv", "0,12.9\n5,12.6\n10,12.2\n");
    let mut salt = fit_args(&good, &["--fit", "meter-offset"]);
    salt[6] = "sodium_chloride";
    let (code, err) = fails_in(d, &salt);
    assert_eq!(code, 1);
    assert!(err.contains("neither a strong acid"), "{err}");

    let mut zero = fit_args(&good, &["--fit", "meter-offset"]);
    zero[10] = "0g";
    let (code, err) = fails_in(d, &zero);
    assert_eq!(code, 1);
    assert!(err.contains("sample"), "{err}");

    let (code, err) = fails_in(d, &fit_args(&good, &["--fit", "slope"]));
    assert_eq!(code, 1);
    assert!(err.contains("unknowns are"), "{err}");

    let (code, _) = fails_in(d, &fit_args(&good, &[]));
    assert_eq!(code, 2, "--fit is required (usage)");

    let missing = d.join("nowhere.csv").display().to_string();
    let (code, err) = fails_in(d, &fit_args(&missing, &["--fit", "meter-offset"]));
    assert_eq!(code, 1);
    assert!(err.contains("nowhere.csv"), "{err}");

    // Saving an unknown acid needs its formula.
    let (code, err) = fails_in(
        d,
        &fit_args(
            &good,
            &["--fit", "unknown-acid:5", "--save-to-library", "x_acid"],
        ),
    );
    assert_eq!(code, 1);
    assert!(err.contains("not saved"), "{err}");
}
