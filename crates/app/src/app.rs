//! The workbench window: the open project, its runtime state, and one frame of drawing.

use std::path::{Path, PathBuf};

use egui::{Key, KeyboardShortcut, Modifiers};
use saltwise_chem::project::Project;

use crate::command::{Command, Pending};
use crate::config::{ConfigStore, UserConfig};
use crate::engine::Engine;
use crate::history::History;
use crate::ui;

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

/// Runtime state of the panels that is not part of the project.
#[derive(Debug, Clone, Default)]
pub(crate) struct PanelState {
    /// Text typed into the ingredient picker.
    pub picker_query: String,
    /// Whether the dose curve shows buffer capacity.
    pub show_buffer_capacity: bool,
    /// The custom-ingredient form.
    pub custom: ui::custom_ingredient::CustomForm,
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
    /// A copy of unsaved work from an earlier session, waiting for an answer.
    pub(crate) recovery_offer: Option<PathBuf>,
    /// Seconds between autosaves of unsaved work.
    autosave_secs: f64,
    /// When unsaved work was last kept, seconds of input time.
    last_autosave: f64,
    /// The project as last kept for recovery.
    autosaved: Option<Project>,
}

/// Default seconds between autosaves of unsaved work.
const AUTOSAVE_SECS: f64 = 30.0;

impl Workbench {
    /// A workbench on the demo project, with settings kept by `store`.
    pub fn new(store: ConfigStore) -> Self {
        Self::with_project(Project::demo(), store)
    }

    /// A workbench on the given project (not yet saved anywhere).
    pub fn with_project(project: Project, store: ConfigStore) -> Self {
        let (config, problem) = store.load();
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
            recovery_offer: None,
            autosave_secs: AUTOSAVE_SECS,
            last_autosave: 0.0,
            autosaved: None,
        };
        app.recovery_offer = app.store.recovery_file().filter(|f| f.exists());
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

    /// Sets how often unsaved work is kept for recovery (tests use 0).
    pub fn set_autosave_secs(&mut self, secs: f64) {
        self.autosave_secs = secs.max(0.0);
    }

    /// The copy of unsaved work from an earlier session, if one is offered.
    pub fn recovery_offer(&self) -> Option<&Path> {
        self.recovery_offer.as_deref()
    }

    pub(crate) fn store(&self) -> &ConfigStore {
        &self.store
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
        self.store.clear_recovery();
        self.autosaved = None;
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
                    ui::readout::readout_ui(ui, &mut self.project.settings, &self.engine);
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
        self.autosave(&ctx, settled);
        if !self.queue.is_empty() {
            ctx.request_repaint();
        }
        let title = self.title();
        if title != self.title {
            ctx.send_viewport_cmd(egui::ViewportCommand::Title(title.clone()));
            self.title = title;
        }
    }

    /// Keeps a copy of unsaved work now and then, so a crash loses little.
    fn autosave(&mut self, ctx: &egui::Context, settled: bool) {
        let now = ctx.input(|i| i.time);
        let due = now - self.last_autosave >= self.autosave_secs;
        if !(settled && due && self.is_dirty()) || self.autosaved.as_ref() == Some(&self.project) {
            return;
        }
        self.last_autosave = now;
        match self.store.write_recovery(&self.project) {
            Ok(()) => self.autosaved = Some(self.project.clone()),
            Err(e) => self.set_status(&e, true),
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
            self.store.clear_recovery();
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
