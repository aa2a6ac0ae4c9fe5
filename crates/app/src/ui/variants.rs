//! Variants of the recipe: the bar that chooses, copies, renames and removes them, the prices of
//! the current one's ingredients, and the comparison of all of them side by side with their
//! dose curves overlaid.

use egui::{RichText, Role, Ui};
use egui_plot::{Corner, Legend, Line, Plot};
use saltwise_chem::Library;
use saltwise_chem::limits::PRICE_PER_KG;
use saltwise_chem::project::Project;

use super::{PanelState, VARIANT, named_button, sig};
use crate::command::{Command, VariantEdit};
use crate::engine::Engine;

/// Height of the overlaid dose curves, points.
const OVERLAY_HEIGHT: f32 = 220.0;

/// The colour of variant `k` on the overlay and in the table.
pub fn variant_color(k: usize) -> egui::Color32 {
    VARIANT[k % VARIANT.len()]
}

/// The bar above the recipe: which variant is shown, and New / Rename / Remove.
pub fn variant_bar_ui(
    ui: &mut Ui,
    project: &Project,
    panels: &mut PanelState,
    commands: &mut Vec<Command>,
) {
    let current = project.current();
    ui.horizontal_wrapped(|ui| {
        ui.label("Variant");
        let response = egui::ComboBox::from_id_salt("variant_choice")
            .selected_text(&project.variant().name)
            .width(200.0)
            .show_ui(ui, |ui| {
                for (k, v) in project.variants().iter().enumerate() {
                    if ui.selectable_label(k == current, &v.name).clicked() && k != current {
                        commands.push(Command::Variant(VariantEdit::MakeCurrent(k)));
                    }
                }
            })
            .response;
        super::name_widget(response, Role::ComboBox, "Current variant").on_hover_text(
            "The recipe below is this variant's; the others keep theirs and are compared under Compare variants",
        );
        if named_button(ui, "New variant", "New variant")
            .on_hover_text("A copy of this variant under a new name, made current")
            .clicked()
        {
            commands.push(Command::Variant(VariantEdit::CopyCurrent));
        }
        if panels.renaming.is_none()
            && named_button(ui, "Rename…", "Rename variant")
                .on_hover_text("Give this variant another name")
                .clicked()
        {
            panels.renaming = Some(project.variant().name.clone());
        }
        let alone = project.variants().len() <= 1;
        let remove = ui
            .add_enabled_ui(!alone, |ui| named_button(ui, "Remove", "Remove variant"))
            .inner;
        let remove = if alone {
            remove.on_disabled_hover_text("A project keeps at least one variant")
        } else {
            remove.on_hover_text("Remove this variant (Undo brings it back)")
        };
        if remove.clicked() {
            commands.push(Command::Variant(VariantEdit::Remove(current)));
        }
    });
    let mut done = false;
    if let Some(name) = &mut panels.renaming {
        let name: &mut String = name;
        ui.horizontal_wrapped(|ui| {
            let field = ui.add(egui::TextEdit::singleline(&mut *name).desired_width(200.0));
            let field = super::name_widget(field, Role::TextInput, "New variant name");
            let enter = field.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter));
            if ui.button("OK").clicked() || enter {
                commands.push(Command::Variant(VariantEdit::Rename {
                    index: current,
                    name: name.clone(),
                }));
                done = true;
            }
            if ui.button("Cancel").clicked() {
                done = true;
            }
        });
    }
    if done {
        panels.renaming = None;
    }
}

