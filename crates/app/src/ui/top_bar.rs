//! The bar along the top: file, edit and view menus, the project name, the unsaved-changes
//! question and the status line.

use std::path::PathBuf;

use egui::{Button, Key, KeyboardShortcut, Modifiers, RichText, Ui};

use crate::autosave::Offer;
use crate::command::{Command, Resolution};
use crate::document::Document;
use crate::exports::{ChartKind, Export, Format};
use crate::messages::Messages;

/// Draws the top bar; the project name is typed straight into the document.
pub fn top_bar_ui(
    ui: &mut Ui,
    doc: &mut Document,
    messages: &Messages,
    offer: Option<&Offer>,
    recent: &[PathBuf],
    sheet_batch_kg: &mut f64,
    commands: &mut Vec<Command>,
) {
    let ctx = ui.ctx().clone();
    let shortcut = |m: Modifiers, k: Key| ctx.format_shortcut(&KeyboardShortcut::new(m, k));
    let cmd = Modifiers::COMMAND;
    let shift = Modifiers::COMMAND | Modifiers::SHIFT;
    egui::MenuBar::new().ui(ui, |ui| {
        ui.menu_button("File", |ui| {
            let item = |ui: &mut Ui, text: &str, keys: Option<String>| {
                let mut b = Button::new(text);
                if let Some(k) = keys {
                    b = b.shortcut_text(k);
                }
                ui.add(b).clicked()
            };
            if item(ui, "New", Some(shortcut(cmd, Key::N))) {
                commands.push(Command::New);
            }
            if item(ui, "Open…", Some(shortcut(cmd, Key::O))) {
                commands.push(Command::Open);
            }
            if item(ui, "Open the demo project", None) {
                commands.push(Command::OpenDemo);
            }
            ui.menu_button("Open recent", |ui| {
                if recent.is_empty() {
                    ui.label("No recent projects yet");
                }
                for path in recent {
                    if ui.button(path.display().to_string()).clicked() {
                        commands.push(Command::OpenPath(path.clone()));
                    }
                }
            });
            ui.separator();
            if item(ui, "Save", Some(shortcut(cmd, Key::S))) {
                commands.push(Command::Save);
            }
            if item(ui, "Save as…", Some(shortcut(shift, Key::S))) {
                commands.push(Command::SaveAs);
            }
            ui.separator();
            ui.menu_button("Export", |ui| export_menu(ui, sheet_batch_kg, commands));
            ui.separator();
            if item(ui, "Quit", Some(shortcut(cmd, Key::Q))) {
                commands.push(Command::Quit);
            }
        });
        ui.menu_button("Edit", |ui| {
            let undo = Button::new("Undo").shortcut_text(shortcut(cmd, Key::Z));
            if ui.add_enabled(doc.can_undo(), undo).clicked() {
                commands.push(Command::Undo);
            }
            let redo = Button::new("Redo").shortcut_text(shortcut(shift, Key::Z));
            if ui.add_enabled(doc.can_redo(), redo).clicked() {
                commands.push(Command::Redo);
            }
        });
        ui.menu_button("View", |ui| {
            let zin = Button::new("Larger text").shortcut_text(shortcut(cmd, Key::Plus));
            if ui.add(zin).clicked() {
                commands.push(Command::ZoomIn);
            }
            let zout = Button::new("Smaller text").shortcut_text(shortcut(cmd, Key::Minus));
            if ui.add(zout).clicked() {
                commands.push(Command::ZoomOut);
            }
            let normal = Button::new("Normal size").shortcut_text(shortcut(cmd, Key::Num0));
            if ui.add(normal).clicked() {
                commands.push(Command::ZoomReset);
            }
        });
        ui.separator();
        let label = ui.label("Project");
        ui.add(
            egui::TextEdit::singleline(&mut doc.project_mut().name)
                .desired_width((ui.available_width() * 0.4).clamp(120.0, 320.0))
                .hint_text("name of this project"),
        )
        .labelled_by(label.id);
        if let Some(path) = doc.file() {
            ui.weak(path.display().to_string());
        } else {
            ui.weak("not saved to a file yet");
        }
        if doc.is_dirty() {
            ui.label(RichText::new("• Unsaved changes").strong());
        }
    });
    if let Some(prompt) = messages.prompt() {
        egui::Frame::group(ui.style())
            .fill(ui.visuals().warn_fg_color.gamma_multiply(0.15))
            .show(ui, |ui| {
                ui.horizontal_wrapped(|ui| {
                    ui.label(RichText::new(prompt.question()).strong());
                    if ui.button("Save and continue").clicked() {
                        commands.push(Command::Resolve(Resolution::SaveFirst));
                    }
                    if ui.button("Discard changes").clicked() {
                        commands.push(Command::Resolve(Resolution::Discard));
                    }
                    if ui.button("Cancel").clicked() {
                        commands.push(Command::Resolve(Resolution::Cancel));
                    }
                });
            });
    }
    if let Some(offer) = offer {
        egui::Frame::group(ui.style())
            .fill(ui.visuals().warn_fg_color.gamma_multiply(0.15))
            .show(ui, |ui| {
                ui.set_width(ui.available_width());
                ui.label(
                    RichText::new(format!(
                        "Unsaved work from a session that did not close was kept {}{}.",
                        offer.left.age_words(),
                        offer
                            .summary
                            .as_ref()
                            .map_or_else(String::new, |s| format!(": {s}"))
                    ))
                    .strong(),
                );
                ui.horizontal_wrapped(|ui| {
                    if ui.button("Recover it").clicked() {
                        commands.push(Command::Recover);
                    }
                    if ui.button("Throw it away").clicked() {
                        commands.push(Command::DiscardRecovery);
                    }
                    let more = if offer.more > 0 {
                        format!(" ({} older copies are in the same folder.)", offer.more)
                    } else {
                        String::new()
                    };
                    ui.weak(format!("Kept at {}.{more}", offer.left.path.display()));
                });
            });
    }
    if let Some(notice) = messages.notice() {
        egui::Frame::group(ui.style())
            .fill(super::ERROR.gamma_multiply(0.12))
            .show(ui, |ui| {
                ui.set_width(ui.available_width());
                ui.horizontal_wrapped(|ui| {
                    ui.label(RichText::new(&notice.headline).strong().color(super::ERROR));
                    if ui.button("Dismiss").clicked() {
                        commands.push(Command::DismissNotice);
                    }
                });
                ui.label(&notice.reason);
                ui.label(RichText::new(&notice.consequence).weak());
            });
    }
    if let Some(status) = messages.current_status() {
        let text = RichText::new(&status.text).small();
        ui.label(if status.is_error {
            text.color(super::ERROR)
        } else {
            text.weak()
        });
    }
}

