//! Project files as untrusted input, and saves that never lose data.

use std::fs;
use std::path::Path;

use proptest::prelude::*;
use saltwise_chem::formula::Formula;
use saltwise_chem::project::{
    FIRST_VARIANT, FORMAT_VERSION, MAX_FILE_BYTES, Project, Settings, backup_path,
    write_atomic_with,
};
use saltwise_chem::{ActivityModel, Amount, Library, ProjectError, Recipe, RecipeLine, Unit};

fn demo_text() -> String {
    Project::demo().to_ron().expect("serialise demo")
}

fn load_text(dir: &Path, name: &str, text: &[u8]) -> Result<Project, ProjectError> {
    let path = dir.join(name);
    fs::write(&path, text).expect("write test file");
    let library = Library::built_in().expect("built-in library");
    let result = Project::load_with_library(&path, &library).map(|(p, _)| p);
    assert_eq!(
        fs::read(&path).expect("read back"),
        text,
        "loading must never modify the file"
    );
    result
}

#[test]
fn a_saved_project_reads_back_the_same() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("cleanser.ron");
    let project = Project::demo();
    project.save(&path).unwrap();
    assert_eq!(Project::load(&path).unwrap(), project);
}

#[test]
fn the_committed_version_1_file_loads() {
    // tests/data/project-v1.ron was written by format version 1; it must keep loading.
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("../../tests/data/project-v1.ron");
    let text = fs::read_to_string(&path).unwrap();
    let (project, _) = Project::load_with_library(&path, &Library::built_in().unwrap()).unwrap();
    // Migrated in memory to the current version: one variant holding the version-1 recipe.
    assert_eq!(project.format_version, FORMAT_VERSION);
    assert_eq!(project.variants().len(), 1);
    assert_eq!(project.variant().name, FIRST_VARIANT);
    assert!(project.variant().prices.is_empty());
    assert_eq!(project.name, "Harbourside glass cleaner (test file)");
    assert_eq!(project.notes, "Invented test recipe.");
    let expected = Recipe {
        lines: vec![
            RecipeLine::grams("ammonia_25", 4.0),
            RecipeLine {
                amount: Amount {
                    value: 0.2,
                    unit: Unit::Percent,
                },
                ..RecipeLine::grams("citric_acid", 0.0)
            },
            RecipeLine {
                enabled: false,
                ..RecipeLine::moles("sodium_chloride", 0.01)
            },
            RecipeLine {
                amount: Amount {
                    value: 0.9,
                    unit: Unit::Kilogram,
                },
                ..RecipeLine::grams("water", 0.0)
            },
        ],
        qs_to_g: None,
        water_hardness: None,
    };
    assert_eq!(project.recipe(), &expected);
    let s = &project.settings;
    assert_eq!(
        (
            s.temp_c,
            s.activity,
            s.adjuster.as_str(),
            s.dose_max_g,
            s.target_ph
        ),
        (20.0, ActivityModel::Davies, "citric_acid", 5.0, Some(10.5))
    );
    // Settings version 1 did not write keep their defaults.
    assert_eq!(s.target_tolerance, Settings::default().target_tolerance);
    // Loading never rewrites the file; saving writes version 2, which reads back the same.
    assert_eq!(fs::read_to_string(&path).unwrap(), text);
    let dir = tempfile::tempdir().unwrap();
    let saved = dir.path().join("migrated.ron");
    project.save(&saved).unwrap();
    assert!(
        fs::read_to_string(&saved)
            .unwrap()
            .contains("format_version: 2")
    );
    assert_eq!(Project::load(&saved).unwrap(), project);
}

#[test]
fn variants_with_prices_read_back_the_same() {
    let dir = tempfile::tempdir().unwrap();
    let mut project = Project::demo();
    project
        .variant_mut()
        .prices
        .insert("lactic_acid_88".into(), 2.4);
    let copy = project.copy_current();
    assert_eq!(copy, 1);
    assert_eq!(project.variant().name, "Main (copy)");
    project.rename_variant(1, "Less lactate").unwrap();
    project.recipe_mut().lines[1].amount.value = 0.6;
    project.copy_current();
    assert_eq!(project.variants().len(), 3);
    assert!(project.set_current(1));
    let path = dir.path().join("variants.ron");
    project.save(&path).unwrap();
    let back = Project::load(&path).unwrap();
    assert_eq!(back, project);
    assert_eq!(back.variant().name, "Less lactate");
    assert_eq!(back.variants()[1].prices.get("lactic_acid_88"), Some(&2.4));
    assert_eq!(back.variant_index("Main"), Some(0));
}

