//! The recipe panel: one row per ingredient line, the q.s. water line and batch size, what each
//! line does to pH, and the picker that adds ingredients from the library.

use egui::{RichText, Ui};
use saltwise_chem::explain::{Effect, IngredientEffect};
use saltwise_chem::project::Project;
use saltwise_chem::{Amount, Library, RecipeLine, Unit};

use super::{Field, PanelState, Refusals, checked_drag, named_button, sig};
use crate::command::{Command, RecipeEdit};
use crate::engine::Engine;
use saltwise_chem::limits::{AMOUNT, BATCH_G as BATCH};

/// Most matches the picker lists at once.
const PICKER_ROWS: usize = 40;

/// Draws the recipe panel.
pub fn recipe_panel_ui(
    ui: &mut Ui,
    project: &mut Project,
    engine: &Engine,
    panels: &mut PanelState,
    commands: &mut Vec<Command>,
) {
    ui.add_space(4.0);
    ui.heading("Recipe");
    super::variants::variant_bar_ui(ui, project, panels, commands);
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
            lines_ui(ui, project, engine, library, &mut panels.refused, commands);
            ui.add_space(6.0);
            batch_ui(ui, project, engine, &mut panels.refused, commands);
            if !project.recipe().lines.is_empty() {
                ui.add_space(4.0);
                super::variants::prices_ui(ui, project, engine, library, panels, commands);
            }
            let empty = project.recipe().lines.is_empty();
            if let (Some(Err(e)), false) = (engine.report(), empty) {
                ui.add_space(4.0);
                ui.colored_label(super::ERROR, format!("The recipe cannot be solved: {e}"));
            }
            if !empty {
                ui.add_space(8.0);
                reasons_ui(ui, project, engine, library);
            }
            ui.add_space(8.0);
            let in_percent = project.recipe().qs_to_g.is_some();
            picker_ui(ui, in_percent, library, &mut panels.picker_query, commands);
            ui.add_space(8.0);
            super::custom_ingredient::custom_ingredient_ui(
                ui,
                library,
                &mut panels.custom,
                commands,
            );
        });
}

fn lines_ui(
    ui: &mut Ui,
    project: &mut Project,
    engine: &Engine,
    library: &Library,
    refused: &mut Refusals,
    commands: &mut Vec<Command>,
) {
    let report = engine.solved();
    let n = project.recipe().lines.len();
    if n == 0 {
        ui.label(
            RichText::new("The recipe is empty. Add an ingredient from the library below: search by name, then click it.")
                .italics(),
        );
        return;
    }
    // The table scrolls sideways on its own when the panel is narrow; the text below still wraps.
    egui::ScrollArea::horizontal()
        .id_salt("recipe_grid_scroll")
        .show(ui, |ui| {
            egui::Grid::new("recipe_grid")
                .striped(true)
                .spacing([8.0, 6.0])
                .show(ui, |ui| {
                    for h in [
                        "On",
                        "Ingredient",
                        "Amount",
                        "",
                        "Assay",
                        "In batch",
                        "mol/kg water",
                        "Effect on pH",
                        "",
                    ] {
                        ui.label(RichText::new(h).strong());
                    }
                    ui.end_row();
                    for (i, line) in project.recipe_mut().lines.iter_mut().enumerate() {
                        let row = i + 1;
                        let entry = library.entry_index(&line.ingredient);
                        let mut enabled = line.enabled;
                        let switch = ui.checkbox(&mut enabled, "");
                        if super::name_widget(
                            switch,
                            egui::Role::CheckBox,
                            &format!("Use line {row}"),
                        )
                        .on_hover_text("Off leaves the line out of the batch without deleting it")
                        .changed()
                        {
                            commands
                                .push(Command::Edit(RecipeEdit::SetEnabled { line: i, enabled }));
                        }
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
                                "{}, {:.2} g/mol; id for the command line: {}{}",
                                e.ingredient.formula,
                                e.molar_mass_g_per_mol,
                                e.ingredient.id,
                                if e.ingredient.note.is_empty() {
                                    String::new()
                                } else {
                                    format!("\n{}", e.ingredient.note)
                                }
                            ));
                        }
                        if let Some(unit) = amount_ui(ui, &mut line.amount, row, refused) {
                            commands.push(Command::Edit(RecipeEdit::SetUnit { line: i, unit }));
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
                                ui.label(effect_text(effect.effect))
                                    .on_hover_text(ion_reasons(effect));
                            }
                            _ => {
                                ui.weak("off");
                            }
                        }
                        ui.horizontal(|ui| {
                            if ui
                                .add_enabled_ui(i > 0, |ui| {
                                    named_button(ui, "↑", &format!("Move line {row} up"))
                                })
                                .inner
                                .clicked()
                            {
                                commands.push(Command::Edit(RecipeEdit::MoveUp(i)));
                            }
                            if ui
                                .add_enabled_ui(i + 1 < n, |ui| {
                                    named_button(ui, "↓", &format!("Move line {row} down"))
                                })
                                .inner
                                .clicked()
                            {
                                commands.push(Command::Edit(RecipeEdit::MoveDown(i)));
                            }
                            if named_button(ui, "×", &format!("Remove line {row}")).clicked() {
                                commands.push(Command::Edit(RecipeEdit::RemoveLine(i)));
                            }
                        });
                        ui.end_row();
                    }
                });
        });
}

