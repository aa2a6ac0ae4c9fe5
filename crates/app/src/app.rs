//! The workbench window: the document, the messages, autosave, the solved state and one frame of
//! drawing.
//!
//! A pass reads the shortcuts, carries out the queued commands, refreshes the engine once, then
//! draws the panels. Panels read the engine and push commands; drags and typing edit the project
//! directly and become one undo step when they settle. When a panel's edit leaves the engine
//! behind, the pass is discarded and drawn again (egui's multi-pass), so what is shown always
//! matches the recipe in the same frame.

use std::path::{Path, PathBuf};

use egui::{Key, KeyboardShortcut, Modifiers};
use saltwise_chem::project::Project;

use crate::autosave::{Autosave, Tick};
use crate::command::Command;
use crate::config::{ConfigStore, UserConfig};
use crate::document::Document;
use crate::engine::Engine;
use crate::messages::{Messages, Notice, Prompt};
use crate::recovery::RecoveryStore;
use crate::ui;
use crate::user_store::UserStore;

/// A failure injected into saves between writing the temporary file and renaming it (tests).
pub type SaveFault = Box<dyn Fn(&Path) -> std::io::Result<()>>;

/// Width from which the dose curve and the species chart stand side by side, points.
const CHARTS_SIDE_BY_SIDE_POINTS: f32 = 640.0;

