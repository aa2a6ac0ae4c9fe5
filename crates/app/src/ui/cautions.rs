//! The cautions area: strong acids and alkalis, hypochlorite, ammonia sources and extreme pH, in
//! plain words, with deference to the safety data sheet and local rules.

use egui::{RichText, Ui};
use saltwise_chem::project::Project;

use crate::engine::Engine;
use saltwise_chem::hazard::{Caution, DEFER};
use saltwise_chem::library::Hazard;

/// What the predictions leave out.
const NOT_PLAIN_WATER: &str = "Predictions are for plain aqueous systems: co-solvents, surfactant micelles and suspended solids shift real pH.";

/// Draws the cautions area (always visible, short when there is nothing to say).
pub fn cautions_ui(ui: &mut Ui, project: &Project, engine: &Engine) {
    let Ok(library) = engine.library() else {
        return;
    };
    let mut cautions: Vec<Caution> = engine.cautions().to_vec();
    if let Some(c) = adjuster_caution(project, library) {
        // Before the closing safety-data line, which stays last.
        let at = cautions
            .iter()
            .rposition(|c| c.text == saltwise_chem::hazard::DEFER)
            .unwrap_or(cautions.len());
        cautions.insert(at, c);
    }
    egui::Frame::group(ui.style()).show(ui, |ui| {
        ui.set_width(ui.available_width());
        if cautions.is_empty() {
            ui.label(
                RichText::new("Cautions: none flagged for these ingredients and this pH.").weak(),
            );
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

/// A caution for the chosen pH adjuster as supplied, which is handled even before it is dosed.
fn adjuster_caution(project: &Project, library: &saltwise_chem::Library) -> Option<Caution> {
    let e = library.entry(&project.settings.adjuster)?;
    let h = &e.ingredient.hazards;
    let kind = if h.contains(&Hazard::StrongAlkali) {
        "a strong alkali"
    } else if h.contains(&Hazard::StrongAcid) {
        "a strong acid"
    } else if h.contains(&Hazard::Corrosive) {
        "corrosive"
    } else {
        return None;
    };
    Some(Caution {
        title: "pH adjuster".into(),
        text: format!(
            "{} is {kind} as supplied: it burns skin and eyes. Dose it slowly into the stirred batch with eye and skin protection.",
            e.ingredient.name
        ),
    })
}
