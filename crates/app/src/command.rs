//! Every user action as a [`Command`] value, and the one handler that carries them out.
//!
//! Menus, keyboard shortcuts and tests all queue commands; file dialogs open only here. Tests
//! use [`Command::OpenPath`] and [`Command::SaveToPath`], since there is no desktop portal to
//! answer a dialog.

use std::path::{Path, PathBuf};

use saltwise_chem::library::{Ingredient, System};
use saltwise_chem::project::Project;
use saltwise_chem::{RecipeLine, Unit};

use crate::app::Workbench;
use crate::document::file_name;
use crate::engine::Engine;
use crate::exports::{self, Export};
use crate::messages::{Notice, Pending};
pub use crate::variant_edit::VariantEdit;

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
    /// Change the recipe in one undoable step.
    Edit(RecipeEdit),
    /// Change the variants or their prices in one undoable step.
    Variant(VariantEdit),
    /// Choose a file and write a chart, its curves or the batch sheet to it.
    Export(Export),
    /// Write a chart, its curves or the batch sheet to the given file.
    ExportToPath(Export, PathBuf),
    /// Choose a readings file and import it as a measured titration.
    ImportReadings,
    /// Import a readings file as a measured titration.
    ImportReadingsFromPath(PathBuf),
    /// Import the readings pasted into the fit form.
    ImportPasted,
    /// Remove a measured titration (by index) from the project.
    RemoveMeasured(usize),
    /// Fit the chosen unknowns to the chosen measured titration.
    RunFit,
    /// Save the last fit's ingredient to the user's own library.
    SaveFitted,
}

