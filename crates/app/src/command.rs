//! Every user action as a [`Command`] value, and the one handler that carries them out.
//!
//! Menus, keyboard shortcuts and tests all queue commands; file dialogs open only here. Tests
//! use [`Command::OpenPath`] and [`Command::SaveToPath`], since there is no desktop portal to
//! answer a dialog.

use std::path::{Path, PathBuf};

use saltwise_chem::project::{Project, write_atomic_with};

use crate::app::{Notice, Prompt, Workbench};

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
    /// Hide the file problem shown under the menu.
    DismissNotice,
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
    Recover,
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
                self.panels.refused.clear();
                if !self.history.undo(&mut self.project) {
                    self.set_status("nothing to undo", false);
                }
            }
            Command::Redo => {
                self.panels.refused.clear();
                if !self.history.redo(&mut self.project) {
                    self.set_status("nothing to redo", false);
                }
            }
            Command::ZoomIn => self.set_zoom(ctx, self.config.zoom * ZOOM_STEP),
            Command::ZoomOut => self.set_zoom(ctx, self.config.zoom / ZOOM_STEP),
            Command::ZoomReset => self.set_zoom(ctx, 1.0),
            Command::Resolve(answer) => self.resolve(ctx, answer),
            Command::Recover => self.guard(ctx, Pending::Recover),
            Command::DiscardRecovery => {
                if let Some(offer) = self.recovery_offer.take() {
                    if let Err(e) = std::fs::remove_file(&offer.path) {
                        self.set_status(
                            &format!("could not remove {}: {e}", offer.path.display()),
                            true,
                        );
                    }
                    self.look_for_left_behind();
                }
            }
            Command::DismissNotice => self.notice = None,
        }
    }

    /// Runs an action now, or asks about unsaved changes first.
    fn guard(&mut self, ctx: &egui::Context, action: Pending) {
        if let Pending::OpenPath(path) = &action
            && self.is_dirty()
            && let Err(reason) = self.read_project(path)
        {
            // No point asking about unsaved changes for a file that cannot be opened.
            self.refuse_open(path, reason);
            return;
        }
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
            Pending::Recover => self.recover(),
            Pending::Quit => {
                self.allow_close = true;
                self.quit_requested = true;
                self.forget_autosave();
                self.save_config();
                ctx.send_viewport_cmd(egui::ViewportCommand::Close);
            }
        }
    }

    fn recover(&mut self) {
        let Some(offer) = self.recovery_offer.take() else {
            return;
        };
        match self.read_project(&offer.path) {
            Ok(project) => {
                // Recovered work is unsaved work: it has no file yet and shows as changed.
                self.replace_with_unsaved(project);
                self.notice = None;
                match self.adopt_autosave(&offer.path) {
                    Ok(()) => self.set_status(
                        "recovered the unsaved work of the last session; save it to keep it",
                        false,
                    ),
                    Err(e) => self.set_status(
                        &format!("recovered; the kept copy stays where it was ({e})"),
                        true,
                    ),
                }
                self.look_for_left_behind();
            }
            Err(reason) => {
                self.notice = Some(Notice {
                    headline: "Could not recover the unsaved work".into(),
                    reason,
                    consequence: format!(
                        "The open project is unchanged; the kept copy stays at {}.",
                        offer.path.display()
                    ),
                });
            }
        }
    }

    /// Reads a project file as untrusted input: every problem comes back as the core words it.
    pub(crate) fn read_project(&self, path: &Path) -> Result<Project, String> {
        let base = self.engine.base_library().map_err(str::to_owned)?;
        Project::load_with_library(path, base)
            .map(|(project, _)| project)
            .map_err(|e| e.to_string())
    }

    fn refuse_open(&mut self, path: &Path, reason: String) {
        self.notice = Some(Notice {
            headline: format!("Could not open {}", file_name(path)),
            reason,
            consequence:
                "Nothing was changed: the open project is as it was, and the file was not modified."
                    .into(),
        });
        self.set_status(&format!("could not open {}", path.display()), true);
    }

    fn open_path(&mut self, path: &Path) {
        match self.read_project(path) {
            Ok(project) => {
                self.replace_project(project, Some(path.to_path_buf()));
                self.notice = None;
                self.config.push_recent(path);
                self.save_config();
                self.set_status(&format!("opened {}", path.display()), false);
            }
            Err(reason) => {
                self.config.recent_files.retain(|p| p != path || p.exists());
                self.refuse_open(path, reason);
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
        match self.write_project(&path) {
            Ok(()) => {
                self.mark_saved(path.clone());
                self.notice = None;
                self.config.push_recent(&path);
                self.save_config();
                self.set_status(&format!("saved {}", path.display()), false);
                true
            }
            Err(reason) => {
                self.notice = Some(Notice {
                    headline: format!("Could not save {}", file_name(&path)),
                    reason,
                    consequence: "Nothing was lost: the project is still open with all its changes, not yet saved. Try again, or choose another place with Save as… in the File menu.".into(),
                });
                self.set_status(&format!("could not save {}", path.display()), true);
                false
            }
        }
    }

    /// Writes the project atomically, the previous file kept as a backup; any injected fault
    /// runs between writing the temporary file and renaming it.
    fn write_project(&self, path: &Path) -> Result<(), String> {
        if path.is_dir() {
            return Err(format!(
                "{} is a folder, not a file: choose a file name inside it",
                path.display()
            ));
        }
        let text = self
            .project
            .to_ron()
            .map_err(|e| format!("the project could not be written as text: {e}"))?;
        let fault = self.save_fault();
        write_atomic_with(path, text.as_bytes(), true, |tmp| {
            fault.map_or(Ok(()), |f| f(tmp))
        })
        .map_err(|e| match path.parent() {
            Some(dir) if !dir.as_os_str().is_empty() && !dir.is_dir() => {
                format!(
                    "{}: the folder {} does not exist ({e})",
                    path.display(),
                    dir.display()
                )
            }
            _ => format!("{}: {e}", path.display()),
        })
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

/// The last part of a path, for headlines.
fn file_name(path: &Path) -> String {
    path.file_name().map_or_else(
        || path.display().to_string(),
        |n| n.to_string_lossy().into_owned(),
    )
}