/// The prices per kg of the current variant's ingredients, and its cost per kg of product.
pub fn prices_ui(
    ui: &mut Ui,
    project: &Project,
    engine: &Engine,
    library: &Library,
    panels: &mut PanelState,
    commands: &mut Vec<Command>,
) {
    egui::CollapsingHeader::new("Prices")
        .id_salt("prices_section")
        .default_open(false)
        .show(ui, |ui| {
            ui.weak(
                "Price per kg of each ingredient as bought, in any one currency. Leave empty for no price; water counts as free unless priced.",
            );
            let mut ids: Vec<&str> = Vec::new();
            for l in &project.recipe().lines {
                if !ids.contains(&l.ingredient.as_str()) {
                    ids.push(&l.ingredient);
                }
            }
            egui::Grid::new("prices_grid")
                .spacing([8.0, 4.0])
                .show(ui, |ui| {
                    for id in ids {
                        let name = library
                            .entry(id)
                            .map_or_else(|| id.to_owned(), |e| e.ingredient.name.clone());
                        ui.label(&name);
                        price_field(ui, project, id, &name, panels, commands);
                        ui.end_row();
                    }
                });
            let row = engine
                .variant_rows()
                .nth(project.current())
                .and_then(|r| r.summary.as_ref().ok());
            if let Some(s) = row {
                ui.label(RichText::new(cost_text(s)).strong());
            }
        });
}

fn price_field(
    ui: &mut Ui,
    project: &Project,
    id: &str,
    name: &str,
    panels: &mut PanelState,
    commands: &mut Vec<Command>,
) {
    let saved = project.variant().prices.get(id).copied();
    let label = format!("Price per kg of {name}");
    let text = panels
        .price_text
        .entry(id.to_owned())
        .or_insert_with(|| saved.map(|p| p.to_string()).unwrap_or_default());
    let field = ui.add(egui::TextEdit::singleline(text).desired_width(90.0));
    let field = super::name_widget(field, Role::TextInput, &label);
    if !field.has_focus() && !field.lost_focus() {
        // Follows undo and variant changes while not being typed into.
        *text = saved.map(|p| p.to_string()).unwrap_or_default();
    }
    if field.lost_focus() {
        let typed = text.trim().to_owned();
        if typed.is_empty() {
            panels.refused.remove(&label);
            if saved.is_some() {
                commands.push(Command::Variant(VariantEdit::SetPrice {
                    ingredient: id.to_owned(),
                    price_per_kg: None,
                }));
            }
        } else {
            match PRICE_PER_KG.check_text_as(&typed, &label.to_lowercase()) {
                Ok(price) => {
                    panels.refused.remove(&label);
                    if saved != Some(price) {
                        commands.push(Command::Variant(VariantEdit::SetPrice {
                            ingredient: id.to_owned(),
                            price_per_kg: Some(price),
                        }));
                    }
                }
                Err(e) => {
                    panels.refused.insert(label.clone(), e.to_string());
                }
            }
        }
    }
    if let Some(why) = panels.refused.get(&label) {
        ui.label(
            RichText::new(crate::messages::sentence(why))
                .color(super::ERROR)
                .small(),
        );
    }
}

fn cost_text(s: &saltwise_chem::variant::Summary) -> String {
    match s.cost_per_kg {
        Some(c) => format!("Cost per kg of product: {}", sig(c, 4)),
        None => format!(
            "Cost per kg of product: not known, no price for {}",
            s.missing_prices.join(", ")
        ),
    }
}

/// The comparison: one row per variant and their dose curves on one chart.
pub fn compare_ui(ui: &mut Ui, project: &Project, engine: &Engine, commands: &mut Vec<Command>) {
    let n = project.variants().len();
    egui::CollapsingHeader::new(format!("Compare variants ({n})"))
        // One state for a single variant and one for several: a second variant opens it.
        .id_salt(("compare_section", n > 1))
        .default_open(n > 1)
        .show(ui, |ui| {
            if n < 2 {
                ui.weak("Only one variant. “New variant” above the recipe copies it, so an alternative can be changed and compared here.");
            }
            table_ui(ui, project, engine, commands);
            overlay_ui(ui, project, engine);
        });
}

