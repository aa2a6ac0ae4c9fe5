//! Black-box tests of `saltwise-cli report` on the real binary: the sheet written for a demo
//! project, its batch size and variant, and refusals that leave any earlier file as it was.

mod common;

use std::path::{Path, PathBuf};

use common::*;

fn demo(name: &str) -> String {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("../../assets/demo")
        .join(name)
        .display()
        .to_string()
}

fn out_in(dir: &tempfile::TempDir, name: &str) -> PathBuf {
    dir.path().join(name)
}

#[test]
fn writes_the_batch_sheet_scaled_to_the_batch() {
    let dir = tempfile::tempdir().unwrap();
    let out = out_in(&dir, "sheet.html");
    let project = demo("tidewater-degreaser.ron");
    let said = stdout_ok(&[
        "report",
        "--project",
        &project,
        "--batch",
        "250kg",
        "--date",
        "2031-04-05",
        "--out",
        out.to_str().unwrap(),
    ]);
    assert!(said.starts_with("wrote "), "{said}");
    let html = std::fs::read_to_string(&out).unwrap();
    assert!(html.starts_with("<!DOCTYPE html>"));
    assert!(html.contains("2031-04-05"));
    // The same pH as `ph --project`, to the two decimals printed.
    let ph = json(&["ph", "--project", &project, "--json"]);
    assert!(html.contains(&format!("{:.2}", ph["ph"].as_f64().unwrap())));
    // 150 g in the 5000 g recipe is 7.500 kg in a 250 kg batch (proportion).
    assert!(html.contains("7.500"));
    assert!(html.contains("250.0 kg"));
    // The same QC end points as `titrate` with the sheet's usual plan (10 g, 0.1 N HCl).
    let t = json(&[
        "titrate",
        "--project",
        &project,
        "--sample",
        "10g",
        "--titrant",
        "hcl",
        "--normality",
        "0.1",
        "--json",
    ]);
    for e in t["endpoints"].as_array().unwrap() {
        assert!(html.contains(&format!("{:.2}", e["ml"].as_f64().unwrap())));
    }
    for c in ph["cautions"].as_array().unwrap() {
        assert!(html.contains(c["title"].as_str().unwrap()));
    }
}

#[test]
fn a_variant_by_name_and_the_recipe_batch_by_default() {
    let dir = tempfile::tempdir().unwrap();
    let out = out_in(&dir, "salts.html");
    let project = demo("harbourline-hand-wash.ron");
    stdout_ok(&[
        "report",
        "--project",
        &project,
        "--variant",
        "Salts only",
        "--out",
        out.to_str().unwrap(),
    ]);
    let html = std::fs::read_to_string(&out).unwrap();
    assert!(html.contains("Salts only"));
    // No --batch: the recipe's own 1000 g, masses in g (12 g of the first line as written).
    assert!(html.contains("1000 g"));
    assert!(html.contains("12.00"));
    let ph = json(&[
        "ph",
        "--project",
        &project,
        "--variant",
        "Salts only",
        "--json",
    ]);
    assert!(html.contains(&format!("{:.2}", ph["ph"].as_f64().unwrap())));
}

#[test]
fn qc_flags_choose_the_titration() {
    let dir = tempfile::tempdir().unwrap();
    let out = out_in(&dir, "qc.html");
    let project = demo("harbourline-hand-wash.ron");
    stdout_ok(&[
        "report",
        "--project",
        &project,
        "--titrant",
        "naoh",
        "--normality",
        "0.5",
        "--sample",
        "20g",
        "--endpoint",
        "7",
        "--out",
        out.to_str().unwrap(),
    ]);
    let html = std::fs::read_to_string(&out).unwrap();
    let t = json(&[
        "titrate",
        "--project",
        &project,
        "--sample",
        "20g",
        "--titrant",
        "naoh",
        "--normality",
        "0.5",
        "--endpoint",
        "7",
        "--json",
    ]);
    let ml = t["endpoints"][0]["ml"].as_f64().unwrap();
    assert!(html.contains(&format!("{ml:.2}")), "{ml}");
    assert!(html.contains("0.5 N NaOH"));
    let err = fails(&[
        "report",
        "--project",
        &project,
        "--titrant",
        "water",
        "--out",
        out.to_str().unwrap(),
    ]);
    assert!(err.contains("titrant") || err.contains("strong"), "{err}");
}

#[test]
fn bad_input_is_refused_and_an_earlier_sheet_is_kept() {
    let dir = tempfile::tempdir().unwrap();
    let out = out_in(&dir, "keep.html");
    std::fs::write(&out, "earlier sheet").unwrap();
    let o = out.to_str().unwrap();
    let project = demo("harbourline-hand-wash.ron");
    let missing = dir.path().join("nope.ron").display().to_string();
    let e = fails(&["report", "--project", &missing, "--out", o]);
    assert!(e.contains("nope.ron"), "{e}");
    let e = fails(&[
        "report",
        "--project",
        &project,
        "--variant",
        "Other",
        "--out",
        o,
    ]);
    assert!(
        e.contains("'Acid and salt'") && e.contains("'Salts only'"),
        "{e}"
    );
    for bad in ["0kg", "-5g", "3mol", "2%", "lots", "1e12g"] {
        let e = fails(&["report", "--project", &project, "--batch", bad, "--out", o]);
        assert!(e.contains("--batch"), "{bad}: {e}");
    }
    let e = fails(&[
        "report",
        "--project",
        &project,
        "--sample",
        "0g",
        "--out",
        o,
    ]);
    assert!(e.contains("sample"), "{e}");
    assert_eq!(std::fs::read_to_string(&out).unwrap(), "earlier sheet");
    // An out path that cannot be written: a folder that does not exist, or a folder itself.
    let nowhere = dir.path().join("no/such/dir/sheet.html");
    let e = fails(&[
        "report",
        "--project",
        &project,
        "--out",
        nowhere.to_str().unwrap(),
    ]);
    assert!(e.contains("writing"), "{e}");
    let e = fails(&[
        "report",
        "--project",
        &project,
        "--out",
        dir.path().to_str().unwrap(),
    ]);
    assert!(e.contains("writing"), "{e}");
    // Usage errors: exit code 2.
    let u = run(&["report", "--project", &project]);
    assert_eq!(u.status.code(), Some(2));
    let u = run(&["report", "--out", o]);
    assert_eq!(u.status.code(), Some(2));
}