#[test]
fn variant_edits_keep_the_project_whole() {
    let mut p = Project::demo();
    assert!(p.remove_variant(0).is_err(), "the last variant stays");
    p.copy_current();
    assert!(p.rename_variant(1, "Main").unwrap_err().contains("already"));
    assert!(p.rename_variant(1, "  ").is_err());
    assert!(p.rename_variant(5, "X").is_err());
    assert!(!p.set_current(2));
    p.remove_variant(1).unwrap();
    assert_eq!((p.variants().len(), p.current()), (1, 0));
}

#[test]
fn broken_variant_files_say_what_is_wrong() {
    let dir = tempfile::tempdir().unwrap();
    let mut p = Project::demo();
    p.copy_current();
    let two = p.to_ron().unwrap();
    let cases = [
        (
            two.replace("name: \"Main (copy)\"", "name: \"Main\""),
            "already a variant called 'Main'",
        ),
        (two.replace("current: 1", "current: 4"), "`current` is 4"),
        (
            two.replace("variants: [", "recipe: (lines: []), variants: ["),
            "not in `recipe`",
        ),
        (
            demo_text().replace("format_version: 2", "format_version: 1"),
            "needs its `recipe`",
        ),
        (
            two.replace("prices: {}", "prices: {\"water\": -1.0}"),
            "price per kg of water -1 per kg is not allowed",
        ),
    ];
    for (i, (text, expected)) in cases.iter().enumerate() {
        let err = load_text(dir.path(), &format!("bad{i}.ron"), text.as_bytes()).unwrap_err();
        assert!(err.to_string().contains(expected), "case {i}: {err}");
    }
}

#[test]
fn malformed_files_get_line_and_column() {
    let dir = tempfile::tempdir().unwrap();
    let text = "(\n    format_version: 1,\n    recipe: (lines: [(ingredient: \"water\", amount: (value: oops))]),\n)\n";
    match load_text(dir.path(), "bad.ron", text.as_bytes()) {
        Err(ProjectError::Syntax { line, column, .. }) => assert_eq!((line, column > 1), (3, true)),
        other => panic!("{other:?}"),
    }
}

#[test]
fn truncated_files_are_refused() {
    let dir = tempfile::tempdir().unwrap();
    let text = demo_text();
    let half = &text.as_bytes()[..text.len() / 2];
    let err = load_text(dir.path(), "half.ron", half).unwrap_err();
    assert!(matches!(err, ProjectError::Syntax { .. }), "{err}");
}

#[test]
fn binary_files_are_refused_as_not_text() {
    let dir = tempfile::tempdir().unwrap();
    let bytes: Vec<u8> = (0..2000u32)
        .map(|i| (i * 7919 % 251) as u8 | 0x80)
        .collect();
    let err = load_text(dir.path(), "image.ron", &bytes).unwrap_err();
    assert!(matches!(err, ProjectError::NotText { .. }), "{err}");
    assert!(err.to_string().contains("not a text file"));
}

#[test]
fn huge_files_are_refused_before_reading() {
    let dir = tempfile::tempdir().unwrap();
    let big = vec![b' '; usize::try_from(MAX_FILE_BYTES).unwrap() + 1];
    let err = load_text(dir.path(), "huge.ron", &big).unwrap_err();
    assert!(matches!(err, ProjectError::TooLarge { .. }), "{err}");
}

#[test]
fn deeply_nested_files_are_refused() {
    let dir = tempfile::tempdir().unwrap();
    let text = format!("{}{}", "(".repeat(10_000), ")".repeat(10_000));
    let err = load_text(dir.path(), "deep.ron", text.as_bytes()).unwrap_err();
    assert!(err.to_string().contains("nest deeper"), "{err}");
}

#[test]
fn newer_format_versions_are_named() {
    let dir = tempfile::tempdir().unwrap();
    let text = demo_text().replace("format_version: 2", "format_version: 7");
    let err = load_text(dir.path(), "future.ron", text.as_bytes()).unwrap_err();
    assert!(err.to_string().contains("format version 7"), "{err}");
}

#[test]
fn unknown_ingredients_are_located_and_suggested() {
    let dir = tempfile::tempdir().unwrap();
    let text = demo_text().replace("\"sodium_benzoate\"", "\"sodium_benzoat\"");
    let err = load_text(dir.path(), "typo.ron", text.as_bytes()).unwrap_err();
    let msg = err.to_string();
    assert!(matches!(err, ProjectError::Syntax { .. }), "{msg}");
    assert!(
        msg.contains("recipe line 3") && msg.contains("did you mean sodium_benzoate"),
        "{msg}"
    );
}

#[test]
fn impossible_amounts_are_refused() {
    let dir = tempfile::tempdir().unwrap();
    let text = demo_text().replacen("value: 0.8", "value: -0.8", 1);
    let err = load_text(dir.path(), "negative.ron", text.as_bytes()).unwrap_err();
    assert!(err.to_string().contains("recipe line 1"), "{err}");
    let text = demo_text().replacen("value: 0.8", "value: inf", 1);
    assert!(load_text(dir.path(), "inf.ron", text.as_bytes()).is_err());
}

