//! Every user action as a [`Command`] value, and the one handler that carries them out.
//!
//! Menus, keyboard shortcuts and tests all queue commands; file dialogs open only here. Tests
//! use [`Command::OpenPath`] and [`Command::SaveToPath`], since there is no desktop portal to
//! answer a dialog.

use std::path::{Path, PathBuf};

use saltwise_chem::project::Project;

use crate::app::{Prompt, Workbench};

/// A user action.
#[derive(Debug, Clone, PartialEq)]
pub enum Command {
    /// Start a new, empty project (asks first if there are unsaved changes).
    New,
    /// Open the built-in demo project (asks first if there are unsaved changes).
    OpenDemo,
    /// Choose a project file to open (asks first if there are unsaved changes).
    Open,
    /// Open a project file (asks first if there are unsaved changes).
    OpenPath(PathBuf),
    /// Save to the current file, or choose one.
    Save,
    /// Choose a file and save to it.
    SaveAs,
    /// Save to the given file, which becomes the current one.
    SaveToPath(PathBuf),
    /// Step back one edit.
    Undo,
    /// Step forward one edit.
    Redo,
    /// Make everything larger.
    ZoomIn,
    /// Make everything smaller.
    ZoomOut,
    /// Normal size.
    ZoomReset,
    /// Close the window (asks first if there are unsaved changes).
    Quit,
    /// Answer the unsaved-changes question.
    Resolve(Resolution),
    /// Open the copy of unsaved work kept from an earlier session.
    Recover,
    /// Throw away the copy of unsaved work kept from an earlier session.
    DiscardRecovery,
}

/// An answer to the unsaved-changes question.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Resolution {
    /// Save the project, then go on.
    SaveFirst,
    /// Drop the changes and go on.
    Discard,
    /// Do nothing.
    Cancel,
}

/// What waits for the unsaved-changes answer.
#[derive(Debug, Clone, PartialEq)]
pub(crate) enum Pending {
    New,
    OpenDemo,
    Open,
    OpenPath(PathBuf),
    Quit,
}

/// Smallest and largest zoom factors.
const ZOOM_RANGE: (f32, f32) = (0.6, 2.5);
/// One zoom step.
const ZOOM_STEP: f32 = 1.15;

impl Workbench {
    /// Carries out one command.
    pub fn handle(&mut self, ctx: &egui::Context, command: Command) {
        match command {
            Command::New => self.guard(ctx, Pending::New),
            Command::OpenDemo => self.guard(ctx, Pending::OpenDemo),
            Command::Open => self.guard(ctx, Pending::Open),
            Command::OpenPath(p) => self.guard(ctx, Pending::OpenPath(p)),
            Command::Quit => self.guard(ctx, Pending::Quit),
            Command::Save => {
                let _ = self.save(ctx);
            }
            Command::SaveAs => {
                let _ = self.save_as_dialog(ctx);
            }
            Command::SaveToPath(p) => {
                let _ = self.save_to(&p);
            }
            Command::Undo => {
                if !self.history.undo(&mut self.project) {
                    self.set_status("nothing to undo", false);
                }
            }
            Command::Redo => {
                if !self.history.redo(&mut self.project) {
                    self.set_status("nothing to redo", false);
                }
            }
            Command::ZoomIn => self.set_zoom(ctx, self.config.zoom * ZOOM_STEP),
            Command::ZoomOut => self.set_zoom(ctx, self.config.zoom / ZOOM_STEP),
            Command::ZoomReset => self.set_zoom(ctx, 1.0),
            Command::Resolve(answer) => self.resolve(ctx, answer),
            Command::Recover => self.recover(),
            Command::DiscardRecovery => {
                self.recovery_offer = None;
                self.store().clear_recovery();
            }
        }
    }

    /// Runs an action now, or asks about unsaved changes first.
    fn guard(&mut self, ctx: &egui::Context, action: Pending) {
        if self.is_dirty() {
            self.prompt = Some(Prompt { action });
        } else {
            self.proceed(ctx, action);
        }
    }

    fn resolve(&mut self, ctx: &egui::Context, answer: Resolution) {
        let Some(prompt) = self.prompt.take() else {
            return;
        };
        match answer {
            Resolution::Cancel => {}
            Resolution::Discard => self.proceed(ctx, prompt.action),
            Resolution::SaveFirst => {
                if self.save(ctx) {
                    self.proceed(ctx, prompt.action);
                }
            }
        }
    }