/// A discrete change to the recipe: one undo step each. Drags and typing edit the project
/// directly and are recorded when they settle.
#[derive(Debug, Clone, PartialEq)]
pub enum RecipeEdit {
    /// Add a line at the end.
    AddLine(RecipeLine),
    /// Add a custom acid–base system and its ingredient to the project, and a line of it.
    AddCustom {
        /// The system.
        system: System,
        /// The ingredient that releases it.
        ingredient: Box<Ingredient>,
    },
    /// Remove a line (by index).
    RemoveLine(usize),
    /// Move a line one place up.
    MoveUp(usize),
    /// Move a line one place down.
    MoveDown(usize),
    /// Switch a line on or off.
    SetEnabled {
        /// Line index.
        line: usize,
        /// Whether it counts.
        enabled: bool,
    },
    /// Give a line's amount in another unit, keeping its mass where it can be known.
    SetUnit {
        /// Line index.
        line: usize,
        /// The new unit.
        unit: Unit,
    },
    /// Fill the batch with water to a total mass, or stop doing so.
    SetQs(bool),
    /// Add the dose that reaches the target pH to the recipe.
    ApplyDose,
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
                let _ = self.save();
            }
            Command::SaveAs => {
                let _ = self.save_as_dialog();
            }
            Command::SaveToPath(p) => {
                let _ = self.save_to(&p);
            }
            Command::Undo => {
                self.panels.refused.clear();
                if !self.doc.undo() {
                    self.messages.status("Nothing to undo.", false);
                }
            }
            Command::Redo => {
                self.panels.refused.clear();
                if !self.doc.redo() {
                    self.messages.status("Nothing to redo.", false);
                }
            }
            Command::ZoomIn => self.set_zoom(ctx, self.config.zoom * ZOOM_STEP),
            Command::ZoomOut => self.set_zoom(ctx, self.config.zoom / ZOOM_STEP),
            Command::ZoomReset => self.set_zoom(ctx, 1.0),
            Command::Resolve(answer) => self.resolve(ctx, answer),
            Command::Recover => self.guard(ctx, Pending::Recover),
            Command::DiscardRecovery => {
                if let Some(offer) = self.autosave.take_offer() {
                    if let Err(e) = std::fs::remove_file(&offer.left.path) {
                        self.messages.status(
                            &format!("Could not remove {}: {e}", offer.left.path.display()),
                            true,
                        );
                    }
                    self.look_for_left_behind();
                }
            }
            Command::DismissNotice => self.messages.dismiss_notice(),
            Command::Edit(edit) => self.edit(edit),
            Command::Variant(edit) => self.variant_edit(edit),
            Command::Export(export) => {
                let mut dialog = rfd::FileDialog::new()
                    .add_filter(export.extension().to_uppercase(), &[export.extension()])
                    .set_file_name(export.file_name(self.doc.project()));
                if let Some(dir) = self.dialog_dir() {
                    dialog = dialog.set_directory(dir);
                }
                if let Some(path) = dialog.save_file() {
                    self.export_to(export, &path);
                }
            }
            Command::ExportToPath(export, path) => self.export_to(export, &path),
            Command::ImportReadings => {
                let mut dialog = rfd::FileDialog::new()
                    .add_filter("Readings", &["csv", "txt", "tsv"])
                    .add_filter("Any file", &["*"]);
                if let Some(dir) = self.dialog_dir() {
                    dialog = dialog.set_directory(dir);
                }
                if let Some(path) = dialog.pick_file() {
                    self.import_readings_from(&path);
                }
            }
            Command::ImportReadingsFromPath(path) => self.import_readings_from(&path),
            Command::ImportPasted => self.import_pasted(),
            Command::RemoveMeasured(i) => self.remove_measured(i),
            Command::RunFit => self.run_fit(),
            Command::SaveFitted => self.save_fitted(),
        }
    }

    /// Writes an export atomically; says where, or why not (the file there is left as it was).
    fn export_to(&mut self, export: Export, path: &Path) {
        let path = if path.extension().is_none() {
            path.with_extension(export.extension())
        } else {
            path.to_path_buf()
        };
        let date = {
            let secs = std::time::SystemTime::now()
                .duration_since(std::time::UNIX_EPOCH)
                .map_or(0, |d| d.as_secs());
            saltwise_export::sheet::iso_date(secs)
        };
        let written =
            exports::build(&self.engine, self.doc.project(), export, date).and_then(|bytes| {
                saltwise_chem::project::write_atomic(&path, &bytes, false)
                    .map_err(|e| format!("{}: {e}", path.display()))
            });
        match written {
            Ok(()) => self.messages.status(
                &format!("Exported the {} to {}.", export.words(), path.display()),
                false,
            ),
            Err(reason) => self.messages.notify(Notice {
                headline: format!("Could not export the {}", export.words()),
                reason,
                consequence: "Nothing was written; a file already there is as it was.".into(),
            }),
        }
    }

    /// Makes one discrete recipe edit as one undo step.
    fn edit(&mut self, edit: RecipeEdit) {
        let moves_rows = matches!(
            edit,
            RecipeEdit::RemoveLine(_) | RecipeEdit::MoveUp(_) | RecipeEdit::MoveDown(_)
        );
        match edit {
            RecipeEdit::AddLine(line) => {
                self.doc.edit(|p| p.recipe_mut().lines.push(line));
            }
            RecipeEdit::AddCustom { system, ingredient } => {
                let line = RecipeLine::grams(&ingredient.id, 1.0);
                self.doc.edit(|p| {
                    p.custom.systems.push(system);
                    p.custom.ingredients.push(*ingredient);
                    p.recipe_mut().lines.push(line);
                });
            }
            RecipeEdit::RemoveLine(i) => {
                self.doc.edit(|p| {
                    if i < p.recipe().lines.len() {
                        p.recipe_mut().lines.remove(i);
                    }
                });
            }
            RecipeEdit::MoveUp(i) => {
                self.doc.edit(|p| {
                    if i > 0 && i < p.recipe().lines.len() {
                        p.recipe_mut().lines.swap(i - 1, i);
                    }
                });
            }
            RecipeEdit::MoveDown(i) => {
                self.doc.edit(|p| {
                    if i + 1 < p.recipe().lines.len() {
                        p.recipe_mut().lines.swap(i, i + 1);
                    }
                });
            }
            RecipeEdit::SetEnabled { line, enabled } => {
                self.doc.edit(|p| {
                    if let Some(l) = p.recipe_mut().lines.get_mut(line) {
                        l.enabled = enabled;
                    }
                });
            }
            RecipeEdit::SetUnit { line, unit } => {
                let converted = self.engine.amount_in(self.doc.project(), line, unit);
                self.doc.edit(|p| {
                    if let Some(l) = p.recipe_mut().lines.get_mut(line) {
                        l.amount = converted.unwrap_or(saltwise_chem::Amount {
                            value: l.amount.value,
                            unit,
                        });
                    }
                });
            }
            RecipeEdit::SetQs(on) => {
                let batch_g = self
                    .engine
                    .solved()
                    .map_or(1000.0, |r| r.batch.total_mass_g.max(1.0));
                self.doc.edit(|p| {
                    p.recipe_mut().qs_to_g = on.then_some(p.recipe().qs_to_g.unwrap_or(batch_g))
                });
            }
            RecipeEdit::ApplyDose => self.apply_dose(),
        }
        if moves_rows {
            // Row numbers move: a refusal would be shown beside the wrong line.
            self.panels
                .refused
                .retain(|name, _| !name.starts_with("Amount of line"));
        }
    }

    /// Adds the dose to the target onto the adjuster's line (or as a new line), on top of the
    /// batch as weighed: a q.s. batch grows by the dose.
    fn apply_dose(&mut self) {
        let Some(Ok(curve)) = self.engine.curve() else {
            return;
        };
        let Some(Ok(dose)) = &curve.to_target else {
            self.messages.status(
                "There is no dose to add: set a target pH it can reach.",
                true,
            );
            return;
        };
        let (adjuster, name, dose_g) = (
            curve.adjuster.clone(),
            curve.adjuster_name.clone(),
            dose.amount_g,
        );
        let project = self.doc.project();
        // The adjuster's first line in grams takes the dose; otherwise a new line does.
        let existing = project
            .recipe()
            .lines
            .iter()
            .position(|l| l.ingredient == adjuster && l.enabled && l.amount.unit == Unit::Gram);
        self.doc.edit(|p| {
            match existing.and_then(|i| p.recipe_mut().lines.get_mut(i)) {
                Some(line) => line.amount.value += dose_g,
                None => p
                    .recipe_mut()
                    .lines
                    .push(RecipeLine::grams(&adjuster, dose_g)),
            }
            if let Some(qs) = p.recipe_mut().qs_to_g.as_mut() {
                *qs += dose_g;
            }
        });
        self.messages.status(
            &format!(
                "Added {} g of {name} to the recipe, on top of the batch as weighed.",
                crate::ui::sig(dose_g, 4)
            ),
            false,
        );
    }

    /// Runs an action now, or asks about unsaved changes first.
    fn guard(&mut self, ctx: &egui::Context, action: Pending) {
        if let Pending::OpenPath(path) = &action
            && self.doc.is_dirty()
            && let Err(reason) = read_project(&self.engine, path)
        {
            // No point asking about unsaved changes for a file that cannot be opened.
            self.refuse_open(path, reason);
            return;
        }
        if self.doc.is_dirty() {
            self.messages.ask(action);
        } else {
            self.proceed(ctx, action);
        }
    }

    fn resolve(&mut self, ctx: &egui::Context, answer: Resolution) {
        let Some(prompt) = self.messages.take_prompt() else {
            return;
        };
        match answer {
            Resolution::Cancel => {}
            Resolution::Discard => self.proceed(ctx, prompt.action),
            Resolution::SaveFirst => {
                if self.save() {
                    self.proceed(ctx, prompt.action);
                }
            }
        }
    }

    /// Puts a new project in the window: no question, no refusals left over.
    fn replace_project(&mut self, project: Project, file: Option<PathBuf>) {
        self.panels.refused.clear();
        self.doc.replace(project, file);
        let _ = self.messages.take_prompt();
    }

    fn proceed(&mut self, ctx: &egui::Context, action: Pending) {
        match action {
            Pending::New => {
                self.replace_project(Project::default(), None);
                self.messages.status("New project.", false);
            }
            Pending::OpenDemo => {
                self.replace_project(Project::demo(), None);
                self.messages.status("Demo project opened.", false);
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
                self.autosave.forget();
                self.save_config();
                ctx.send_viewport_cmd(egui::ViewportCommand::Close);
            }
        }
    }

    fn recover(&mut self) {
        let Some(offer) = self.autosave.take_offer() else {
            return;
        };
        let path = offer.left.path;
        match read_project(&self.engine, &path) {
            Ok(project) => {
                // Recovered work is unsaved work: it has no file yet and shows as changed.
                self.panels.refused.clear();
                self.doc.replace_with_unsaved(project);
                self.messages.dismiss_notice();
                match self.autosave.adopt(&path, self.doc.project()) {
                    Ok(()) => self.messages.status(
                        "Recovered the unsaved work of the last session; save it to keep it.",
                        false,
                    ),
                    Err(e) => self.messages.status(
                        &format!("Recovered; the kept copy stays where it was ({e})."),
                        true,
                    ),
                }
                self.look_for_left_behind();
            }
            Err(reason) => {
                self.messages.notify(Notice {
                    headline: "Could not recover the unsaved work".into(),
                    reason,
                    consequence: format!(
                        "The open project is unchanged; the kept copy stays at {}.",
                        path.display()
                    ),
                });
            }
        }
    }

    fn refuse_open(&mut self, path: &Path, reason: String) {
        self.messages.notify(Notice {
            headline: format!("Could not open {}", file_name(path)),
            reason,
            consequence:
                "Nothing was changed: the open project is as it was, and the file was not modified."
                    .into(),
        });
        self.messages
            .status(&format!("Could not open {}.", path.display()), true);
    }

    fn open_path(&mut self, path: &Path) {
        match read_project(&self.engine, path) {
            Ok(project) => {
                self.replace_project(project, Some(path.to_path_buf()));
                self.messages.dismiss_notice();
                self.config.push_recent(path);
                self.save_config();
                self.messages
                    .status(&format!("Opened {}.", path.display()), false);
            }
            Err(reason) => {
                self.config.recent_files.retain(|p| p != path || p.exists());
                self.refuse_open(path, reason);
            }
        }
    }

    /// Saves to the current file or asks for one; returns whether the project was saved.
    fn save(&mut self) -> bool {
        match self.doc.file().map(Path::to_path_buf) {
            Some(path) => self.save_to(&path),
            None => self.save_as_dialog(),
        }
    }

    fn save_as_dialog(&mut self) -> bool {
        let mut dialog = rfd::FileDialog::new()
            .add_filter("Saltwise project", &["ron"])
            .set_file_name(self.doc.suggested_file_name());
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
                self.doc.mark_saved(path.clone());
                self.autosave.forget();
                self.messages.dismiss_notice();
                self.config.push_recent(&path);
                self.save_config();
                self.messages
                    .status(&format!("Saved {}.", path.display()), false);
                true
            }
            Err(reason) => {
                self.messages.notify(Notice {
                    headline: format!("Could not save {}", file_name(&path)),
                    reason,
                    consequence: "Nothing was lost: the project is still open with all its changes, not yet saved. Try again, or choose another place with Save as… in the File menu.".into(),
                });
                self.messages
                    .status(&format!("Could not save {}.", path.display()), true);
                false
            }
        }
    }

    /// Writes the project through the core's one save path (atomic, previous file kept as a
    /// backup); any injected fault runs between writing the temporary file and renaming it.
    fn write_project(&self, path: &Path) -> Result<(), String> {
        let fault = self.save_fault();
        self.doc
            .project()
            .save_with(path, |tmp| fault.map_or(Ok(()), |f| f(tmp)))
            .map_err(|e| e.to_string())
    }

    fn set_zoom(&mut self, ctx: &egui::Context, zoom: f32) {
        let zoom = zoom.clamp(ZOOM_RANGE.0, ZOOM_RANGE.1);
        self.config.zoom = zoom;
        ctx.set_zoom_factor(zoom);
        self.save_config();
    }

    fn dialog_dir(&self) -> Option<PathBuf> {
        self.doc
            .file()
            .or(self.config.recent_files.first().map(PathBuf::as_path))
            .and_then(Path::parent)
            .map(Path::to_path_buf)
    }
}

/// Reads a project file as untrusted input: every problem comes back as the core words it.
pub(crate) fn read_project(engine: &Engine, path: &Path) -> Result<Project, String> {
    let base = engine.base_library().map_err(str::to_owned)?;
    Project::load_with_library(path, base)
        .map(|(project, _)| project)
        .map_err(|e| e.to_string())
}
