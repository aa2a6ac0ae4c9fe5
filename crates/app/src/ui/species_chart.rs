//! The species chart: fractions of every form of a chosen system against pH 0–14 at the recipe's
//! ionic strength, the current pH, the dominant form, and the molality of each form.

use egui::{Color32, RichText, Ui};
use egui_plot::{Corner, Legend, Line, LineStyle, Plot, VLine};
use saltwise_chem::project::Settings;

use saltwise_chem::Library;
use saltwise_chem::distribution::{self, FREE, HYDROXO, MetalDistribution, SETTLED};
use saltwise_chem::report::Report;

use super::{SPECIES, sig};
use crate::engine::Engine;

/// The colour of form `j`.
fn color(j: usize) -> Color32 {
    SPECIES[j % SPECIES.len()]
}

/// Solid for even forms, dashed for odd ones, so neighbours differ by more than colour.
fn style(j: usize) -> LineStyle {
    if j.is_multiple_of(2) {
        LineStyle::Solid
    } else {
        LineStyle::dashed_dense()
    }
}

/// Draws the species panel.
pub fn species_chart_ui(ui: &mut Ui, settings: &mut Settings, engine: &Engine) {
    ui.heading("Species");
    let (Ok(library), Some(report)) = (engine.library(), engine.solved()) else {
        ui.weak("Species appear once the recipe solves.");
        return;
    };
    if report.systems.is_empty() {
        ui.label(
            RichText::new(
                "No acid–base system in this recipe: add a weak acid, a weak base or one of their salts to see its forms here.",
            )
            .italics(),
        );
        return;
    }
    let Some(data) = engine.species() else {
        return;
    };
    let metals = distribution::bound_metals(library, &report.composition);
    let metal = engine.metal();
    ui.horizontal_wrapped(|ui| {
        ui.label("System");
        let selected = match metal {
            Some(m) => metal_words(library, &m.metal),
            None => data.system_name.clone(),
        };
        let response = egui::ComboBox::from_id_salt("species_system")
            .selected_text(selected)
            .width(240.0)
            .show_ui(ui, |ui| {
                for st in &report.systems {
                    if let Some(s) = library.systems().get(st.system) {
                        let chosen = metal.is_none()
                            && (settings.species_system.as_deref() == Some(s.id.as_str())
                                || (settings.species_system.is_none()
                                    && st.system == data.system));
                        if ui.selectable_label(chosen, &s.name).clicked() {
                            settings.species_system = Some(s.id.clone());
                        }
                    }
                }
                if !metals.is_empty() {
                    ui.separator();
                }
                for m in &metals {
                    let chosen = metal.is_some_and(|d| &d.metal == m);
                    if ui
                        .selectable_label(chosen, metal_words(library, m))
                        .clicked()
                    {
                        settings.species_system = Some(m.clone());
                    }
                }
            })
            .response;
        super::name_widget(response, egui::Role::ComboBox, "Species system").on_hover_text(
            "Every acid–base system in the recipe, then every metal its ligands bind: a system's forms, or where a metal is (free, bound, settled), against pH",
        );
    });
    if let Some(m) = metal {
        metal_chart_ui(ui, library, report, m);
        return;
    }
    let ph = report.solution.ph;
    let dominant = data.forms.get(data.dominant).cloned().unwrap_or_default();
    let share = data
        .fractions_now
        .get(data.dominant)
        .copied()
        .unwrap_or(0.0);
    ui.label(
        RichText::new(format!(
            "At pH {ph:.2} mostly {dominant} ({:.0} %)",
            share * 100.0
        ))
        .strong(),
    );
    if let Some(active) = data.forms.get(data.active) {
        let fraction = data.fractions_now.get(data.active).copied().unwrap_or(0.0);
        ui.horizontal_wrapped(|ui| {
            ui.label("Active form");
            let response = egui::ComboBox::from_id_salt("active_form")
                .selected_text(active)
                .width(200.0)
                .show_ui(ui, |ui| {
                    for (j, name) in data.forms.iter().enumerate() {
                        if ui.selectable_label(j == data.active, name).clicked() {
                            settings.active_forms.insert(data.system_id.clone(), j);
                        }
                    }
                })
                .response;
            super::name_widget(response, egui::Role::ComboBox, "Active form of the system").on_hover_text(
                "The form that does the work (e.g. the undissociated acid of a preservative); by default the uncharged form, else the fully protonated one. Saved with the project.",
            );
            ui.label(
                RichText::new(format!("{} % at this pH", sig(fraction * 100.0, 3))).strong(),
            );
        });
    }
    let current = super::current_color(ui);
    Plot::new("species_plot")
        .height(super::chart_height(
            ui,
            64.0 + 22.0 * data.forms.len() as f32,
        ))
        .x_grid_spacer(egui_plot::uniform_grid_spacer(|_| [1.0, 2.0, 4.0]))
        .x_axis_label("pH")
        .y_axis_label("Fraction")
        .include_x(0.0)
        .include_x(14.0)
        .include_y(0.0)
        .include_y(1.05)
        .legend(Legend::default().position(Corner::RightTop))
        .allow_zoom(false)
        .allow_drag(false)
        .allow_scroll(false)
        .label_formatter(|pos| {
            let p = match pos {
                egui_plot::HoverPosition::NearDataPoint { position, .. }
                | egui_plot::HoverPosition::Elsewhere { position } => position,
            };
            Some(format!("pH {:.2}\nFraction {:.3}", p.x, p.y))
        })
        .show(ui, |plot| {
            for (j, (name, points)) in data.forms.iter().zip(&data.curves).enumerate() {
                plot.line(
                    Line::new(name.clone(), points.as_slice())
                        .width(2.0)
                        .style(style(j))
                        .color(color(j)),
                );
            }
            plot.vline(
                VLine::new(format!("Current recipe, pH {ph:.2}"), ph)
                    .color(current)
                    .width(1.5),
            );
        });
    ui.label(format!(
        "Fractions at ionic strength {} mol/kg water; colours and dashes as in the legend and the table.",
        sig(data.ionic_strength, 3)
    ));
    egui::Grid::new("species_table")
        .striped(true)
        .spacing([14.0, 3.0])
        .show(ui, |ui| {
            ui.label(RichText::new("Form").strong());
            ui.label(RichText::new("Fraction").strong());
            ui.label(RichText::new("mol/kg water").strong());
            ui.end_row();
            for (j, name) in data.forms.iter().enumerate() {
                let text = RichText::new(name).color(color(j));
                ui.label(if j == data.dominant {
                    text.strong()
                } else {
                    text
                });
                ui.label(format!(
                    "{:.1} %",
                    data.fractions_now.get(j).copied().unwrap_or(0.0) * 100.0
                ));
                ui.label(sig(data.molalities.get(j).copied().unwrap_or(0.0), 3));
                ui.end_row();
            }
        });
}

