//! The in-use view: pH against dilution with water (1:1 to 1:1000, log axis) and against
//! temperature (0–80 °C), each with the product's own point marked.

use egui::{RichText, Ui};
use egui_plot::{Legend, Line, MarkerShape, Plot, Points};

use crate::engine::{DILUTION_MAX, Engine};

/// Height of each chart, points.
const HEIGHT: f32 = 180.0;

/// Draws the section, closed until asked for.
pub fn sweeps_ui(ui: &mut Ui, engine: &Engine, temp_c: f64) {
    egui::CollapsingHeader::new("In use: dilution and temperature")
        .default_open(false)
        .show(ui, |ui| {
            let (Some(report), Some(sweeps)) = (engine.solved(), engine.sweeps()) else {
                ui.weak("These appear once the recipe solves.");
                return;
            };
            let sweeps = match sweeps {
                Ok(s) => s,
                Err(why) => {
                    ui.colored_label(super::ERROR, crate::messages::sentence(why));
                    return;
                }
            };
            let ph = report.solution.ph;
            let current = super::current_color(ui);
            ui.label(
                RichText::new(format!(
                    "Diluted with pure water, 1:1 to 1:{DILUTION_MAX:.0}; and the product from 0 to 80 °C."
                ))
                .weak(),
            );
            ui.columns(2, |cols| {
                Plot::new("dilution_plot")
                    .height(HEIGHT)
                    .x_axis_label("Dilution (mass of diluted liquid / mass of product)")
                    .y_axis_label("pH")
                    .x_axis_formatter(|mark, _| format!("1:{}", super::sig(10f64.powf(mark.value), 2)))
                    .legend(Legend::default())
                    .allow_drag(false)
                    .allow_zoom(false)
                    .allow_scroll(false)
                    .show(&mut cols[0], |plot| {
                        plot.line(
                            Line::new("pH against dilution", sweeps.dilution.as_slice())
                                .width(2.0)
                                .color(super::PH_LINE),
                        );
                        plot.points(
                            Points::new(format!("Current recipe, pH {ph:.2}"), vec![[0.0, ph]])
                                .shape(MarkerShape::Diamond)
                                .radius(6.0)
                                .color(current),
                        );
                    });
                Plot::new("temperature_plot")
                    .height(HEIGHT)
                    .x_axis_label("Temperature, °C")
                    .y_axis_label("pH")
                    .legend(Legend::default())
                    .allow_drag(false)
                    .allow_zoom(false)
                    .allow_scroll(false)
                    .show(&mut cols[1], |plot| {
                        plot.line(
                            Line::new("pH against temperature", sweeps.temperature.as_slice())
                                .width(2.0)
                                .color(super::PH_LINE),
                        );
                        plot.points(
                            Points::new(
                                format!("Current recipe, {temp_c:.1} °C"),
                                vec![[temp_c, ph]],
                            )
                            .shape(MarkerShape::Diamond)
                            .radius(6.0)
                            .color(current),
                        );
                    });
            });
        });
}
