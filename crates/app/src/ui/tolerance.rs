//! Weighing tolerances and assay ranges, and the pH band they give (5th–95th percentile by
//! seeded Monte Carlo) with the lines ranked by how much they move the pH.

use egui::{DragValue, RichText, Role, Ui};
use saltwise_chem::Library;
use saltwise_chem::limits::WEIGHING_TOLERANCE;
use saltwise_chem::project::Project;
use saltwise_chem::tolerance::{Band, MAX_SAMPLES};

use super::{Field, PanelState, checked_drag, sig};
use crate::band_job::BandState;
use crate::engine::Engine;

/// Most lines listed in the sensitivity ranking.
const RANKED: usize = 6;

/// The band in one line, for the readout: `None` when no tolerance is set.
pub fn band_text(engine: &Engine) -> Option<(String, bool)> {
    match engine.band()? {
        BandState::Drawing(run) => Some((
            format!(
                "pH band: drawing {} of {} samples…",
                run.drawn(),
                run.samples()
            ),
            false,
        )),
        BandState::Done(Ok(b)) => Some((
            format!(
                "pH band under the tolerances: {:.2} to {:.2} (5th–95th percentile, median {:.2})",
                b.p05, b.p95, b.p50
            ),
            true,
        )),
        BandState::Done(Err(e)) => Some((format!("No pH band: {e}"), false)),
    }
}

/// Draws the tolerance section, closed until asked for.
pub fn tolerance_ui(ui: &mut Ui, project: &mut Project, engine: &Engine, panels: &mut PanelState) {
    egui::CollapsingHeader::new("Tolerances and pH band")
        .id_salt("tolerance_section")
        .default_open(false)
        .show(ui, |ui| {
            let Ok(library) = engine.library() else {
                return;
            };
            ui.weak("Each line is weighed within ± its tolerance, and an assay range draws the lot's assay, uniformly; the band is the 5th to 95th percentile of the pH over the samples.");
            settings_ui(ui, project, library, panels);
            ui.add_space(4.0);
            result_ui(ui, project, library, engine);
        });
}

fn settings_ui(ui: &mut Ui, project: &mut Project, library: &Library, panels: &mut PanelState) {
    let mut ids: Vec<String> = Vec::new();
    for l in &project.recipe().lines {
        if l.enabled && !ids.contains(&l.ingredient) {
            ids.push(l.ingredient.clone());
        }
    }
    // Ingredients a tolerance still names after their lines went off or away stay listed, so
    // the tolerance can be taken off again.
    let t = &project.settings.tolerances;
    let named = t
        .per_ingredient
        .iter()
        .map(|(i, _)| i)
        .chain(t.assay.iter().map(|(i, _, _)| i));
    for id in named {
        if !ids.contains(id) {
            ids.push(id.clone());
        }
    }
    let s = &mut project.settings;
    ui.horizontal_wrapped(|ui| {
        ui.label("Every line ±");
        checked_drag(
            ui,
            &mut s.tolerances.all_percent,
            |d| {
                d.range(0.0..=WEIGHING_TOLERANCE.max)
                    .speed(0.05)
                    .max_decimals(2)
            },
            Field {
                name: "Tolerance of every line",
                hint: "± % of each line's amount, for lines without their own tolerance",
            },
            WEIGHING_TOLERANCE,
            &mut panels.refused,
        );
        ui.label("%");
        ui.separator();
        ui.label("Samples");
        let samples = ui.add(
            DragValue::new(&mut s.band_samples)
                .range(100..=MAX_SAMPLES.min(100_000))
                .speed(10.0),
        );
        super::name_drag(samples, s.band_samples as f64, "Band samples");
        ui.label("Seed");
        let seed = ui.add(DragValue::new(&mut s.band_seed).speed(1.0));
        super::name_drag(seed, s.band_seed as f64, "Band seed")
            .on_hover_text("The same seed gives the same band");
    });
    egui::Grid::new("tolerance_grid")
        .striped(true)
        .spacing([8.0, 4.0])
        .show(ui, |ui| {
            for h in ["Ingredient", "Own tolerance, ± %", "Assay range, %"] {
                ui.label(RichText::new(h).strong());
            }
            ui.end_row();
            for id in &ids {
                let name = library
                    .entry(id)
                    .map_or_else(|| id.clone(), |e| e.ingredient.name.clone());
                ui.label(&name);
                own_tolerance_ui(ui, s, id, &name, panels);
                let assay = library.entry(id).map_or(1.0, |e| e.ingredient.assay);
                assay_ui(ui, s, id, &name, assay);
                ui.end_row();
            }
        });
}