/// A metal as listed with the systems: its name and charge.
fn metal_words(library: &Library, id: &str) -> String {
    library.ion_index(id).map_or_else(
        || id.to_owned(),
        |i| {
            let ion = &library.ions()[i];
            format!(
                "{} ({}): free, bound, settled",
                ion.id,
                saltwise_chem::text::ion_display(&ion.symbol, i64::from(ion.charge))
            )
        },
    )
}

/// What a part of a metal's distribution is called on the chart and in exports.
pub fn part_words(library: &Library, metal: &str, part: &str) -> String {
    match part {
        FREE => match library.ion_index(metal) {
            Some(i) => {
                let ion = &library.ions()[i];
                format!(
                    "free {}",
                    saltwise_chem::text::ion_display(&ion.symbol, i64::from(ion.charge))
                )
            }
            None => format!("free {metal}"),
        },
        HYDROXO => "as hydroxo complexes".into(),
        SETTLED => "settled out as solid".into(),
        system => library.system_index(system).map_or_else(
            || format!("with {system}"),
            |s| format!("with {}", library.systems()[s].name),
        ),
    }
}

/// The metal's distribution against pH, with the recipe's pH marked and its shares there.
fn metal_chart_ui(ui: &mut Ui, library: &Library, report: &Report, m: &MetalDistribution) {
    let ph = report.solution.ph;
    let names: Vec<String> = m
        .parts
        .iter()
        .map(|p| part_words(library, &m.metal, p))
        .collect();
    let now = m
        .points
        .iter()
        .min_by(|a, b| (a.0 - ph).abs().total_cmp(&(b.0 - ph).abs()))
        .map(|(_, s)| s.clone())
        .unwrap_or_default();
    if let Some((j, share)) = now.iter().enumerate().max_by(|a, b| a.1.total_cmp(b.1)) {
        ui.label(
            RichText::new(format!(
                "Near pH {ph:.2} mostly {} ({:.0} %)",
                names[j],
                share * 100.0
            ))
            .strong(),
        );
    }
    let current = super::current_color(ui);
    Plot::new("metal_plot")
        .height(super::chart_height(ui, 64.0 + 22.0 * names.len() as f32))
        .x_grid_spacer(egui_plot::uniform_grid_spacer(|_| [1.0, 2.0, 4.0]))
        .x_axis_label("pH")
        .y_axis_label("Share of the metal")
        .include_x(0.0)
        .include_x(14.0)
        .include_y(0.0)
        .include_y(1.05)
        .legend(Legend::default().position(Corner::RightTop))
        .allow_zoom(false)
        .allow_drag(false)
        .allow_scroll(false)
        .show(ui, |plot| {
            for (j, name) in names.iter().enumerate() {
                let points: Vec<[f64; 2]> = m.points.iter().map(|(x, s)| [*x, s[j]]).collect();
                plot.line(
                    Line::new(name.clone(), points)
                        .width(2.0)
                        .style(style(j))
                        .color(color(j)),
                );
            }
            plot.vline(
                VLine::new(format!("Current recipe, pH {ph:.2}"), ph)
                    .color(current)
                    .width(1.5),
            );
        });
    ui.label(
        "Each pH held as by acid or base added to hold it, at the recipe's totals and activity coefficients.",
    );
    egui::Grid::new("metal_table")
        .striped(true)
        .spacing([14.0, 3.0])
        .show(ui, |ui| {
            ui.label(RichText::new("Where").strong());
            ui.label(RichText::new("Share near this pH").strong());
            ui.end_row();
            for (j, name) in names.iter().enumerate() {
                ui.label(RichText::new(name).color(color(j)));
                ui.label(format!(
                    "{:.1} %",
                    now.get(j).copied().unwrap_or(0.0) * 100.0
                ));
                ui.end_row();
            }
        });
}
