//! The cautions area: strong acids and alkalis, hypochlorite, ammonia sources and extreme pH, in
//! plain words, with deference to the safety data sheet and local rules.

use egui::{RichText, Ui};
use saltwise_chem::project::Project;

use crate::adapter;
use crate::engine::Engine;

/// Draws the cautions area (always visible, short when there is nothing to say).
pub fn cautions_ui(ui: &mut Ui, project: &Project, engine: &Engine) {
    let Ok(library) = engine.library() else {
        return;
    };
    let entries: Vec<usize> = project
        .recipe
        .lines
        .iter()
        .filter(|l| l.enabled)
        .filter_map(|l| library.entry_index(&l.ingredient))
        .chain(library.entry_index(&project.settings.adjuster))
        .collect();
    let cautions = adapter::cautions(library, engine.solved(), &entries);
    egui::Frame::group(ui.style()).show(ui, |ui| {
        ui.set_width(ui.available_width());
        if cautions.is_empty() {
            ui.label(RichText::new("Cautions: none flagged for these ingredients and this pH.").weak());
        } else {
            ui.label(RichText::new("Cautions").strong().color(super::WARN));
            for c in &cautions {
                ui.horizontal_wrapped(|ui| {
                    ui.label(RichText::new(format!("{}:", c.title)).strong());
                    ui.label(&c.text);
                });
            }
        }
        ui.label(
            RichText::new(
                "Predictions are for plain aqueous systems. Follow the supplier's safety data sheet, local regulations and licensed practice for handling and labelling.",
            )
            .small()
            .weak(),
        );
    });
}
