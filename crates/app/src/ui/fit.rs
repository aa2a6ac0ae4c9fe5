//! Measured titration and fit: readings imported or pasted, shown over the prediction with
//! their residuals, the unknowns fitted with standard errors, and the fitted ingredient saved.

use egui::{RichText, Role, Ui};
use egui_plot::{Line, MarkerShape, Plot, Points};
use saltwise_chem::Library;
use saltwise_chem::fit::Fit;
use saltwise_chem::measured::MeasuredTitration;
use saltwise_chem::project::Project;

use super::sig;
use crate::command::Command;
use crate::engine::Engine;
use crate::measured::FitForm;

/// Height of the residual chart, points.
const RESIDUAL_HEIGHT: f32 = 110.0;

/// Draws the section, closed until asked for.
pub fn fit_ui(
    ui: &mut Ui,
    project: &Project,
    engine: &Engine,
    form: &mut FitForm,
    commands: &mut Vec<Command>,
) {
    egui::CollapsingHeader::new("Measured titration and fit")
        .id_salt("fit_section")
        .default_open(false)
        .show(ui, |ui| {
            let Ok(library) = engine.library() else {
                return;
            };
            import_ui(ui, project, form, commands);
            if project.measured.is_empty() {
                ui.weak("No readings yet: import a file or paste readings (titrant added, pH, optionally °C) to compare them with the prediction and fit unknowns.");
                return;
            }
            form.selected = form.selected.min(project.measured.len() - 1);
            ui.separator();
            chooser_ui(ui, project, library, form, commands);
            let titration = &project.measured[form.selected];
            let fit = form.fit_for(titration).cloned();
            chart_ui(ui, engine, titration, fit.as_ref().and_then(|r| r.as_ref().ok()));
            ui.separator();
            unknowns_ui(ui, project, library, form, commands);
            match fit {
                Some(Ok(f)) => {
                    results_ui(ui, &f);
                    save_ui(ui, &f, form, commands);
                }
                Some(Err(e)) => {
                    ui.colored_label(super::ERROR, format!("No fit: {e}"));
                }
                None => {}
            }
        });
}

fn import_ui(ui: &mut Ui, project: &Project, form: &mut FitForm, commands: &mut Vec<Command>) {
    let m = &project.settings.qc;
    ui.label(format!(
        "Readings are taken as a titration of {} g of product with {} N titrant (the QC method above).",
        sig(m.sample_g, 4),
        sig(m.normality, 3)
    ));
    ui.horizontal_wrapped(|ui| {
        ui.label("Name");
        let r = ui.add(
            egui::TextEdit::singleline(&mut form.name)
                .hint_text("e.g. lot 24-117, bench 2")
                .desired_width(180.0),
        );
        super::name_widget(r, Role::TextInput, "Readings name");
        ui.checkbox(&mut form.by_mass, "Titrant weighed (g)")
            .on_hover_text("The first column is grams of titrant rather than mL (density taken as 1.00 kg/L)");
        if ui
            .button("Import readings…")
            .on_hover_text("A CSV or text file: titrant added, pH and optionally °C per line; header or none; comma, semicolon, tab or spaces; decimal comma with semicolons or tabs")
            .clicked()
        {
            commands.push(Command::ImportReadings);
        }
    });
    let r = ui.add(
        egui::TextEdit::multiline(&mut form.paste)
            .hint_text("or paste readings here, one per line: mL, pH")
            .desired_rows(3)
            .desired_width(f32::INFINITY),
    );
    super::name_widget(r, Role::MultilineTextInput, "Pasted readings");
    if ui
        .add_enabled(
            !form.paste.trim().is_empty(),
            egui::Button::new("Add pasted readings"),
        )
        .clicked()
    {
        commands.push(Command::ImportPasted);
    }
}

