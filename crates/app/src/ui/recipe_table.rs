//! The recipe panel: one row per ingredient line, the q.s. water line and batch size, what each
//! line does to pH, and the picker that adds ingredients from the library.

use egui::{DragValue, RichText, Ui};
use saltwise_chem::library::Entry;
use saltwise_chem::project::Project;
use saltwise_chem::{Amount, Library, RecipeLine, Unit};

use super::{Allowed, Refusals, checked_drag, named_button, sig};
use crate::app::PanelState;
use crate::engine::Engine;
use saltwise_chem::explain::{Effect, IngredientEffect};

/// Most matches the picker lists at once.
const PICKER_ROWS: usize = 40;
/// What an amount may be.
const AMOUNT: Allowed = Allowed {
    min: 0.0,
    min_exclusive: false,
    max: 1.0e7,
    rule: "an amount is a number from 0 to 10 000 000",
};
/// What a q.s. batch size may be.
const BATCH: Allowed = Allowed {
    min: 0.0,
    min_exclusive: true,
    max: 1.0e8,
    rule: "a batch is above 0 g and at most 100 000 000 g",
};

enum RowAction {
    Up(usize),
    Down(usize),
    Remove(usize),
}

/// Draws the recipe panel.
pub fn recipe_panel_ui(
    ui: &mut Ui,
    project: &mut Project,
    engine: &Engine,
    panels: &mut PanelState,
) {
    ui.add_space(4.0);
    ui.heading("Recipe");
    let library = match engine.library() {
        Ok(lib) => lib,
        Err(e) => {
            ui.colored_label(super::ERROR, format!("The recipe cannot be shown: {e}"));
            return;
        }
    };
    egui::ScrollArea::vertical()
        .id_salt("recipe_scroll")
        .auto_shrink([false, false])
        .show(ui, |ui| {
            lines_ui(ui, project, engine, library, &mut panels.refused);
            ui.add_space(6.0);
            batch_ui(ui, project, engine, &mut panels.refused);
            let empty = project.recipe.lines.is_empty();
            if let (Some(Err(e)), false) = (engine.report(), empty) {
                ui.add_space(4.0);
                ui.colored_label(super::ERROR, format!("The recipe cannot be solved: {e}"));
            }
            if !empty {
                ui.add_space(8.0);
                reasons_ui(ui, project, engine, library);
            }
            ui.add_space(8.0);
            picker_ui(ui, project, library, &mut panels.picker_query);
            ui.add_space(8.0);
            super::custom_ingredient::custom_ingredient_ui(
                ui,
                project,
                library,
                &mut panels.custom,
            );
        });
}

