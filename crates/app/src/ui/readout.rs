//! The readout: pH large, p[H], ionic strength with the model's range, buffer capacity, and the
//! conditions (temperature, activity model, target).

use egui::{RichText, Ui};
use saltwise_chem::ActivityModel;
use saltwise_chem::project::Settings;

use super::{Field, Refusals, checked_drag, sig};
use crate::engine::Engine;
use saltwise_chem::limits::{BAND as TOLERANCE, TARGET_PH, TEMPERATURE_C as TEMPERATURE};

/// Width from which values and conditions fit on one row, points.
const WIDE_POINTS: f32 = 860.0;

/// Draws the readout.
pub fn readout_ui(ui: &mut Ui, settings: &mut Settings, engine: &Engine, refused: &mut Refusals) {
    egui::Frame::group(ui.style()).show(ui, |ui| {
        ui.set_width(ui.available_width());
        // Side by side when there is room; the conditions go under the values otherwise.
        if ui.available_width() >= WIDE_POINTS {
            ui.horizontal(|ui| {
                values_ui(ui, settings, engine);
                ui.separator();
                conditions_ui(ui, settings, refused);
            });
        } else {
            ui.horizontal_wrapped(|ui| values_ui(ui, settings, engine));
            ui.separator();
            conditions_ui(ui, settings, refused);
        }
        drift_ui(ui, engine);
        if let Some(text) = engine.solved().and_then(super::hardness::summary) {
            ui.separator();
            ui.label(text);
        }
        if let (Some(report), Some(p)) = (engine.solved(), engine.settled()) {
            ui.label(super::hardness::settled_summary(report, p));
        }
        if let Some((text, done)) = super::tolerance::band_text(engine) {
            let text = RichText::new(text);
            ui.label(if done { text.strong() } else { text.weak() });
        }
        if let Some(report) = engine.solved()
            && !report.warnings.is_empty()
        {
            ui.separator();
            ui.label(
                RichText::new("Limits of this prediction")
                    .strong()
                    .color(super::WARN),
            );
            for w in &report.warnings {
                ui.colored_label(super::WARN, crate::messages::sentence(w));
            }
        }
    });
}

/// How robust the pH is: what 1 mmol/kg of acid or base does, and where air takes it.
fn drift_ui(ui: &mut Ui, engine: &Engine) {
    let Some(drift) = engine.drift() else {
        return;
    };
    ui.separator();
    ui.horizontal_wrapped(|ui| {
        ui.label(RichText::new("Drift").strong());
        match drift {
            Ok(d) => {
                ui.label(format!("1 mmol/kg product of strong acid: {:+.2} pH", d.acid_1mmol_per_kg))
                    .on_hover_text("Acid picked up in use or from another raw material");
                ui.label("·");
                ui.label(format!("of strong base: {:+.2} pH", d.base_1mmol_per_kg));
                ui.label("·");
                ui.label(format!("open to air: pH {:.2}", d.open_to_air_ph)).on_hover_text(
                    "Where the product settles in contact with air (CO₂ at 420 ppm); alkaline products take up CO₂",
                );
            }
            Err(why) => {
                ui.weak(format!("not available: {why}"));
            }
        }
    });
}