fn chooser_ui(
    ui: &mut Ui,
    project: &Project,
    library: &Library,
    form: &mut FitForm,
    commands: &mut Vec<Command>,
) {
    ui.horizontal_wrapped(|ui| {
        ui.label("Readings");
        let r = egui::ComboBox::from_id_salt("measured_choice")
            .selected_text(&project.measured[form.selected].name)
            .show_ui(ui, |ui| {
                for (i, t) in project.measured.iter().enumerate() {
                    ui.selectable_value(&mut form.selected, i, &t.name);
                }
            })
            .response;
        super::name_widget(r, Role::ComboBox, "Measured titration");
        if ui.button("Remove these readings").clicked() {
            commands.push(Command::RemoveMeasured(form.selected));
        }
    });
    let t = &project.measured[form.selected];
    let from = if t.source_file.is_empty() {
        "pasted".to_owned()
    } else {
        format!("from {}", t.source_file)
    };
    ui.weak(format!(
        "{} readings {from}, imported {}: {} g of product with {} N {}{}.",
        t.points.len(),
        t.imported,
        sig(t.sample_g, 4),
        sig(t.normality, 3),
        library
            .entry(&t.titrant)
            .map_or(t.titrant.as_str(), |e| e.ingredient.formula.as_str()),
        if t.titrant_by_mass {
            ", titrant weighed"
        } else {
            ""
        }
    ));
}

fn chart_ui(ui: &mut Ui, engine: &Engine, t: &MeasuredTitration, fit: Option<&Fit>) {
    let measured: Vec<[f64; 2]> = t
        .titrant_ml()
        .into_iter()
        .zip(&t.points)
        .map(|(ml, p)| [ml, p.ph])
        .collect();
    // The QC prediction is drawn when it is for this very titration.
    let predicted = match engine.qc() {
        Some(Ok(q))
            if q.titrant == t.titrant
                && q.normality == t.normality
                && (q.prediction.points.len() > 1) =>
        {
            Some(
                q.prediction
                    .points
                    .iter()
                    .map(|p| [p.ml, p.ph])
                    .collect::<Vec<_>>(),
            )
        }
        _ => None,
    };
    let current = super::current_color(ui);
    super::titration_plot("fit_plot").show(ui, |plot| {
        if let Some(p) = predicted {
            plot.line(
                Line::new("Predicted from the recipe", p)
                    .width(1.5)
                    .style(egui_plot::LineStyle::dashed_loose())
                    .color(super::PH_LINE),
            );
        }
        if let Some(f) = fit {
            let curve: Vec<[f64; 2]> = f.curve.iter().map(|p| [p.ml, p.ph]).collect();
            plot.line(Line::new("Fitted", curve).width(2.0).color(super::PH_LINE));
        }
        plot.points(
            Points::new("Measured", measured)
                .shape(MarkerShape::Circle)
                .radius(3.5)
                .filled(true)
                .color(current),
        );
    });
    if let Some(f) = fit {
        let residuals: Vec<[f64; 2]> = f.residuals.iter().map(|r| [r.ml, r.residual]).collect();
        Plot::new("residual_plot")
            .height(RESIDUAL_HEIGHT)
            .x_axis_label("Titrant, mL")
            .y_axis_label("Residual, pH")
            .include_y(0.0)
            .allow_scroll(false)
            .allow_zoom(false)
            .allow_drag(false)
            .show(ui, |plot| {
                plot.hline(egui_plot::HLine::new("zero", 0.0).color(super::PH_LINE));
                plot.points(
                    Points::new("Measured − fitted", residuals)
                        .shape(MarkerShape::Circle)
                        .radius(3.0)
                        .color(super::WARN),
                );
            });
    }
}

fn unknowns_ui(
    ui: &mut Ui,
    project: &Project,
    library: &Library,
    form: &mut FitForm,
    commands: &mut Vec<Command>,
) {
    ui.label(RichText::new("Unknowns to fit").strong());
    ui.horizontal_wrapped(|ui| {
        let mut on = form.assay.is_some();
        if ui.checkbox(&mut on, "Effective assay of").changed() {
            // The first line that is not plain water is the usual suspect.
            let lines = &project.recipe().lines;
            let first = lines
                .iter()
                .find(|l| l.ingredient != "water")
                .or(lines.first());
            form.assay = on.then(|| first.map(|l| l.ingredient.clone())).flatten();
        }
        if let Some(id) = form.assay.as_mut() {
            let name = |id: &str| {
                library
                    .entry(id)
                    .map_or_else(|| id.to_owned(), |e| e.ingredient.name.clone())
            };
            let r = egui::ComboBox::from_id_salt("fit_assay")
                .selected_text(name(id))
                .show_ui(ui, |ui| {
                    for l in &project.recipe().lines {
                        ui.selectable_value(id, l.ingredient.clone(), name(&l.ingredient));
                    }
                })
                .response;
            super::name_widget(r, Role::ComboBox, "Assay fitted");
        }
    });
    pka_ui(
        ui,
        &mut form.acid,
        "An unknown acid, starting pKa",
        "Unknown acid pKa",
        4.8,
    );
    pka_ui(
        ui,
        &mut form.base,
        "An unknown base, starting pKa",
        "Unknown base pKa",
        9.0,
    );
    ui.checkbox(&mut form.offset, "A meter offset (pH)")
        .on_hover_text(
            "A constant added to every reading's model pH: a meter calibrated off by that much",
        );
    if ui
        .button("Fit")
        .on_hover_text("Levenberg–Marquardt least squares on the readings' pH")
        .clicked()
    {
        commands.push(Command::RunFit);
    }
}

