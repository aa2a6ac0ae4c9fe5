//! Project files from colleagues are untrusted input: every broken file opened in the window is
//! refused with the core's own words (what, where, what is allowed), the open project stays as
//! it was, and the file is never touched.

mod common;

use std::path::Path;

use common::{Folders, citric_project, file_names, harness_in};
use egui_kittest::kittest::Queryable as _;
use saltwise::Command;
use saltwise_chem::project::{MAX_FILE_BYTES, MAX_NESTING};

/// The text of a good project file, to break in different ways.
fn good_text() -> String {
    citric_project()
        .to_ron()
        .expect("the bench project writes as RON")
}

/// A good text with one piece replaced (the piece must be there).
fn with(from: &str, to: &str) -> Vec<u8> {
    let text = good_text();
    assert!(text.contains(from), "{from} not in {text}");
    text.replacen(from, to, 1).into_bytes()
}

/// Broken files, each with a piece of the message it must get.
fn cases() -> Vec<(&'static str, Vec<u8>, String)> {
    let good = good_text();
    let custom = r#"(
    format_version: 1,
    recipe: (lines: [(ingredient: "custom_fen_acid", amount: (value: 2.0, unit: g), enabled: true),
                     (ingredient: "water", amount: (value: 100.0, unit: g), enabled: true)]),
    custom: (
        systems: [(id: "custom_fen_acid", name: "fen acid", charge_of_fully_protonated: 0,
                   pka: [PKA], dh_kj_mol: [0.0], source: "invented")],
        ingredients: [(id: "custom_fen_acid", name: "fen acid", formula: "C4H4O4", assay: ASSAY,
                       releases: [System(id: "custom_fen_acid", count: 1, form: 0)])],
    ),
)"#;
    vec![
        (
            "truncated",
            good.as_bytes()[..good.len() / 2].to_vec(),
            "line ".into(),
        ),
        ("empty", Vec::new(), "line 1, column 1".into()),
        (
            "binary",
            vec![0x89, b'P', b'N', b'G', 0x0d, 0x0a, 0x1a, 0x0a, 0xff, 0xfe, 0x00],
            "not a text file (byte 0 is not UTF-8)".into(),
        ),
        (
            "huge",
            {
                let mut b = good.clone().into_bytes();
                b.resize(usize::try_from(MAX_FILE_BYTES).expect("4 MB fits in usize") + 1024, b' ');
                b
            },
            format!("a project file is at most {MAX_FILE_BYTES} bytes"),
        ),
        (
            "nested",
            "(".repeat(MAX_NESTING * 4).into_bytes(),
            format!("brackets nest deeper than {MAX_NESTING} levels"),
        ),
        (
            "future-version",
            with("format_version: 2", "format_version: 7"),
            "format version 7 is not one this program reads".into(),
        ),
        (
            "version-zero",
            with("format_version: 2", "format_version: 0"),
            "format version 0 is not one this program reads".into(),
        ),
        (
            "unknown-ingredient",
            with("\"citric_acid_monohydrate\"", "\"citric_acid_monohydrat\""),
            "uses unknown ingredient 'citric_acid_monohydrat'; did you mean citric_acid_monohydrate"
                .into(),
        ),
        (
            "negative-amount",
            with("value: 10.0", "value: -10.0"),
            "recipe line 2 (citric_acid_monohydrate): amount -10 is not allowed".into(),
        ),
        (
            "nan-amount",
            with("value: 10.0", "value: NaN"),
            "amount NaN is not allowed".into(),
        ),
        (
            "infinite-amount",
            with("value: 10.0", "value: inf"),
            "amount inf is not allowed".into(),
        ),
        (
            "amount-as-words",
            with("value: 10.0", "value: \"ten grams\""),
            "line ".into(),
        ),
        (
            "unknown-unit",
            with("unit: g", "unit: pound"),
            "line ".into(),
        ),
        (
            "hot-batch",
            with("temp_c: 25.0", "temp_c: 120.0"),
            "temperature 120 °C is not allowed".into(),
        ),
        (
            "zero-batch",
            with("qs_to_g: None", "qs_to_g: Some(0.0)"),
            "q.s. batch size 0 g is not allowed".into(),
        ),
        (
            "assay-above-100",
            custom.replace("PKA", "4.4").replace("ASSAY", "1.2").into_bytes(),
            "assay 1.2 is outside (0, 1]".into(),
        ),
        (
            "pka-out-of-range",
            custom.replace("PKA", "31.0").replace("ASSAY", "1.0").into_bytes(),
            "pKa1 = 31 is outside −5…20".into(),
        ),
        (
            "not-a-project",
            b"name = \"rinse\"\n[recipe]\nwater = 900\n".to_vec(),
            "line 1".into(),
        ),
    ]
}