/// The Export part of the File menu: the batch sheet for a batch size, then every chart.
fn export_menu(ui: &mut Ui, sheet_batch_kg: &mut f64, commands: &mut Vec<Command>) {
    if ui
        .button("Batch sheet (HTML)…")
        .on_hover_text("One page to print or file: the recipe scaled to the batch, predicted pH, dose, QC titration, charts and every caution")
        .clicked()
    {
        let batch_kg = (*sheet_batch_kg > 0.0).then_some(*sheet_batch_kg);
        commands.push(Command::Export(Export::BatchSheet { batch_kg }));
    }
    ui.horizontal(|ui| {
        ui.label("for a batch of");
        let r = ui.add(
            egui::DragValue::new(sheet_batch_kg)
                .range(0.0..=100_000.0)
                .speed(1.0)
                .max_decimals(3),
        );
        super::name_drag(r, *sheet_batch_kg, "Sheet batch size")
            .on_hover_text("kg; 0 keeps the recipe's own batch size");
        ui.label("kg (0: the recipe's own)");
    });
    ui.separator();
    for chart in ChartKind::ALL {
        ui.menu_button(chart.words(), |ui| {
            for format in Format::ALL {
                if ui.button(format.words()).clicked() {
                    commands.push(Command::Export(Export::Chart(chart, format)));
                }
            }
        });
    }
}