fn pka_ui(ui: &mut Ui, value: &mut Option<f64>, text: &str, name: &str, default: f64) {
    ui.horizontal(|ui| {
        let mut on = value.is_some();
        if ui.checkbox(&mut on, text).changed() {
            *value = on.then_some(default);
        }
        if let Some(v) = value.as_mut() {
            let r = ui.add(
                egui::DragValue::new(v)
                    .range(-2.0..=16.0)
                    .speed(0.05)
                    .max_decimals(2),
            );
            super::name_drag(r, *v, name);
        }
    });
}

fn results_ui(ui: &mut Ui, f: &Fit) {
    egui::Grid::new("fit_results")
        .striped(true)
        .spacing([14.0, 3.0])
        .show(ui, |ui| {
            ui.strong("Parameter");
            ui.strong("Fitted");
            ui.strong("Standard error");
            ui.strong("Started from");
            ui.end_row();
            for p in &f.parameters {
                ui.label(&p.name);
                ui.label(RichText::new(format!("{} {}", sig(p.value, 5), p.unit)).strong());
                match p.std_error {
                    Some(se) if p.determined => ui.label(format!("± {}", sig(se, 2))),
                    _ => ui.colored_label(super::WARN, "not determined"),
                };
                ui.label(sig(p.start, 4));
                ui.end_row();
            }
        });
    ui.label(format!(
        "RMS residual {} pH after the fit ({} before), {} degrees of freedom.",
        sig(f.rms_ph, 3),
        sig(f.start_rms_ph, 3),
        f.degrees_of_freedom
    ));
    if f.parameters.len() > 1 {
        ui.label("Correlation of the parameters");
        egui::Grid::new("fit_correlation")
            .spacing([10.0, 2.0])
            .show(ui, |ui| {
                ui.label("");
                for p in &f.parameters {
                    ui.weak(&p.name);
                }
                ui.end_row();
                for (p, row) in f.parameters.iter().zip(&f.correlation) {
                    ui.weak(&p.name);
                    for r in row {
                        let text = if r.is_finite() {
                            format!("{r:+.3}")
                        } else {
                            "—".into()
                        };
                        if r.is_finite() && r.abs() > 0.99 && r.abs() < 1.0 - 1e-12 {
                            ui.colored_label(super::WARN, text);
                        } else {
                            ui.label(text);
                        }
                    }
                    ui.end_row();
                }
            });
    }
    for w in &f.warnings {
        ui.colored_label(super::WARN, w);
    }
}

fn save_ui(ui: &mut Ui, f: &Fit, form: &mut FitForm, commands: &mut Vec<Command>) {
    let unknown = f.unknowns.iter().any(|u| {
        matches!(
            u,
            saltwise_chem::fit::Unknown::UnknownAcid { .. }
                | saltwise_chem::fit::Unknown::UnknownBase { .. }
        )
    });
    let assay = f
        .unknowns
        .iter()
        .any(|u| matches!(u, saltwise_chem::fit::Unknown::Assay(_)));
    if !unknown && !assay {
        return;
    }
    ui.horizontal_wrapped(|ui| {
        ui.label("Save as");
        let r = ui.add(
            egui::TextEdit::singleline(&mut form.save_name)
                .hint_text("id, e.g. lot_117_lye")
                .desired_width(160.0),
        );
        super::name_widget(r, Role::TextInput, "Fitted ingredient id");
        if unknown {
            ui.label("formula");
            let r = ui.add(
                egui::TextEdit::singleline(&mut form.save_formula)
                    .hint_text("e.g. C2H4O2")
                    .desired_width(110.0),
            );
            super::name_widget(r, Role::TextInput, "Fitted ingredient formula");
        }
        if ui
            .add_enabled(!form.save_name.trim().is_empty(), egui::Button::new("Save to my library"))
            .on_hover_text("Your own library in the data folder, with where the values came from; the window and the command line both read it")
            .clicked()
        {
            commands.push(Command::SaveFitted);
        }
    });
}
