//! The cautions area: strong acids and alkalis, hypochlorite, ammonia sources and extreme pH, in
//! plain words, with deference to the safety data sheet and local rules.

use egui::{RichText, Ui};
use saltwise_chem::hazard::DEFER;

use crate::engine::Engine;

/// What the predictions leave out.
const NOT_PLAIN_WATER: &str = "Predictions are for plain aqueous systems: co-solvents, surfactant micelles and suspended solids shift real pH.";

/// Draws the cautions area (always visible, short when there is nothing to say).
pub fn cautions_ui(ui: &mut Ui, engine: &Engine) {
    let cautions = engine.cautions();
    egui::Frame::group(ui.style()).show(ui, |ui| {
        ui.set_width(ui.available_width());
        if cautions.is_empty() {
            ui.label(
                RichText::new("Cautions: none flagged for these ingredients and this pH.").weak(),
            );
        } else {
            ui.label(RichText::new("Cautions").strong().color(super::WARN));
            for c in cautions {
                ui.horizontal_wrapped(|ui| {
                    ui.label(RichText::new(format!("{}:", c.title)).strong());
                    ui.label(&c.text);
                });
            }
        }
        ui.label(
            RichText::new(if cautions.iter().any(|c| c.text.contains(DEFER)) {
                NOT_PLAIN_WATER.to_owned()
            } else {
                format!("{DEFER} {NOT_PLAIN_WATER}")
            })
            .small()
            .weak(),
        );
    });
}
