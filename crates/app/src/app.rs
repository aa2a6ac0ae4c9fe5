//! The workbench window: the open project, its runtime state, and one frame of drawing.

use std::path::{Path, PathBuf};

use egui::{Key, KeyboardShortcut, Modifiers};
use saltwise_chem::project::Project;

use crate::command::{Command, Pending};
use crate::config::{ConfigStore, UserConfig};
use crate::engine::Engine;
use crate::history::History;
use crate::recovery::{LeftBehind, RecoveryStore};
use crate::ui;

/// A failure injected into saves between writing the temporary file and renaming it (tests).
pub type SaveFault = Box<dyn Fn(&Path) -> std::io::Result<()>>;

/// An unsaved-changes question waiting for an answer.
#[derive(Debug, Clone, PartialEq)]
pub struct Prompt {
    pub(crate) action: Pending,
}

impl Prompt {
    /// The question in words.
    pub fn question(&self) -> &'static str {
        match self.action {
            Pending::New => "Start a new project? This one has unsaved changes.",
            Pending::OpenDemo => "Open the demo project? This one has unsaved changes.",
            Pending::Open | Pending::OpenPath(_) => {
                "Open another project? This one has unsaved changes."
            }
            Pending::Recover => {
                "Recover the unsaved work of the last session? This project has unsaved changes."
            }
            Pending::Quit => "Quit Saltwise? This project has unsaved changes.",
        }
    }
}

/// A message in the status line.
#[derive(Debug, Clone, PartialEq, Eq)]
pub(crate) struct Status {
    pub text: String,
    pub is_error: bool,
}

/// A problem with a file that needs to be read, shown in a strip under the menu until dismissed.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Notice {
    /// What failed, in a few words ("Could not open degreaser.ron").
    pub headline: String,
    /// Why, as the core reports it: what, where, what is allowed.
    pub reason: String,
    /// What this means for the open project.
    pub consequence: String,
}

/// Runtime state of the panels that is not part of the project.
#[derive(Debug, Clone, Default)]
pub(crate) struct PanelState {
    /// Text typed into the ingredient picker.
    pub picker_query: String,
    /// Whether the dose curve shows buffer capacity.
    pub show_buffer_capacity: bool,
    /// The custom-ingredient form.
    pub custom: ui::custom_ingredient::CustomForm,
    /// Why the last text typed into a number field was refused, by the field's name.
    pub refused: ui::Refusals,
}

/// The whole workbench: the saved project apart from what is only kept while running.
pub struct Workbench {
    pub(crate) project: Project,
    pub(crate) file: Option<PathBuf>,
    saved: Project,
    pub(crate) history: History,
    pub(crate) engine: Engine,
    pub(crate) config: UserConfig,
    store: ConfigStore,
    pub(crate) prompt: Option<Prompt>,
    queue: Vec<Command>,
    pub(crate) panels: PanelState,
    pub(crate) status: Option<Status>,
    title: String,
    started: bool,
    pub(crate) allow_close: bool,
    pub(crate) quit_requested: bool,
    /// Where copies of unsaved work are kept.
    recovery: RecoveryStore,
    /// A copy of unsaved work from an earlier session, waiting for an answer.
    pub(crate) recovery_offer: Option<LeftBehind>,
    /// The offered copy's project name and size, if it could be read.
    pub(crate) recovery_summary: Option<String>,
    /// How many more copies than the offered one were left behind.
    pub(crate) more_left_behind: usize,
    /// Seconds without an edit before unsaved work is kept.
    autosave_idle_secs: f64,
    /// The project as it was at the last edit, and when that was (seconds of input time).
    last_edit: (Project, f64),
    /// The project as last kept for recovery.
    autosaved: Option<Project>,
    /// After a failed autosave, no new attempt before this time (seconds of input time).
    autosave_retry_at: f64,
    /// A file problem shown until dismissed.
    pub(crate) notice: Option<Notice>,
    save_fault: Option<SaveFault>,
}

/// Default seconds of idle after the last edit before unsaved work is kept.
pub const AUTOSAVE_IDLE_SECS: f64 = 3.0;
/// Seconds before a failed autosave is tried again.
const AUTOSAVE_RETRY_SECS: f64 = 30.0;

impl Workbench {
    /// A workbench on the demo project, with settings kept by `store` and copies of unsaved work
    /// by `recovery`.
    pub fn new(store: ConfigStore, recovery: RecoveryStore) -> Self {
        Self::with_stores(Project::demo(), store, recovery)
    }

