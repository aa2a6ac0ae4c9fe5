//! The dose curve: pH against the dose of a chosen pH adjuster, with the target band, the current
//! recipe, equivalence points, a hover readout and buffer capacity as a second chart.

use egui::{RichText, Role, Ui};
use egui_plot::{Corner, Legend, Line, LineStyle, MarkerShape, Plot, Points, Span, VLine};
use saltwise_chem::Library;
use saltwise_chem::library::ResolvedRelease;
use saltwise_chem::project::Settings;

use super::{Field, PanelState, checked_drag, sig};
use crate::command::{Command, RecipeEdit};
use crate::engine::Engine;
use saltwise_chem::limits::DOSE_MAX_G as LARGEST_DOSE;

/// Height of the buffer-capacity chart, points.
const BUFFER_HEIGHT: f32 = 140.0;

/// Draws the dose-curve panel.
pub fn dose_curve_ui(
    ui: &mut Ui,
    settings: &mut Settings,
    engine: &Engine,
    panels: &mut PanelState,
    commands: &mut Vec<Command>,
) {
    ui.heading("Dose curve");
    let Ok(library) = engine.library() else {
        return;
    };
    ui.horizontal_wrapped(|ui| {
        ui.label("Adjuster");
        adjuster_picker(ui, settings, library);
    });
    ui.horizontal_wrapped(|ui| {
        let label = ui.label("Largest dose");
        let speed = (settings.dose_max_g * 0.005).max(0.01);
        checked_drag(
            ui,
            &mut settings.dose_max_g,
            |d| {
                d.range(0.001..=LARGEST_DOSE.max)
                    .speed(speed)
                    .max_decimals(3)
            },
            Field {
                name: "Largest dose",
                hint: "The right end of the curve, in grams of the adjuster as supplied",
            },
            LARGEST_DOSE,
            &mut panels.refused,
        )
        .labelled_by(label.id);
        ui.label("g");
        ui.checkbox(&mut panels.show_buffer_capacity, "Show buffer capacity")
            .on_hover_text("A second chart under this one: buffer capacity against the same dose");
    });
    let curve = match engine.curve() {
        Some(Ok(c)) => c,
        Some(Err(e)) => {
            ui.colored_label(super::ERROR, format!("No dose curve: {e}"));
            return;
        }
        None => return,
    };
    match (&curve.to_target, settings.target_ph) {
        (Some(Ok(dose)), Some(t)) => {
            ui.label(
                RichText::new(format!(
                    "To reach pH {t:.2}: add {} g of {} ({} % of the batch)",
                    sig(dose.amount_g, 4),
                    curve.adjuster_name,
                    sig(dose.percent_of_batch, 3)
                ))
                .strong()
                .color(super::TARGET),
            );
            ui.horizontal_wrapped(|ui| {
                if ui
                    .button("Add this dose to the recipe")
                    .on_hover_text(
                        "One step you can undo: onto the adjuster's line in grams, or as a new line",
                    )
                    .clicked()
                {
                    commands.push(Command::Edit(RecipeEdit::ApplyDose));
                }
                ui.weak("Doses go on top of the batch as weighed.");
            });
        }
        (Some(Err(e)), _) => {
            ui.colored_label(super::WARN, e);
        }
        _ => {
            ui.weak("Set a target pH in the readout to see the dose that reaches it.");
        }
    }
    let x_label = format!("Dose of {}, g", curve.adjuster_name);
    let link = egui::Id::unique("dose_axis_link");
    let target = settings.target_ph;
    let tolerance = settings.target_tolerance;
    let current = curve.points.first().map(|p| [p.dose_g, p.ph]);
    let eq: Vec<[f64; 2]> = curve.equivalence.iter().map(|e| [e.dose_g, e.ph]).collect();
    let dose = curve
        .to_target
        .as_ref()
        .and_then(|r| r.as_ref().ok())
        .map(|d| d.amount_g)
        .filter(|d| *d <= settings.dose_max_g);
    let below = 28.0
        + if panels.show_buffer_capacity {
            BUFFER_HEIGHT + 12.0
        } else {
            0.0
        };
    let height = super::chart_height(ui, below);
    let current_color = super::current_color(ui);
    let band = match engine.band() {
        Some(crate::band_job::BandState::Done(Ok(b))) => Some((b.p05, b.p95)),
        _ => None,
    };
    // Put the legend in the bottom corner the curve leaves empty: right for a rising curve,
    // left for a falling one.
    let rising = curve.points.last().map(|p| p.ph) > curve.points.first().map(|p| p.ph);
    let corner = if rising {
        Corner::RightBottom
    } else {
        Corner::LeftBottom
    };
    Plot::new("dose_plot")
        .height(height)
        .x_axis_label(x_label.clone())
        .y_axis_label("pH")
        .legend(Legend::default().position(corner))
        .link_axis(link, [true, false])
        .link_cursor(link, [true, false])
        .include_x(0.0)
        .label_formatter(|pos| {
            let p = match pos {
                egui_plot::HoverPosition::NearDataPoint { position, .. }
                | egui_plot::HoverPosition::Elsewhere { position } => position,
            };
            Some(format!("Dose {} g\npH {:.2}", sig(p.x, 4), p.y))
        })
        .show(ui, |plot| {
            if let Some(t) = target {
                plot.span(
                    Span::new(
                        format!("Target band, pH {t:.2} ± {tolerance:.2}"),
                        (t - tolerance)..=(t + tolerance),
                    )
                    .axis(egui_plot::Axis::Y)
                    .fill(super::TARGET.gamma_multiply(0.35))
                    .border_color(super::TARGET),
                );
            }
            plot.line(
                Line::new("pH", curve.ph_points.as_slice())
                    .width(2.0)
                    .color(super::PH_LINE),
            );
            if let Some(c) = current {
                plot.points(
                    Points::new("Current recipe", vec![c])
                        .shape(MarkerShape::Diamond)
                        .radius(7.0)
                        .color(current_color),
                );
            }
            if let Some((lo, hi)) = band {
                // The band of the recipe as weighed, where the curve starts.
                plot.line(
                    Line::new(
                        format!("pH band under the tolerances, {lo:.2} to {hi:.2}"),
                        vec![[0.0, lo], [0.0, hi]],
                    )
                    .width(6.0)
                    .color(current_color.gamma_multiply(0.6)),
                );
            }
            if !eq.is_empty() {
                plot.points(
                    Points::new("Equivalence point", eq)
                        .shape(MarkerShape::Circle)
                        .radius(5.0)
                        .filled(false)
                        .color(super::EQUIVALENCE),
                );
            }
            if let Some(d) = dose {
                plot.vline(VLine::new("Dose to target", d).color(super::TARGET));
            }
        });
    if !curve.equivalence.is_empty() {
        let list: Vec<String> = curve
            .equivalence
            .iter()
            .map(|e| format!("{} g (pH {:.2})", sig(e.dose_g, 3), e.ph))
            .collect();
        ui.label(format!("Equivalence points: {}", list.join(", ")));
    }
    if panels.show_buffer_capacity {
        Plot::new("buffer_plot")
            .height(BUFFER_HEIGHT)
            .x_axis_label(x_label)
            .y_axis_label("β, mol per kg water per pH")
            .link_axis(link, [true, false])
            .link_cursor(link, [true, false])
            .include_y(0.0)
            .label_formatter(|pos| {
                let p = match pos {
                    egui_plot::HoverPosition::NearDataPoint { position, .. }
                    | egui_plot::HoverPosition::Elsewhere { position } => position,
                };
                Some(format!("Dose {} g\nβ {}", sig(p.x, 4), sig(p.y, 3)))
            })
            .show(ui, |plot| {
                plot.line(
                    Line::new("Buffer capacity", curve.buffer_points.as_slice())
                        .width(2.0)
                        .style(LineStyle::dashed_loose())
                        .color(super::BUFFER),
                );
            });
    }
}

fn adjuster_picker(ui: &mut Ui, settings: &mut Settings, library: &Library) {
    let selected = library
        .entry(&settings.adjuster)
        .map_or_else(|| settings.adjuster.clone(), |e| e.ingredient.name.clone());
    let response = egui::ComboBox::from_id_salt("adjuster")
        .selected_text(selected)
        .width(260.0)
        .show_ui(ui, |ui| {
            for e in library
                .entries()
                .iter()
                .filter(|e| moves_ph(library, &e.releases))
            {
                ui.selectable_value(
                    &mut settings.adjuster,
                    e.ingredient.id.clone(),
                    &e.ingredient.name,
                );
            }
        })
        .response;
    super::name_widget(response, Role::ComboBox, "pH adjuster").on_hover_text(
        "Any library ingredient that releases an acid or a base; the curve adds it to the batch",
    );
}

fn moves_ph(library: &Library, releases: &[ResolvedRelease]) -> bool {
    releases.iter().any(|r| match *r {
        ResolvedRelease::Ion { ion, .. } => library.is_proton_ion(ion),
        ResolvedRelease::System { .. } => true,
    })
}