/// The amount of one line: a drag value (click it to type) and its unit; returns a unit newly
/// chosen.
fn amount_ui(ui: &mut Ui, amount: &mut Amount, row: usize, refused: &mut Refusals) -> Option<Unit> {
    let speed = drag_speed(*amount);
    ui.horizontal(|ui| {
        checked_drag(
            ui,
            &mut amount.value,
            |d| {
                d.range(AMOUNT.min..=AMOUNT.max)
                    .speed(speed)
                    .min_decimals(1)
                    .max_decimals(4)
            },
            Field {
                name: &format!("Amount of line {row}"),
                hint: "Drag sideways, or click and type; in the unit chosen beside it",
            },
            AMOUNT,
            refused,
        );
    });
    let mut chosen = None;
    let response = egui::ComboBox::from_id_salt(("unit", row))
        .selected_text(unit_words(amount.unit))
        .width(58.0)
        .show_ui(ui, |ui| {
            for unit in Unit::ALL {
                if ui
                    .selectable_label(amount.unit == unit, unit_words(unit))
                    .clicked()
                    && unit != amount.unit
                {
                    chosen = Some(unit);
                }
            }
        })
        .response;
    super::name_widget(
        response,
        egui::Role::ComboBox,
        &format!("Unit of line {row}"),
    )
    .on_hover_text("Changing the unit keeps the mass where it can be known");
    chosen
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

fn batch_ui(
    ui: &mut Ui,
    project: &mut Project,
    engine: &Engine,
    refused: &mut Refusals,
    commands: &mut Vec<Command>,
) {
    let report = engine.solved();
    ui.horizontal_wrapped(|ui| {
        let mut qs = project.recipe().qs_to_g.is_some();
        if ui.checkbox(&mut qs, "Water q.s. to a batch of").changed() {
            commands.push(Command::Edit(RecipeEdit::SetQs(qs)));
        }
        if let Some(size) = project.recipe_mut().qs_to_g.as_mut() {
            let speed = (*size * 0.002).max(0.1);
            checked_drag(
                ui,
                size,
                |d| d.range(0.001..=BATCH.max).speed(speed),
                Field {
                    name: "Batch size",
                    hint: "The whole batch in grams; water fills what the other lines leave",
                },
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

/// The effect in the words used everywhere; no colour, so none is spent on it.
fn effect_text(effect: Effect) -> RichText {
    let text = RichText::new(effect.words());
    match effect {
        Effect::Acidifies | Effect::Basifies => text.strong(),
        Effect::Neutral => text.weak(),
    }
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
            for (i, line) in project.recipe().lines.iter().enumerate() {
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
                        ui.label(effect_text(effect.effect));
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

fn picker_ui(
    ui: &mut Ui,
    in_percent: bool,
    library: &Library,
    query: &mut String,
    commands: &mut Vec<Command>,
) {
    ui.label(RichText::new("Add an ingredient").strong());
    let label = ui.label("Search the library");
    ui.add(
        egui::TextEdit::singleline(query)
            .hint_text("e.g. citric, NaOH, phosphate")
            .desired_width(f32::INFINITY),
    )
    .labelled_by(label.id)
    .on_hover_text("Part of a name, a formula or a command-line id; matches are listed below");
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
                        let amount = if in_percent {
                            Amount {
                                value: 1.0,
                                unit: Unit::Percent,
                            }
                        } else {
                            Amount::grams(1.0)
                        };
                        commands.push(Command::Edit(RecipeEdit::AddLine(RecipeLine {
                            ingredient: e.ingredient.id.clone(),
                            amount,
                            enabled: true,
                        })));
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