/// Opens `path` in a workbench on the citric project and checks that it was refused with a
/// message containing `expected`, and that nothing changed.
fn assert_refused(root: &Path, path: &Path, expected: &str, dirty: bool) {
    let folders = Folders::under(root);
    let mut h = harness_in(citric_project(), &folders);
    if dirty {
        h.get_by_label("Remove line 1").click();
        h.run();
    }
    let before = h.state().project().clone();
    let bytes = std::fs::read(path).ok();
    let files = file_names(path.parent().expect("a file in a folder"));

    h.state_mut().queue(Command::OpenPath(path.to_path_buf()));
    h.run();

    let name = path.file_name().expect("a file name").to_string_lossy();
    let Some(notice) = h.state().notice().cloned() else {
        panic!("{name}: no notice; status {:?}", h.state().status_text());
    };
    assert_eq!(notice.headline, format!("Could not open {name}"));
    assert!(
        notice.reason.contains(expected),
        "{name}: expected '{expected}' in '{}'",
        notice.reason
    );
    // What the person sees: the headline, the core's reason, and what it means.
    h.get_by_label(&notice.headline);
    h.get_by_label(&notice.reason);
    h.get_by_label_contains("the open project is as it was");
    assert!(
        h.state().prompt().is_none(),
        "{name}: no question about unsaved changes"
    );
    assert_eq!(
        h.state().project(),
        &before,
        "{name}: the open project is unchanged"
    );
    assert_eq!(h.state().is_dirty(), dirty);
    assert_eq!(h.state().file_path(), None);
    assert_eq!(
        std::fs::read(path).ok(),
        bytes,
        "{name}: the file is untouched"
    );
    assert_eq!(
        file_names(path.parent().expect("a file in a folder")),
        files,
        "{name}: nothing written beside it"
    );

    h.get_by_label("Dismiss").click();
    h.run();
    assert!(h.state().notice().is_none());
}

#[test]
fn every_kind_of_broken_file_is_refused_with_its_reason_and_changes_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let files = dir.path().join("from-colleagues");
    std::fs::create_dir(&files).unwrap();
    let cases = cases();
    for (name, bytes, _) in &cases {
        std::fs::write(files.join(format!("{name}.ron")), bytes).unwrap();
    }
    for (i, (name, _, expected)) in cases.iter().enumerate() {
        // Half the cases with unsaved changes open, which must survive too.
        let root = dir.path().join(format!("user-{i}"));
        assert_refused(
            &root,
            &files.join(format!("{name}.ron")),
            expected,
            i % 2 == 1,
        );
    }
}

#[test]
fn a_missing_file_and_a_folder_are_refused_with_the_systems_reason() {
    let dir = tempfile::tempdir().unwrap();
    let files = dir.path().join("shared");
    std::fs::create_dir(&files).unwrap();
    std::fs::create_dir(files.join("a-folder.ron")).unwrap();
    assert_refused(
        &dir.path().join("u1"),
        &files.join("moved-away.ron"),
        "No such file",
        false,
    );
    assert_refused(
        &dir.path().join("u2"),
        &files.join("a-folder.ron"),
        "",
        true,
    );
}

#[test]
fn an_unknown_ingredient_is_located_by_line_and_column() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("typo.ron");
    let bytes = with("\"citric_acid_monohydrate\"", "\"citric_acid_monohydrat\"");
    let text = String::from_utf8(bytes.clone()).unwrap();
    let line = text
        .lines()
        .position(|l| l.contains("citric_acid_monohydrat"))
        .unwrap()
        + 1;
    std::fs::write(&path, bytes).unwrap();
    assert_refused(
        &dir.path().join("u"),
        &path,
        &format!("typo.ron line {line}, column "),
        false,
    );
}

#[test]
fn a_good_file_opened_after_a_refused_one_opens_and_clears_the_notice() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    let bad = dir.path().join("bad.ron");
    std::fs::write(&bad, "(format_version: 1, recipe: (lines: [").unwrap();
    let good = dir.path().join("good.ron");
    std::fs::write(&good, good_text()).unwrap();
    let mut h = harness_in(saltwise_chem::project::Project::demo(), &folders);
    h.state_mut().queue(Command::OpenPath(bad));
    h.run();
    assert!(h.state().notice().is_some());
    h.state_mut().queue(Command::OpenPath(good.clone()));
    h.run();
    assert!(h.state().notice().is_none());
    assert_eq!(h.state().project(), &citric_project());
    assert_eq!(h.state().file_path(), Some(good.as_path()));
}