fn lines_ui(
    ui: &mut Ui,
    project: &mut Project,
    engine: &Engine,
    library: &Library,
    refused: &mut Refusals,
) {
    let report = engine.solved();
    let n = project.recipe.lines.len();
    if n == 0 {
        ui.label(
            RichText::new("The recipe is empty. Add an ingredient from the library below: search by name, then click it.")
                .italics(),
        );
        return;
    }
    let mut action = None;
    // The table scrolls sideways on its own when the panel is narrow; the text below still wraps.
    egui::ScrollArea::horizontal()
        .id_salt("recipe_grid_scroll")
        .show(ui, |ui| {
            egui::Grid::new("recipe_grid")
                .striped(true)
                .spacing([10.0, 6.0])
                .show(ui, |ui| {
                    for h in [
                        "On",
                        "Ingredient",
                        "Amount",
                        "",
                        "Assay",
                        "In batch",
                        "mol/kg",
                        "pH",
                        "",
                    ] {
                        ui.label(RichText::new(h).strong());
                    }
                    ui.end_row();
                    for (i, line) in project.recipe.lines.iter_mut().enumerate() {
                        let row = i + 1;
                        let entry = library.entry_index(&line.ingredient);
                        ui.checkbox(&mut line.enabled, "")
                            .on_hover_text(format!("Use line {row}"));
                        let name = entry.map_or_else(
                            || format!("{} (not in the library)", line.ingredient),
                            |e| library.entries()[e].ingredient.name.clone(),
                        );
                        let text = RichText::new(&name);
                        let label = ui.label(if line.enabled {
                            text
                        } else {
                            text.weak().strikethrough()
                        });
                        if let Some(e) = entry.map(|e| &library.entries()[e]) {
                            label.on_hover_text(format!(
                                "{} ({}), {:.2} g/mol{}",
                                e.ingredient.formula,
                                e.ingredient.id,
                                e.molar_mass_g_per_mol,
                                if e.ingredient.note.is_empty() {
                                    String::new()
                                } else {
                                    format!("\n{}", e.ingredient.note)
                                }
                            ));
                        }
                        let before = line.amount;
                        amount_ui(ui, &mut line.amount, row, refused);
                        if line.amount.unit != before.unit {
                            // Keep the mass when only the unit changes.
                            let batch_g = report.map(|r| r.batch.total_mass_g);
                            let entry = entry.map(|e| &library.entries()[e]);
                            if let Some(v) = convert(entry, before, line.amount.unit, batch_g) {
                                line.amount.value = v;
                            }
                        }
                        let a = entry.map_or(f64::NAN, |e| library.entries()[e].ingredient.assay);
                        ui.label(format!("{} %", sig(a * 100.0, 3)));
                        let line_mass = report.and_then(|r| r.batch.lines.get(i));
                        ui.label(
                            line_mass.map_or("—".into(), |l| format!("{} g", sig(l.mass_g, 4))),
                        );
                        ui.label(report.map_or("—".into(), |r| sig(r.batch.line_molality(i), 3)));
                        match engine.effects().get(i).and_then(Option::as_ref) {
                            Some(effect) if line.enabled => {
                                ui.label(effect_text(ui, effect.effect))
                                    .on_hover_text(ion_reasons(effect));
                            }
                            _ => {
                                ui.weak("off");
                            }
                        }
                        ui.horizontal(|ui| {
                            if ui
                                .add_enabled_ui(i > 0, |ui| {
                                    named_button(ui, "Up", &format!("Move line {row} up"))
                                })
                                .inner
                                .clicked()
                            {
                                action = Some(RowAction::Up(i));
                            }
                            if ui
                                .add_enabled_ui(i + 1 < n, |ui| {
                                    named_button(ui, "Down", &format!("Move line {row} down"))
                                })
                                .inner
                                .clicked()
                            {
                                action = Some(RowAction::Down(i));
                            }
                            if named_button(ui, "×", &format!("Remove line {row}")).clicked() {
                                action = Some(RowAction::Remove(i));
                            }
                        });
                        ui.end_row();
                    }
                });
        });
    if action.is_some() {
        // Row numbers move: a refusal would be shown beside the wrong line.
        refused.retain(|name, _| !name.starts_with("Amount of line"));
    }
    let lines = &mut project.recipe.lines;
    match action {
        Some(RowAction::Up(i)) if i > 0 => lines.swap(i - 1, i),
        Some(RowAction::Down(i)) if i + 1 < lines.len() => lines.swap(i, i + 1),
        Some(RowAction::Remove(i)) if i < lines.len() => {
            lines.remove(i);
        }
        _ => {}
    }
}

/// The amount of one line: a drag value (click it to type) and its unit.
fn amount_ui(ui: &mut Ui, amount: &mut Amount, row: usize, refused: &mut Refusals) {
    let speed = drag_speed(*amount);
    ui.horizontal(|ui| {
        checked_drag(
            ui,
            DragValue::new(&mut amount.value)
                .range(AMOUNT.min..=AMOUNT.max)
                .speed(speed)
                .min_decimals(1)
                .max_decimals(4),
            &format!("Amount of line {row}"),
            AMOUNT,
            refused,
        );
    });
    egui::ComboBox::from_id_salt(("unit", row))
        .selected_text(unit_words(amount.unit))
        .width(58.0)
        .show_ui(ui, |ui| {
            for unit in Unit::ALL {
                ui.selectable_value(&mut amount.unit, unit, unit_words(unit));
            }
        })
        .response
        .on_hover_text(format!("Unit of line {row}"));
}

/// The value in `unit` of the same mass as `amount`, if it can be known.
fn convert(entry: Option<&Entry>, amount: Amount, unit: Unit, batch_g: Option<f64>) -> Option<f64> {
    let entry = entry?;
    let grams = match entry.grams(amount) {
        Some(g) => g,
        None => amount.value / 100.0 * batch_g?,
    };
    let value = match unit {
        Unit::Gram => grams,
        Unit::Kilogram => grams * 1e-3,
        Unit::Milligram => grams * 1e3,
        Unit::Mole => grams * entry.ingredient.assay / entry.molar_mass_g_per_mol,
        Unit::Percent => 100.0 * grams / batch_g.filter(|b| *b > 0.0)?,
    };
    value.is_finite().then_some(value)
}

fn drag_speed(amount: Amount) -> f64 {
    let scale: f64 = match amount.unit {
        Unit::Gram => 0.05,
        Unit::Kilogram | Unit::Mole => 0.0005,
        Unit::Milligram => 5.0,
        Unit::Percent => 0.005,
    };
    scale.max(amount.value.abs() * 0.002)
}

fn unit_words(unit: Unit) -> &'static str {
    match unit {
        Unit::Percent => "% w/w",
        other => other.symbol(),
    }
}