    fn proceed(&mut self, ctx: &egui::Context, action: Pending) {
        match action {
            Pending::New => {
                self.replace_project(Project::default(), None);
                self.set_status("new project", false);
            }
            Pending::OpenDemo => {
                self.replace_project(Project::demo(), None);
                self.set_status("demo project opened", false);
            }
            Pending::Open => {
                let mut dialog = rfd::FileDialog::new().add_filter("Saltwise project", &["ron"]);
                if let Some(dir) = self.dialog_dir() {
                    dialog = dialog.set_directory(dir);
                }
                if let Some(path) = dialog.pick_file() {
                    self.open_path(&path);
                }
            }
            Pending::OpenPath(path) => self.open_path(&path),
            Pending::Quit => {
                self.allow_close = true;
                self.quit_requested = true;
                self.store().clear_recovery();
                self.save_config();
                ctx.send_viewport_cmd(egui::ViewportCommand::Close);
            }
        }
    }

    fn recover(&mut self) {
        let Some(path) = self.recovery_offer.take() else {
            return;
        };
        match Project::load(&path) {
            Ok(project) => {
                // Recovered work is unsaved work: it has no file yet and shows as changed.
                self.replace_with_unsaved(project);
                self.set_status(
                    "recovered the unsaved work of the last session; save it to keep it",
                    false,
                );
            }
            Err(e) => self.set_status(&format!("could not recover: {e}"), true),
        }
    }

    fn open_path(&mut self, path: &Path) {
        match Project::load(path) {
            Ok(project) => {
                self.replace_project(project, Some(path.to_path_buf()));
                self.config.push_recent(path);
                self.save_config();
                self.set_status(&format!("opened {}", path.display()), false);
            }
            Err(e) => {
                self.config.recent_files.retain(|p| p != path || p.exists());
                self.set_status(&format!("could not open: {e}"), true);
            }
        }
    }

    /// Saves to the current file or asks for one; returns whether the project was saved.
    fn save(&mut self, ctx: &egui::Context) -> bool {
        match self.file.clone() {
            Some(path) => self.save_to(&path),
            None => self.save_as_dialog(ctx),
        }
    }

    fn save_as_dialog(&mut self, _ctx: &egui::Context) -> bool {
        let mut dialog = rfd::FileDialog::new()
            .add_filter("Saltwise project", &["ron"])
            .set_file_name(self.suggested_file_name());
        if let Some(dir) = self.dialog_dir() {
            dialog = dialog.set_directory(dir);
        }
        match dialog.save_file() {
            Some(path) => self.save_to(&path),
            None => false,
        }
    }

    fn save_to(&mut self, path: &Path) -> bool {
        let path = if path.extension().is_none() {
            path.with_extension("ron")
        } else {
            path.to_path_buf()
        };
        match self.project.save(&path) {
            Ok(()) => {
                self.mark_saved(path.clone());
                self.config.push_recent(&path);
                self.save_config();
                self.set_status(&format!("saved {}", path.display()), false);
                true
            }
            Err(e) => {
                self.set_status(&format!("could not save: {e}"), true);
                false
            }
        }
    }

    fn set_zoom(&mut self, ctx: &egui::Context, zoom: f32) {
        let zoom = zoom.clamp(ZOOM_RANGE.0, ZOOM_RANGE.1);
        self.config.zoom = zoom;
        ctx.set_zoom_factor(zoom);
        self.save_config();
    }

    fn dialog_dir(&self) -> Option<PathBuf> {
        self.file
            .as_ref()
            .or(self.config.recent_files.first())
            .and_then(|p| p.parent())
            .map(Path::to_path_buf)
    }

    fn suggested_file_name(&self) -> String {
        let stem: String = self
            .project
            .name
            .chars()
            .map(|c| {
                if c.is_alphanumeric() {
                    c.to_ascii_lowercase()
                } else {
                    '-'
                }
            })
            .collect();
        let stem = stem.trim_matches('-');
        if stem.is_empty() {
            "project.ron".into()
        } else {
            format!("{stem}.ron")
        }
    }
}