    /// A workbench on the given project (not yet saved anywhere) that keeps no copies of
    /// unsaved work.
    pub fn with_project(project: Project, store: ConfigStore) -> Self {
        Self::with_stores(project, store, RecoveryStore::none())
    }

    /// A workbench on the given project, with settings kept by `store` and copies of unsaved
    /// work by `recovery`; a copy left behind by a crashed session is offered back.
    pub fn with_stores(project: Project, store: ConfigStore, recovery: RecoveryStore) -> Self {
        let (config, problem) = store.load();
        let project_copy = project.clone();
        let mut app = Self {
            saved: project.clone(),
            history: History::new(&project),
            project,
            file: None,
            engine: Engine::new(),
            config,
            store,
            prompt: None,
            queue: Vec::new(),
            panels: PanelState::default(),
            status: None,
            title: String::new(),
            started: false,
            allow_close: false,
            quit_requested: false,
            last_edit: (project_copy, 0.0),
            recovery,
            recovery_offer: None,
            recovery_summary: None,
            more_left_behind: 0,
            autosave_idle_secs: AUTOSAVE_IDLE_SECS,
            autosaved: None,
            autosave_retry_at: 0.0,
            notice: None,
            save_fault: None,
        };
        app.look_for_left_behind();
        if let Some(problem) = problem {
            app.set_status(&problem, true);
        }
        app
    }

    /// Queues a command for the next frame (menus, shortcuts and tests all come here).
    pub fn queue(&mut self, command: Command) {
        self.queue.push(command);
    }

    /// The open project.
    pub fn project(&self) -> &Project {
        &self.project
    }

    /// The open project, for edits (tests and scripted changes).
    pub fn project_mut(&mut self) -> &mut Project {
        &mut self.project
    }

    /// The solved state of the open project.
    pub fn engine(&self) -> &Engine {
        &self.engine
    }

    /// The file the project was last opened from or saved to.
    pub fn file_path(&self) -> Option<&Path> {
        self.file.as_deref()
    }

    /// Whether the project differs from what was last opened or saved.
    pub fn is_dirty(&self) -> bool {
        self.project != self.saved
    }

    /// The window title: file name and an unsaved-changes mark.
    pub fn title(&self) -> String {
        let name = match &self.file {
            Some(p) => p.file_name().map_or_else(
                || p.display().to_string(),
                |n| n.to_string_lossy().into_owned(),
            ),
            None if self.project.name.trim().is_empty() => "Untitled".to_owned(),
            None => self.project.name.clone(),
        };
        let mark = if self.is_dirty() { "• " } else { "" };
        format!("{mark}{name} — Saltwise")
    }

    /// The unsaved-changes question, if one is open.
    pub fn prompt(&self) -> Option<&Prompt> {
        self.prompt.as_ref()
    }

    /// The status line message, if any.
    pub fn status_text(&self) -> Option<&str> {
        self.status.as_ref().map(|s| s.text.as_str())
    }

    /// The settings kept between sessions.
    pub fn user_config(&self) -> &UserConfig {
        &self.config
    }

    /// Whether a Quit has gone ahead (the window was asked to close).
    pub fn quit_requested(&self) -> bool {
        self.quit_requested
    }

    /// Sets how many seconds after the last edit unsaved work is kept for recovery.
    pub fn set_autosave_idle_secs(&mut self, secs: f64) {
        self.autosave_idle_secs = secs.max(0.0);
    }

    /// The copy of unsaved work from an earlier session, if one is offered.
    pub fn recovery_offer(&self) -> Option<&Path> {
        self.recovery_offer.as_ref().map(|l| l.path.as_path())
    }

    /// This session's copy of unsaved work (whether or not it exists yet).
    pub fn recovery_file(&self) -> Option<PathBuf> {
        self.recovery.session_file()
    }

    /// The file problem shown under the menu, if any.
    pub fn notice(&self) -> Option<&Notice> {
        self.notice.as_ref()
    }

    /// Makes every later save of a project file run `fault` between writing the temporary file
    /// and renaming it, as a failing disk would (tests).
    pub fn inject_save_fault(&mut self, fault: impl Fn(&Path) -> std::io::Result<()> + 'static) {
        self.save_fault = Some(Box::new(fault));
    }

    pub(crate) fn save_fault(&self) -> Option<&SaveFault> {
        self.save_fault.as_ref()
    }