fn values_ui(ui: &mut Ui, settings: &Settings, engine: &Engine) {
    match engine.report() {
        Some(Ok(report)) => {
            let s = &report.solution;
            ui.vertical(|ui| {
                ui.label(RichText::new(format!("pH {:.2}", s.ph)).size(46.0).strong())
                    .on_hover_text("As a calibrated pH meter reads it: −log a(H⁺), the activity of the hydrogen ion");
                if let Some(target) = settings.target_ph {
                    let off = s.ph - target;
                    let (text, color) = if off.abs() <= settings.target_tolerance {
                        ("within the target band".to_owned(), super::TARGET)
                    } else if off > 0.0 {
                        (format!("{off:.2} above target pH {target:.2}"), super::WARN)
                    } else {
                        (
                            format!("{:.2} below target pH {target:.2}", -off),
                            super::WARN,
                        )
                    };
                    ui.label(RichText::new(text).color(color));
                }
            });
            ui.separator();
            egui::Grid::new("readout_values").spacing([12.0, 4.0]).show(ui, |ui| {
                ui.label("p[H]");
                ui.label(RichText::new(format!("{:.2}", s.p_h_conc)).size(18.0))
                    .on_hover_text("−log m(H⁺): the hydrogen-ion molality itself, without the activity coefficient");
                ui.end_row();
                ui.label("Ionic strength");
                let limit = s.activity.max_ionic_strength();
                let text = RichText::new(format!("{} mol/kg water", sig(s.ionic_strength, 3))).size(18.0);
                if s.ionic_strength > limit {
                    ui.label(text.color(super::WARN)).on_hover_text(format!(
                        "Above {limit} mol/kg water, the usual range of this activity model: treat the pH as indicative"
                    ));
                    ui.end_row();
                    ui.label("");
                    ui.colored_label(
                        super::WARN,
                        format!("Above the {limit} mol/kg water range of the model"),
                    );
                } else {
                    ui.label(text);
                }
                ui.end_row();
                ui.label("Activity model");
                let chosen = if settings.activity == ActivityModel::Auto {
                    format!("{} (chosen for this recipe)", s.activity.label())
                } else {
                    s.activity.label().to_owned()
                };
                ui.label(chosen).on_hover_text(
                    "Automatic keeps Davies while the ionic strength and the charges present allow it, and takes Pitzer for concentrates",
                );
                ui.end_row();
                ui.label("Buffer capacity");
                ui.label(
                    RichText::new(format!("{} mol/kg water per pH", sig(s.buffer_capacity, 3))).size(18.0),
                )
                .on_hover_text("β = dC(base)/dpH: mol of strong base per kg of water that would move the pH by one unit here");
                ui.end_row();
            });
        }
        Some(Err(e)) => {
            ui.vertical(|ui| {
                ui.label(RichText::new("pH —").size(46.0).strong());
                ui.label(
                    RichText::new("No pH: the recipe cannot be solved as written.")
                        .strong()
                        .color(super::ERROR),
                );
                ui.colored_label(super::ERROR, e);
            });
        }
        None => {
            ui.label(RichText::new("pH —").size(46.0).strong());
        }
    }
}

fn conditions_ui(ui: &mut Ui, settings: &mut Settings, refused: &mut Refusals) {
    egui::Grid::new("readout_conditions")
        .spacing([8.0, 4.0])
        .show(ui, |ui| {
            let label = ui.label("Temperature");
            ui.horizontal(|ui| {
                checked_drag(
                    ui,
                    &mut settings.temp_c,
                    |d| {
                        d.range(TEMPERATURE.min..=TEMPERATURE.max)
                            .speed(0.2)
                            .max_decimals(1)
                            .suffix(" °C")
                    },
                    Field {
                        name: "Temperature",
                        hint: "0–95 °C: Kw, every pKa and the activity model follow it",
                    },
                    TEMPERATURE,
                    refused,
                )
                .labelled_by(label.id);
            });
            ui.end_row();
            let label = ui.label("Activity model");
            let response = egui::ComboBox::from_id_salt("activity_model")
                .selected_text(activity_words(settings.activity))
                .show_ui(ui, |ui| {
                    for m in [
                        ActivityModel::Auto,
                        ActivityModel::Davies,
                        ActivityModel::Pitzer,
                        ActivityModel::Ideal,
                    ] {
                        ui.selectable_value(&mut settings.activity, m, activity_words(m));
                    }
                })
                .response
                .labelled_by(label.id);
            response.on_hover_text(
                "How ion activities are estimated from the ionic strength: Davies to about 0.5 mol/kg water, ideal only for very dilute solutions",
            );
            ui.end_row();
            let mut has_target = settings.target_ph.is_some();
            if ui.checkbox(&mut has_target, "Target pH").changed() {
                settings.target_ph = has_target.then_some(7.0);
            }
            ui.horizontal(|ui| {
                if let Some(t) = settings.target_ph.as_mut() {
                    checked_drag(
                        ui,
                        t,
                        |d| {
                            d.range(TARGET_PH.min..=TARGET_PH.max)
                                .speed(0.01)
                                .max_decimals(2)
                        },
                        Field {
                            name: "Target pH value",
                            hint: "The pH the batch should reach; the dose curve finds the dose to it",
                        },
                        TARGET_PH,
                        refused,
                    );
                    ui.label("±");
                    checked_drag(
                        ui,
                        &mut settings.target_tolerance,
                        |d| {
                            d.range(TOLERANCE.min..=TOLERANCE.max)
                                .speed(0.01)
                                .max_decimals(2)
                        },
                        Field {
                            name: "Target band half-width",
                            hint: "How far either side of the target still counts as on target",
                        },
                        TOLERANCE,
                        refused,
                    );
                }
            });
            ui.end_row();
        });
}

fn activity_words(model: ActivityModel) -> &'static str {
    match model {
        ActivityModel::Auto => "automatic (Davies, or Pitzer for concentrates)",
        ActivityModel::Davies => "Davies (to 0.5 mol/kg water)",
        ActivityModel::Pitzer => "Pitzer (concentrates, to 6 mol/kg water)",
        ActivityModel::Ideal => "ideal (dilute only)",
    }
}