/// The whole workbench: the saved project apart from what is only kept while running.
pub struct Workbench {
    pub(crate) doc: Document,
    pub(crate) messages: Messages,
    pub(crate) autosave: Autosave,
    pub(crate) engine: Engine,
    pub(crate) config: UserConfig,
    store: ConfigStore,
    pub(crate) panels: ui::PanelState,
    queue: Vec<Command>,
    /// The title last sent to the window.
    title_shown: String,
    started: bool,
    pub(crate) allow_close: bool,
    pub(crate) quit_requested: bool,
    save_fault: Option<SaveFault>,
    /// The user's own library file (fitted ingredients).
    pub(crate) user_store: UserStore,
}

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
        let mut app = Self {
            doc: Document::new(project),
            messages: Messages::default(),
            autosave: Autosave::new(recovery),
            engine: Engine::new(),
            config,
            store,
            panels: ui::PanelState::default(),
            queue: Vec::new(),
            title_shown: String::new(),
            started: false,
            allow_close: false,
            quit_requested: false,
            save_fault: None,
            user_store: UserStore::from_env(),
        };
        app.load_user_library();
        app.look_for_left_behind();
        if let Some(problem) = problem {
            app.messages.status(&problem, true);
        }
        app
    }

    /// Keeps the user library in another file (tests; a portable install) and reads it.
    pub fn with_user_store(mut self, user_store: UserStore) -> Self {
        self.user_store = user_store;
        self.load_user_library();
        self
    }

    /// Reads the user library into the engine; a file that cannot be read is said and left out.
    fn load_user_library(&mut self) {
        let loaded = self
            .user_store
            .read()
            .and_then(|user| self.engine.set_user_library(&user));
        if let Err(e) = loaded {
            self.messages
                .status(&format!("Your own library was left out: {e}"), true);
        }
    }

    /// Queues a command for the next frame (menus, shortcuts and tests all come here).
    pub fn queue(&mut self, command: Command) {
        self.queue.push(command);
    }

    /// The open project.
    pub fn project(&self) -> &Project {
        self.doc.project()
    }

    /// The open project, for edits (tests and scripted changes).
    pub fn project_mut(&mut self) -> &mut Project {
        self.doc.project_mut()
    }

    /// The solved state of the open project.
    pub fn engine(&self) -> &Engine {
        &self.engine
    }

    /// The last fit of the measured-titration section, or why it failed.
    pub fn panels_fit_result(&self) -> Option<&Result<saltwise_chem::fit::Fit, String>> {
        self.panels.fit.result.as_ref().map(|(_, r)| r)
    }

    /// The file the project was last opened from or saved to.
    pub fn file_path(&self) -> Option<&Path> {
        self.doc.file()
    }

    /// Whether the project differs from what was last opened or saved.
    pub fn is_dirty(&self) -> bool {
        self.doc.is_dirty()
    }

    /// The window title: file name and an unsaved-changes mark.
    pub fn title(&self) -> String {
        self.doc.title()
    }

    /// The unsaved-changes question, if one is open.
    pub fn prompt(&self) -> Option<&Prompt> {
        self.messages.prompt()
    }

    /// The status line message, if any.
    pub fn status_text(&self) -> Option<&str> {
        self.messages.current_status().map(|s| s.text.as_str())
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
        self.autosave.set_idle_secs(secs);
    }

    /// The copy of unsaved work from an earlier session, if one is offered.
    pub fn recovery_offer(&self) -> Option<&Path> {
        self.autosave.offer().map(|o| o.left.path.as_path())
    }

    /// This session's copy of unsaved work (whether or not it exists yet).
    pub fn recovery_file(&self) -> Option<PathBuf> {
        self.autosave.session_file()
    }

    /// The file problem shown under the menu, if any.
    pub fn notice(&self) -> Option<&Notice> {
        self.messages.notice()
    }

    /// Whether there is an edit to undo.
    pub fn can_undo(&self) -> bool {
        self.doc.can_undo()
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
        let engine = &self.engine;
        self.autosave.look_for_left_behind(|path| {
            let project = crate::command::read_project(engine, path).ok()?;
            let n = project.recipe().lines.len();
            Some(format!(
                "“{}”, {n} recipe line{}",
                project.name,
                if n == 1 { "" } else { "s" }
            ))
        });
        if let Some(offer) = self.autosave.offer() {
            eprintln!(
                "saltwise: unsaved work from an earlier session is offered for recovery: {}",
                offer.left.path.display()
            );
        }
    }

    pub(crate) fn save_config(&mut self) {
        if let Err(e) = self.store.save(&self.config) {
            self.messages.status(&e, true);
        }
    }

    /// Draws one frame of the whole window into `ui` and carries out what was asked.
    pub fn show(&mut self, ui: &mut egui::Ui) {
        let ctx = ui.ctx().clone();
        if !self.started {
            self.started = true;
            ctx.options_mut(|o| o.zoom_with_keyboard = false);
            ctx.set_zoom_factor(self.config.zoom);
            ctx.set_fonts(ui::fonts());
        }
        self.watch_close_request(&ctx);
        self.read_shortcuts(&ctx);
        for command in std::mem::take(&mut self.queue) {
            self.handle(&ctx, command);
        }
        // The one refresh of the frame: after every command and every edit of the last frame.
        self.engine.refresh(self.doc.project());
        self.draw(ui, &ctx);
        if self.engine.is_busy() {
            // The pH band is drawn a part per frame; the next part comes with the next frame.
            ctx.request_repaint();
        }
        if !self.queue.is_empty() || !self.engine.is_current(self.doc.project()) {
            // A panel changed the project or asked for a command while drawing: this pass is
            // thrown away and drawn again after the refresh, so the frame shown is never behind.
            ctx.request_discard("the recipe changed while drawing");
            ctx.request_repaint();
        }
        let settled = !ctx.input(|i| i.pointer.any_down()) && ctx.memory(|m| m.focused().is_none());
        self.doc.observe(settled);
        self.track_window(&ctx);
        self.keep_unsaved_work(&ctx);
        let title = self.doc.title();
        if title != self.title_shown {
            ctx.send_viewport_cmd(egui::ViewportCommand::Title(title.clone()));
            self.title_shown = title;
        }
    }

    /// The panels, each given what it reads; what they ask for is queued.
    fn draw(&mut self, ui: &mut egui::Ui, ctx: &egui::Context) {
        let mut commands = Vec::new();
        egui::Panel::top("command_bar").show(ui, |ui| {
            ui::top_bar::top_bar_ui(
                ui,
                &mut self.doc,
                &self.messages,
                self.autosave.offer(),
                &self.config.recent_files,
                &mut self.panels.sheet_batch_kg,
                &mut commands,
            );
        });
        let project = self.doc.project_mut();
        egui::Panel::left("recipe_panel")
            .resizable(true)
            .default_size((ctx.content_rect().width() * 0.48).clamp(300.0, 760.0))
            .min_size(300.0)
            // In a small window the results keep at least about half of the width.
            .max_size((ctx.content_rect().width() * 0.5).max(320.0))
            .show(ui, |ui| {
                ui::recipe_table::recipe_panel_ui(
                    ui,
                    project,
                    &self.engine,
                    &mut self.panels,
                    &mut commands,
                );
            });
        egui::CentralPanel::default().show(ui, |ui| {
            // Both ways: in the smallest window nothing is cut off, it scrolls.
            egui::ScrollArea::both()
                .id_salt("results_scroll")
                .auto_shrink([false, false])
                .show(ui, |ui| {
                    ui::ResultsView {
                        content_top: ui.min_rect().top(),
                        view_height: ui.clip_rect().height(),
                    }
                    .store(ui.ctx());
                    ui::readout::readout_ui(
                        ui,
                        &mut project.settings,
                        &self.engine,
                        &mut self.panels.refused,
                    );
                    ui::cautions::cautions_ui(ui, &self.engine);
                    ui::sweeps::sweeps_ui(ui, &self.engine, project.settings.temp_c);
                    ui::hardness::hardness_ui(ui, project, &self.engine, &mut self.panels.refused);
                    ui::qc::qc_ui(ui, &mut project.settings.qc, &self.engine, &mut self.panels);
                    ui::fit::fit_ui(
                        ui,
                        project,
                        &self.engine,
                        &mut self.panels.fit,
                        &mut commands,
                    );
                    ui::tolerance::tolerance_ui(ui, project, &self.engine, &mut self.panels);
                    ui::design::design_ui(
                        ui,
                        project,
                        &self.engine,
                        &mut self.panels.design,
                        &mut commands,
                    );
                    ui::variants::compare_ui(ui, project, &self.engine, &mut commands);
                    ui.add_space(6.0);
                    // Side by side when there is room, one under the other when not.
                    let settings = &mut project.settings;
                    if ui.available_width() >= CHARTS_SIDE_BY_SIDE_POINTS {
                        ui.columns(2, |cols| {
                            ui::dose_curve::dose_curve_ui(
                                &mut cols[0],
                                settings,
                                &self.engine,
                                &mut self.panels,
                                &mut commands,
                            );
                            ui::species_chart::species_chart_ui(
                                &mut cols[1],
                                settings,
                                &self.engine,
                            );
                        });
                    } else {
                        ui::dose_curve::dose_curve_ui(
                            ui,
                            settings,
                            &self.engine,
                            &mut self.panels,
                            &mut commands,
                        );
                        ui.add_space(8.0);
                        ui::species_chart::species_chart_ui(ui, settings, &self.engine);
                    }
                });
        });
        self.queue.extend(commands);
    }

    /// Keeps a copy of unsaved work a few seconds after the last edit, so a crash loses little.
    fn keep_unsaved_work(&mut self, ctx: &egui::Context) {
        let now = ctx.input(|i| i.time);
        match self
            .autosave
            .tick(self.doc.project(), self.doc.is_dirty(), now)
        {
            Tick::Idle | Tick::Kept => {}
            Tick::WakeAfter(after) => ctx.request_repaint_after(after),
            Tick::Failed(why) => self.messages.status(&why, true),
        }
    }

    fn watch_close_request(&mut self, ctx: &egui::Context) {
        if !ctx.input(|i| i.viewport().close_requested()) || self.allow_close {
            return;
        }
        if self.doc.is_dirty() {
            ctx.send_viewport_cmd(egui::ViewportCommand::CancelClose);
            self.messages.ask(crate::messages::Pending::Quit);
        } else {
            self.allow_close = true;
            self.autosave.forget();
            self.save_config();
        }
    }

    fn read_shortcuts(&mut self, ctx: &egui::Context) {
        let cmd = Modifiers::COMMAND;
        let shift = Modifiers::COMMAND | Modifiers::SHIFT;
        // Inside a text field, undo and redo act on the text, not on the recipe.
        let typing = ctx.text_edit_focused();
        // Longer chords first: consuming Ctrl+Z would also swallow Ctrl+Shift+Z.
        let table: [(KeyboardShortcut, Command, bool); 12] = [
            (KeyboardShortcut::new(shift, Key::S), Command::SaveAs, true),
            (KeyboardShortcut::new(shift, Key::Z), Command::Redo, !typing),
            (KeyboardShortcut::new(cmd, Key::Y), Command::Redo, !typing),
            (KeyboardShortcut::new(cmd, Key::Z), Command::Undo, !typing),
            (KeyboardShortcut::new(cmd, Key::N), Command::New, true),
            (KeyboardShortcut::new(cmd, Key::O), Command::Open, true),
            (KeyboardShortcut::new(cmd, Key::S), Command::Save, true),
            (KeyboardShortcut::new(cmd, Key::Q), Command::Quit, true),
            (KeyboardShortcut::new(cmd, Key::Plus), Command::ZoomIn, true),
            (
                KeyboardShortcut::new(cmd, Key::Equals),
                Command::ZoomIn,
                true,
            ),
            (
                KeyboardShortcut::new(cmd, Key::Minus),
                Command::ZoomOut,
                true,
            ),
            (
                KeyboardShortcut::new(cmd, Key::Num0),
                Command::ZoomReset,
                true,
            ),
        ];
        for (shortcut, command, active) in table {
            if active && ctx.input_mut(|i| i.consume_shortcut(&shortcut)) {
                self.queue.push(command);
            }
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