    /// Offers the newest copy of unsaved work left behind by a session that did not close.
    pub(crate) fn look_for_left_behind(&mut self) {
        let mut left = self.recovery.left_behind();
        self.more_left_behind = left.len().saturating_sub(1);
        self.recovery_offer = (!left.is_empty()).then(|| left.remove(0));
        self.recovery_summary = self.recovery_offer.as_ref().and_then(|offer| {
            let project = self.read_project(&offer.path).ok()?;
            let n = project.recipe.lines.len();
            Some(format!(
                "“{}”, {n} recipe line{}",
                project.name,
                if n == 1 { "" } else { "s" }
            ))
        });
        if let Some(offer) = &self.recovery_offer {
            eprintln!(
                "saltwise: unsaved work from an earlier session is offered for recovery: {}",
                offer.path.display()
            );
        }
    }

    /// This session's copy of unsaved work is no longer needed.
    pub(crate) fn forget_autosave(&mut self) {
        self.recovery.clear();
        self.autosaved = None;
    }

    /// Takes a recovered copy as this session's own, so it is kept until saved.
    pub(crate) fn adopt_autosave(&mut self, left: &Path) -> Result<(), String> {
        self.recovery.adopt(left)?;
        self.autosaved = Some(self.project.clone());
        Ok(())
    }

    /// Whether there is an edit to undo.
    pub fn can_undo(&self) -> bool {
        self.history.can_undo()
    }

    pub(crate) fn set_status(&mut self, text: &str, is_error: bool) {
        self.status = Some(Status {
            text: text.to_owned(),
            is_error,
        });
    }

    pub(crate) fn replace_project(&mut self, project: Project, file: Option<PathBuf>) {
        self.panels.refused.clear();
        self.saved = project.clone();
        self.history = History::new(&project);
        self.project = project;
        self.file = file;
        self.prompt = None;
    }

    /// Opens work that was never saved: no file, and every bit of it counts as a change.
    pub(crate) fn replace_with_unsaved(&mut self, project: Project) {
        self.replace_project(project, None);
        self.saved = Project::default();
    }

    pub(crate) fn mark_saved(&mut self, path: PathBuf) {
        self.saved = self.project.clone();
        self.forget_autosave();
        self.file = Some(path);
    }

    pub(crate) fn save_config(&mut self) {
        if let Err(e) = self.store.save(&self.config) {
            self.set_status(&e, true);
        }
    }

    /// Draws one frame of the whole window into `ui` and carries out what was asked.
    pub fn show(&mut self, ui: &mut egui::Ui) {
        let ctx = ui.ctx().clone();
        if !self.started {
            self.started = true;
            ctx.options_mut(|o| o.zoom_with_keyboard = false);
            ctx.set_zoom_factor(self.config.zoom);
        }
        self.watch_close_request(&ctx);
        self.read_shortcuts(&ctx);
        for command in std::mem::take(&mut self.queue) {
            self.handle(&ctx, command);
        }
        self.engine.refresh(&self.project);

        egui::Panel::top("command_bar").show(ui, |ui| ui::top_bar::top_bar_ui(ui, self));
        egui::Panel::left("recipe_panel")
            .resizable(true)
            .default_size((ctx.content_rect().width() * 0.48).clamp(480.0, 760.0))
            .min_size(480.0)
            .show(ui, |ui| {
                ui::recipe_table::recipe_panel_ui(
                    ui,
                    &mut self.project,
                    &self.engine,
                    &mut self.panels,
                );
            });
        // Solve what the recipe edits just changed, so the readout and charts of this frame
        // show the recipe as it is now.
        self.engine.refresh(&self.project);
        egui::CentralPanel::default().show(ui, |ui| {
            egui::ScrollArea::vertical()
                .id_salt("results_scroll")
                .auto_shrink([false, false])
                .show(ui, |ui| {
                    ui::readout::readout_ui(
                        ui,
                        &mut self.project.settings,
                        &self.engine,
                        &mut self.panels.refused,
                    );
                    ui::cautions::cautions_ui(ui, &self.project, &self.engine);
                    ui.add_space(6.0);
                    ui.columns(2, |cols| {
                        ui::dose_curve::dose_curve_ui(
                            &mut cols[0],
                            &mut self.project.settings,
                            &self.engine,
                            &mut self.panels,
                        );
                        ui::species_chart::species_chart_ui(
                            &mut cols[1],
                            &mut self.project.settings,
                            &self.engine,
                        );
                    });
                });
        });

        if !self.engine.is_current(&self.project) {
            self.engine.refresh(&self.project);
            ctx.request_repaint();
        }
        let settled = !ctx.input(|i| i.pointer.any_down()) && ctx.memory(|m| m.focused().is_none());
        self.history.observe(&self.project, settled);
        self.track_window(&ctx);
        self.autosave(&ctx);
        if !self.queue.is_empty() {
            ctx.request_repaint();
        }
        let title = self.title();
        if title != self.title {
            ctx.send_viewport_cmd(egui::ViewportCommand::Title(title.clone()));
            self.title = title;
        }
    }

