//! Helpers shared by the workbench tests: a harness on real folders, a bench recipe, typing.
#![allow(
    dead_code,
    reason = "each test file uses a different part of the helpers"
)]

use std::path::{Path, PathBuf};

use egui::{Key, Modifiers};
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable as _;
use saltwise::user_store::UserStore;
use saltwise::{ConfigStore, RecoveryStore, Workbench};
use saltwise_chem::project::Project;
use saltwise_chem::{Recipe, RecipeLine};

/// The config and data folders of one simulated user, inside a temp dir.
pub struct Folders {
    /// Settings and recent files.
    pub config: PathBuf,
    /// Copies of unsaved work.
    pub data: PathBuf,
}

impl Folders {
    /// Folders under `root`, not created yet (the workbench creates what it needs).
    pub fn under(root: &Path) -> Self {
        Self {
            config: root.join("config"),
            data: root.join("data"),
        }
    }
}

/// Most frames one `run()` may take before the window must have settled.
pub const MAX_STEPS: u64 = 400;

/// A workbench on `project` in a 1600×1000 window, keeping its files in `folders`.
pub fn harness_in(project: Project, folders: &Folders) -> Harness<'static, Workbench> {
    let app = Workbench::with_stores(
        project,
        ConfigStore::at(&folders.config),
        RecoveryStore::at(&folders.data),
    )
    .with_user_store(UserStore::in_dir(&folders.data));
    Harness::builder()
        .with_size([1600.0, 1000.0])
        // The pH band is drawn a part per frame (8 ms each): a debug build on a loaded machine
        // takes a few dozen frames to settle.
        .with_max_steps(MAX_STEPS)
        .build_ui_state(|ui, app: &mut Workbench| app.show(ui), app)
}

/// A bench recipe of ingredients every library has: water and citric acid.
pub fn citric_project() -> Project {
    let mut p = Project::with_recipe(Recipe {
        lines: vec![
            RecipeLine::grams("water", 900.0),
            RecipeLine::grams("citric_acid_monohydrate", 10.0),
        ],
        qs_to_g: None,
        water_hardness: None,
    });
    p.name = "Citric rinse".into();
    p
}

/// Focuses the field named `label`, replaces its text with `text` and presses Enter.
pub fn type_into(harness: &mut Harness<'_, Workbench>, label: &str, text: &str) {
    harness.get_by_label(label).focus();
    harness.run();
    harness.key_press_modifiers(Modifiers::COMMAND, Key::A);
    harness.get_by_label(label).type_text(text);
    harness.run();
    harness.key_press(Key::Enter);
    harness.run();
}

/// Names of the files in a folder, sorted (empty when the folder does not exist).
pub fn file_names(dir: &Path) -> Vec<String> {
    let mut names: Vec<String> = std::fs::read_dir(dir)
        .map(|rd| {
            rd.filter_map(Result::ok)
                .map(|e| e.file_name().to_string_lossy().into_owned())
                .collect()
        })
        .unwrap_or_default();
    names.sort();
    names
}