#[test]
fn a_failed_save_leaves_the_old_file_and_no_litter() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("batch.ron");
    fs::write(&path, "previous contents").unwrap();
    // Failure injected between writing the temporary file and renaming it.
    let err = write_atomic_with(&path, b"new contents", true, |_| {
        Err(std::io::Error::other("disk full (simulated)"))
    });
    assert!(err.is_err());
    assert_eq!(fs::read_to_string(&path).unwrap(), "previous contents");
    let names: Vec<_> = fs::read_dir(dir.path())
        .unwrap()
        .map(|e| e.unwrap().file_name())
        .collect();
    assert_eq!(names.len(), 1, "temporary file left behind: {names:?}");
}

#[test]
fn saving_keeps_the_previous_version_as_a_backup() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("batch.ron");
    let mut project = Project::demo();
    project.save(&path).unwrap();
    project.name = "second".into();
    project.save(&path).unwrap();
    assert_eq!(
        Project::load(&backup_path(&path)).unwrap().name,
        Project::demo().name
    );
    assert_eq!(Project::load(&path).unwrap().name, "second");
}

#[test]
fn saving_into_a_missing_folder_says_why() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("gone").join("batch.ron");
    let err = Project::demo().save(&path).unwrap_err();
    assert!(matches!(err, ProjectError::NoFolder { .. }), "{err}");
    assert!(err.to_string().contains("gone does not exist"), "{err}");
    // A folder where the file should be.
    let err = Project::demo().save(dir.path()).unwrap_err();
    assert!(matches!(err, ProjectError::IsAFolder { .. }), "{err}");
    assert!(err.to_string().contains("is a folder, not a file"), "{err}");
    // The hook the window's tests use runs before the rename; its failure is reported.
    let path = dir.path().join("batch.ron");
    let err = Project::demo()
        .save_with(&path, |_| {
            Err(std::io::Error::other("disk full (injected)"))
        })
        .unwrap_err();
    assert!(err.to_string().contains("disk full (injected)"), "{err}");
    assert!(!path.exists(), "a failed save leaves no file");
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 2000, ..ProptestConfig::default() })]

    #[test]
    fn garbage_text_never_panics_the_loader(text in ".{0,400}") {
        let _ = Project::from_ron(&text, "garbage.ron");
    }

    #[test]
    fn mutated_projects_never_panic_the_loader(cut in 0usize..2000, insert in ".{0,8}", at in 0usize..2000) {
        let text = demo_text();
        let mut chars: Vec<char> = text.chars().collect();
        let cut = cut.min(chars.len());
        chars.truncate(chars.len() - cut / 4);
        let at = at.min(chars.len());
        for (k, c) in insert.chars().enumerate() {
            chars.insert(at + k, c);
        }
        let mutated: String = chars.into_iter().collect();
        if let Ok(p) = Project::from_ron(&mutated, "mutated.ron") {
            // Whatever loads is valid: it passes its own checks.
            prop_assert!(p.validate("mutated.ron").is_ok());
        }
    }

    #[test]
    fn garbage_never_panics_the_formula_parser(text in "[A-Za-z0-9()\\[\\]·.* ]{0,60}|.{0,60}") {
        if let Ok(f) = Formula::parse(&text) {
            prop_assert!(f.molar_mass_g_per_mol().is_finite());
        }
    }
}

#[test]
fn tolerances_and_active_forms_are_saved_and_checked_on_load() {
    let dir = tempfile::tempdir().unwrap();
    let mut p = Project::demo();
    p.settings.tolerances.all_percent = 1.5;
    p.settings
        .tolerances
        .per_ingredient
        .push(("water".into(), 0.5));
    p.settings.band_seed = 9;
    p.settings.active_forms.insert("lactic".into(), 1);
    let text = p.to_ron().unwrap();
    let back = load_text(dir.path(), "good.ron", text.as_bytes()).unwrap();
    assert_eq!(back, p);
    let cases = [
        (
            text.replace("all_percent: 1.5", "all_percent: 75.0"),
            "weighing tolerance of every line 75 % is not allowed",
        ),
        (
            text.replace("band_samples: 1000", "band_samples: 0"),
            "band_samples 0 is not allowed",
        ),
    ];
    for (i, (bad, expected)) in cases.iter().enumerate() {
        assert_ne!(bad, &text, "case {i} changes the file");
        let err = load_text(dir.path(), &format!("bad{i}.ron"), bad.as_bytes()).unwrap_err();
        assert!(err.to_string().contains(expected), "case {i}: {err}");
    }
}