    /// Keeps a copy of unsaved work a few seconds after the last edit, so a crash loses little.
    fn autosave(&mut self, ctx: &egui::Context) {
        let now = ctx.input(|i| i.time);
        if self.last_edit.0 != self.project {
            self.last_edit = (self.project.clone(), now);
        }
        if !self.is_dirty() {
            // Back to what is on disk (an undo, a save): nothing needs recovering.
            if self.autosaved.is_some() {
                self.forget_autosave();
            }
            return;
        }
        if self.autosaved.as_ref() == Some(&self.project) {
            return;
        }
        let due = (self.last_edit.1 + self.autosave_idle_secs).max(self.autosave_retry_at);
        if now < due {
            // Come back when the edits have been idle long enough, even with no input.
            ctx.request_repaint_after(std::time::Duration::from_secs_f64(due - now));
            return;
        }
        match self.recovery.write(&self.project) {
            Ok(()) => {
                self.autosaved = Some(self.project.clone());
                self.autosave_retry_at = 0.0;
            }
            Err(e) => {
                self.autosave_retry_at = now + AUTOSAVE_RETRY_SECS;
                self.set_status(&format!("{e}; trying again in 30 s"), true);
            }
        }
    }

    fn watch_close_request(&mut self, ctx: &egui::Context) {
        if !ctx.input(|i| i.viewport().close_requested()) || self.allow_close {
            return;
        }
        if self.is_dirty() {
            ctx.send_viewport_cmd(egui::ViewportCommand::CancelClose);
            self.prompt = Some(Prompt {
                action: Pending::Quit,
            });
        } else {
            self.allow_close = true;
            self.forget_autosave();
            self.save_config();
        }
    }

    fn read_shortcuts(&mut self, ctx: &egui::Context) {
        let cmd = Modifiers::COMMAND;
        let shift = Modifiers::COMMAND | Modifiers::SHIFT;
        // Longer chords first: consuming Ctrl+Z would also swallow Ctrl+Shift+Z.
        let table: [(KeyboardShortcut, Command); 11] = [
            (KeyboardShortcut::new(shift, Key::S), Command::SaveAs),
            (KeyboardShortcut::new(shift, Key::Z), Command::Redo),
            (KeyboardShortcut::new(cmd, Key::Y), Command::Redo),
            (KeyboardShortcut::new(cmd, Key::Z), Command::Undo),
            (KeyboardShortcut::new(cmd, Key::N), Command::New),
            (KeyboardShortcut::new(cmd, Key::O), Command::Open),
            (KeyboardShortcut::new(cmd, Key::S), Command::Save),
            (KeyboardShortcut::new(cmd, Key::Q), Command::Quit),
            (KeyboardShortcut::new(cmd, Key::Plus), Command::ZoomIn),
            (KeyboardShortcut::new(cmd, Key::Equals), Command::ZoomIn),
            (KeyboardShortcut::new(cmd, Key::Minus), Command::ZoomOut),
        ];
        for (shortcut, command) in table {
            if ctx.input_mut(|i| i.consume_shortcut(&shortcut)) {
                self.queue.push(command);
            }
        }
        if ctx.input_mut(|i| i.consume_shortcut(&KeyboardShortcut::new(cmd, Key::Num0))) {
            self.queue.push(Command::ZoomReset);
        }
    }

    fn track_window(&mut self, ctx: &egui::Context) {
        let zoom = ctx.zoom_factor();
        if let Some(rect) = ctx.input(|i| i.viewport().inner_rect) {
            let size = [rect.width() * zoom, rect.height() * zoom];
            if size[0] >= 200.0 && size[1] >= 200.0 {
                self.config.window_size = Some(size);
            }
        }
    }
}

impl eframe::App for Workbench {
    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        self.show(ui);
    }

    fn on_exit(&mut self, _gl: Option<&eframe::glow::Context>) {
        self.save_config();
    }
}