fn table_ui(ui: &mut Ui, project: &Project, engine: &Engine, commands: &mut Vec<Command>) {
    egui::ScrollArea::horizontal()
        .id_salt("compare_scroll")
        .show(ui, |ui| {
            egui::Grid::new("compare_grid")
                .striped(true)
                .spacing([12.0, 4.0])
                .show(ui, |ui| {
                    for (h, tip) in [
                        ("Variant", ""),
                        ("pH", "Activity scale, as a meter reads"),
                        ("p[H]", "−log of the hydrogen-ion molality"),
                        (
                            "β",
                            "Buffer capacity at the product pH, mol/kg water per pH",
                        ),
                        ("I", "Ionic strength, mol/kg water"),
                        (
                            "Buffer g/kg",
                            "Grams of buffer-forming ingredients per kg of product",
                        ),
                        ("Cost/kg", "From the prices per kg of the ingredients"),
                        ("Cautions", "How many, and which"),
                        ("", ""),
                    ] {
                        let l = ui.label(RichText::new(h).strong());
                        if !tip.is_empty() {
                            l.on_hover_text(tip);
                        }
                    }
                    ui.end_row();
                    for (k, (v, row)) in project
                        .variants()
                        .iter()
                        .zip(engine.variant_rows())
                        .enumerate()
                    {
                        let current = k == project.current();
                        let name = RichText::new(&v.name).color(variant_color(k));
                        ui.label(if current { name.strong() } else { name });
                        match &row.summary {
                            Ok(s) => {
                                ui.label(format!("{:.2}", s.ph));
                                ui.label(format!("{:.2}", s.p_h_conc));
                                ui.label(sig(s.buffer_capacity, 3));
                                ui.label(sig(s.ionic_strength, 3));
                                ui.label(sig(s.buffer_forming_g_per_kg, 3));
                                match s.cost_per_kg {
                                    Some(c) => ui.label(sig(c, 4)),
                                    None => ui.weak("—").on_hover_text(format!(
                                        "No price for {}",
                                        s.missing_prices.join(", ")
                                    )),
                                };
                                let count = ui.label(s.cautions.len().to_string());
                                if !s.cautions.is_empty() {
                                    count.on_hover_text(s.cautions.join("\n"));
                                }
                            }
                            Err(e) => {
                                ui.colored_label(super::ERROR, "not solved")
                                    .on_hover_text(crate::messages::sentence(e));
                                for _ in 0..6 {
                                    ui.label("");
                                }
                            }
                        }
                        if current {
                            ui.weak("current");
                        } else if named_button(
                            ui,
                            "Make current",
                            &format!("Make {} current", v.name),
                        )
                        .on_hover_text("Show and edit this variant's recipe")
                        .clicked()
                        {
                            commands.push(Command::Variant(VariantEdit::MakeCurrent(k)));
                        }
                        ui.end_row();
                    }
                });
        });
    let kinds: Vec<String> = engine
        .variant_rows()
        .filter_map(|r| r.summary.as_ref().ok())
        .flat_map(|s| s.cautions.iter().cloned())
        .fold(Vec::new(), |mut all, c| {
            if !all.contains(&c) {
                all.push(c);
            }
            all
        });
    if !kinds.is_empty() {
        ui.label(format!(
            "Cautions among the variants: {}.",
            kinds.join("; ")
        ));
    }
}

fn overlay_ui(ui: &mut Ui, project: &Project, engine: &Engine) {
    let adjuster = engine
        .library()
        .ok()
        .and_then(|l| l.entry(&project.settings.adjuster))
        .map_or_else(
            || project.settings.adjuster.clone(),
            |e| e.ingredient.name.clone(),
        );
    let problems: Vec<String> = project
        .variants()
        .iter()
        .zip(engine.variant_rows())
        .filter_map(|(v, r)| r.curve.as_ref().err().map(|e| format!("{}: {e}", v.name)))
        .collect();
    Plot::new("variants_plot")
        .height(OVERLAY_HEIGHT)
        .x_axis_label(format!("Dose of {adjuster}, g"))
        .y_axis_label("pH")
        .legend(Legend::default().position(Corner::LeftTop))
        .include_x(0.0)
        .allow_drag(false)
        .allow_zoom(false)
        .allow_scroll(false)
        .show(ui, |plot| {
            for (k, (v, row)) in project
                .variants()
                .iter()
                .zip(engine.variant_rows())
                .enumerate()
            {
                if let Ok(points) = &row.curve {
                    let width = if k == project.current() { 3.0 } else { 2.0 };
                    plot.line(
                        Line::new(v.name.clone(), points.as_slice())
                            .width(width)
                            .color(variant_color(k)),
                    );
                }
            }
        });
    for p in problems {
        ui.colored_label(super::WARN, format!("No curve for {p}"));
    }
}
