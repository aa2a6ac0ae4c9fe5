//! The Saltwise workbench: a recipe table, the live pH, the dose curve and the species chart of a
//! water-based recipe, over the `saltwise_chem` core.
//!
//! [`Workbench`] is the whole window; [`Workbench::show`] draws one frame into any [`egui::Ui`],
//! so the tests drive the real program through `egui_kittest`. Every user action is a
//! [`Command`] handled in one place (`command.rs`). The state is split by what it is for: the
//! [`Document`] (project, saved copy, file, undo history), the [`Messages`] (status, file
//! problem, question), [`Autosave`] (copies of unsaved work and the one offered back), the
//! [`Engine`] (solved results cached on their inputs) and the panels' own state under `ui/`.

#![warn(missing_docs)]

mod app;
mod autosave;
mod band_job;
mod command;
mod config;
mod document;
mod engine;
pub mod exports;
mod history;
mod measured;
mod messages;
mod recovery;
mod ui;
pub mod user_store;
mod variant_edit;

pub use app::{SaveFault, Workbench};
pub use autosave::{AUTOSAVE_IDLE_SECS, Autosave, Offer, Tick};
pub use band_job::BandState;
pub use command::{Command, RecipeEdit, Resolution, VariantEdit};
pub use config::{CONFIG_DIR_ENV, ConfigStore, UserConfig};
pub use document::Document;
pub use engine::{CurveData, CurvePoint, Engine, QcData, SpeciesData};
pub use messages::{Messages, Notice, Pending, Prompt, Status};
pub use recovery::{DATA_DIR_ENV, LeftBehind, RecoveryStore};

use std::process::ExitCode;

/// Opens the window on the demo project and runs until it closes.
pub fn run() -> ExitCode {
    let store = ConfigStore::from_env();
    let (config, _) = store.load();
    let size = config.window_size.unwrap_or([1600.0, 1000.0]);
    let options = eframe::NativeOptions {
        renderer: eframe::Renderer::Glow,
        persist_window: false,
        viewport: egui::ViewportBuilder::default()
            .with_title("Saltwise")
            .with_app_id("saltwise")
            .with_inner_size([size[0].max(640.0), size[1].max(480.0)])
            .with_min_inner_size([640.0, 480.0]),
        ..Default::default()
    };
    let args: Vec<std::path::PathBuf> = std::env::args_os().skip(1).map(Into::into).collect();
    let result = eframe::run_native(
        "Saltwise",
        options,
        Box::new(move |_cc| {
            let mut app = Workbench::new(store, RecoveryStore::from_env());
            if let Some(path) = args.first() {
                app.queue(Command::OpenPath(path.clone()));
            }
            Ok(Box::new(app))
        }),
    );
    match result {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("saltwise: the window could not be opened: {e}");
            ExitCode::FAILURE
        }
    }
}