fn own_tolerance_ui(
    ui: &mut Ui,
    s: &mut saltwise_chem::project::Settings,
    id: &str,
    name: &str,
    panels: &mut PanelState,
) {
    let per = &mut s.tolerances.per_ingredient;
    let at = per.iter().position(|(i, _)| i == id);
    ui.horizontal(|ui| {
        let mut own = at.is_some();
        let check = ui.checkbox(&mut own, "");
        if super::name_widget(check, Role::CheckBox, &format!("Own tolerance of {name}")).changed()
        {
            match at {
                Some(k) if !own => {
                    per.remove(k);
                }
                None if own => per.push((id.to_owned(), s.tolerances.all_percent)),
                _ => {}
            }
        }
        if let Some(k) = per.iter().position(|(i, _)| i == id) {
            checked_drag(
                ui,
                &mut per[k].1,
                |d| {
                    d.range(0.0..=WEIGHING_TOLERANCE.max)
                        .speed(0.05)
                        .max_decimals(2)
                },
                Field {
                    name: &format!("Tolerance of {name}"),
                    hint: "± % of this ingredient's lines",
                },
                WEIGHING_TOLERANCE,
                &mut panels.refused,
            );
        }
    });
}

fn assay_ui(
    ui: &mut Ui,
    s: &mut saltwise_chem::project::Settings,
    id: &str,
    name: &str,
    assay: f64,
) {
    let ranges = &mut s.tolerances.assay;
    let at = ranges.iter().position(|(i, _, _)| i == id);
    ui.horizontal(|ui| {
        let mut on = at.is_some();
        let check = ui.checkbox(&mut on, "");
        if super::name_widget(check, Role::CheckBox, &format!("Assay range of {name}"))
            .on_hover_text(
                "The lot's assay varies within a range (from the certificate of analysis)",
            )
            .changed()
        {
            match at {
                Some(k) if !on => {
                    ranges.remove(k);
                }
                None if on => {
                    let lo = (assay * 0.98).max(1e-3);
                    ranges.push((id.to_owned(), lo, (assay * 1.02).min(1.0).max(lo)));
                }
                _ => {}
            }
        }
        if let Some(k) = ranges.iter().position(|(i, _, _)| i == id) {
            let (_, lo, hi) = &mut ranges[k];
            let mut lo_pct = *lo * 100.0;
            let mut hi_pct = *hi * 100.0;
            let a = ui.add(
                DragValue::new(&mut lo_pct)
                    .range(0.1..=100.0)
                    .speed(0.05)
                    .max_decimals(2),
            );
            super::name_drag(a, lo_pct, &format!("Lowest assay of {name}"));
            ui.label("to");
            let b = ui.add(
                DragValue::new(&mut hi_pct)
                    .range(0.1..=100.0)
                    .speed(0.05)
                    .max_decimals(2),
            );
            super::name_drag(b, hi_pct, &format!("Highest assay of {name}"));
            *lo = lo_pct / 100.0;
            *hi = (hi_pct / 100.0).max(*lo);
        }
    });
}

fn result_ui(ui: &mut Ui, project: &Project, library: &Library, engine: &Engine) {
    match engine.band() {
        None => {
            ui.weak("Set a tolerance above 0 % or an assay range to see the pH band.");
        }
        Some(BandState::Drawing(run)) => {
            let done = run.drawn() as f32 / run.samples().max(1) as f32;
            ui.add(egui::ProgressBar::new(done).text(format!(
                "Drawing {} of {} samples",
                run.drawn(),
                run.samples()
            )));
        }
        Some(BandState::Done(Err(e))) => {
            ui.colored_label(
                super::ERROR,
                format!("No pH band: {}", crate::messages::sentence(e)),
            );
        }
        Some(BandState::Done(Ok(band))) => band_ui(ui, project, library, band),
    }
}

fn band_ui(ui: &mut Ui, project: &Project, library: &Library, band: &Band) {
    ui.label(
        RichText::new(format!(
            "pH band {:.2} to {:.2} (5th–95th percentile), median {:.2}, as written {:.2}",
            band.p05, band.p95, band.p50, band.nominal_ph
        ))
        .strong(),
    );
    ui.weak(format!("{} samples, seed {}", band.samples, band.seed));
    if band.not_converged > 0 {
        ui.colored_label(
            super::WARN,
            format!(
                "{} samples did not converge; their last estimate is counted.",
                band.not_converged
            ),
        );
    }
    if band.sensitivity.is_empty() {
        return;
    }
    ui.label(RichText::new("pH change per +1 % of a line's amount, largest first").strong());
    egui::Grid::new("sensitivity_grid")
        .spacing([12.0, 2.0])
        .show(ui, |ui| {
            for s in band.sensitivity.iter().take(RANKED) {
                let name = project
                    .recipe()
                    .lines
                    .get(s.line)
                    .and_then(|l| library.entry(&l.ingredient))
                    .map_or_else(|| s.id.clone(), |e| e.ingredient.name.clone());
                ui.label(format!("line {}: {name}", s.line + 1));
                let sign = if s.dph_per_percent > 0.0 { "+" } else { "" };
                ui.label(format!("{sign}{} pH", sig(s.dph_per_percent, 2)));
                ui.end_row();
            }
        });
}