fn batch_ui(ui: &mut Ui, project: &mut Project, engine: &Engine, refused: &mut Refusals) {
    let report = engine.solved();
    ui.horizontal_wrapped(|ui| {
        let mut qs = project.recipe.qs_to_g.is_some();
        if ui.checkbox(&mut qs, "Water q.s. to a batch of").changed() {
            project.recipe.qs_to_g = if qs {
                Some(report.map_or(1000.0, |r| r.batch.total_mass_g.max(1.0)))
            } else {
                None
            };
        }
        if let Some(size) = project.recipe.qs_to_g.as_mut() {
            let speed = (*size * 0.002).max(0.1);
            checked_drag(
                ui,
                DragValue::new(size).range(0.001..=BATCH.max).speed(speed),
                "Batch size",
                BATCH,
                refused,
            );
            ui.label("g");
            if let Some(r) = report {
                ui.label(format!("— water added: {} g", sig(r.batch.qs_water_g, 5)));
            }
        }
    });
    if let Some(r) = report {
        ui.label(format!(
            "Batch {} g, water {} g in all (every source counted)",
            sig(r.batch.total_mass_g, 5),
            sig(r.batch.totals.water_kg * 1000.0, 5)
        ));
    }
}

fn effect_text(ui: &Ui, effect: Effect) -> RichText {
    let (words, color) = match effect {
        Effect::Acidifies => ("lowers pH", egui::Color32::from_rgb(0xc0, 0x50, 0x40)),
        Effect::Basifies => ("raises pH", egui::Color32::from_rgb(0x3a, 0x6e, 0xc8)),
        Effect::Neutral => ("no effect", ui.visuals().weak_text_color()),
    };
    RichText::new(words).color(color)
}

fn ion_reasons(effect: &IngredientEffect) -> String {
    effect
        .ions
        .iter()
        .map(|ion| format!("{}: {}", ion.label, ion.reason))
        .collect::<Vec<_>>()
        .join("\n")
}

fn reasons_ui(ui: &mut Ui, project: &Project, engine: &Engine, library: &Library) {
    egui::CollapsingHeader::new("What each line does to pH")
        .default_open(true)
        .show(ui, |ui| {
            for (i, line) in project.recipe.lines.iter().enumerate() {
                let Some(effect) = engine.effects().get(i).and_then(Option::as_ref) else {
                    continue;
                };
                let name = library
                    .entry(&line.ingredient)
                    .map_or(line.ingredient.as_str(), |e| e.ingredient.name.as_str());
                ui.horizontal_wrapped(|ui| {
                    ui.spacing_mut().item_spacing.x = 4.0;
                    let head = RichText::new(format!("{}. {name}:", i + 1)).strong();
                    if line.enabled {
                        ui.label(head);
                        ui.label(effect_text(ui, effect.effect));
                        ui.label(format!("— {}", effect.summary))
                            .on_hover_text(ion_reasons(effect));
                    } else {
                        ui.label(head.weak());
                        ui.weak(format!("(line off) {}", effect.summary));
                    }
                });
            }
        });
}

fn picker_ui(ui: &mut Ui, project: &mut Project, library: &Library, query: &mut String) {
    ui.label(RichText::new("Add an ingredient").strong());
    let label = ui.label("Search the library");
    ui.add(
        egui::TextEdit::singleline(query)
            .hint_text("e.g. citric, NaOH, phosphate")
            .desired_width(f32::INFINITY),
    )
    .labelled_by(label.id)
    .on_hover_text("Type part of a name, formula or id");
    let needle = query.trim().to_lowercase();
    let matches: Vec<usize> = library
        .entries()
        .iter()
        .enumerate()
        .filter(|(_, e)| {
            needle.is_empty()
                || e.ingredient.name.to_lowercase().contains(&needle)
                || e.ingredient.id.contains(&needle)
                || e.ingredient.formula.to_lowercase().contains(&needle)
        })
        .map(|(i, _)| i)
        .collect();
    if matches.is_empty() {
        ui.weak("No ingredient matches. Try part of the name, or add a custom ingredient below.");
        return;
    }
    egui::ScrollArea::vertical()
        .id_salt("picker_scroll")
        .max_height(180.0)
        .show(ui, |ui| {
            for &i in matches.iter().take(PICKER_ROWS) {
                let e = &library.entries()[i];
                ui.horizontal(|ui| {
                    let name = &e.ingredient.name;
                    if named_button(ui, &format!("+ {name}"), &format!("Add {name}")).clicked() {
                        let amount = if project.recipe.qs_to_g.is_some() {
                            Amount {
                                value: 1.0,
                                unit: Unit::Percent,
                            }
                        } else {
                            Amount::grams(1.0)
                        };
                        project.recipe.lines.push(RecipeLine {
                            ingredient: e.ingredient.id.clone(),
                            amount,
                            enabled: true,
                        });
                    }
                    ui.weak(format!(
                        "{} · assay {} %",
                        e.ingredient.formula,
                        sig(e.ingredient.assay * 100.0, 3)
                    ));
                });
            }
            if matches.len() > PICKER_ROWS {
                ui.weak(format!(
                    "… {} more: type more of the name",
                    matches.len() - PICKER_ROWS
                ));
            }
        });
}
