//! Buffer design: choose an acid form and a salt form of one system, a target pH and a target
//! buffer capacity, and get the grams of both with the rest of the recipe present.

use egui::{DragValue, RichText, Role, Ui};
use saltwise_chem::design::{Design, single_system};
use saltwise_chem::project::Project;
use saltwise_chem::{Library, Recipe};

use super::sig;
use crate::command::{Command, VariantEdit};
use crate::engine::Engine;

/// The design form: what was chosen and the last answer, with the recipe it was worked out for.
#[derive(Debug, Clone, PartialEq)]
pub struct DesignForm {
    /// Ingredient id of the acid form ("" until chosen).
    pub acid: String,
    /// Ingredient id of the salt form ("" until chosen).
    pub base: String,
    /// Target pH.
    pub target_ph: f64,
    /// Target buffer capacity, mol/kg water per pH.
    pub capacity: f64,
    /// The last answer and the recipe it was worked out on.
    pub answer: Option<(Recipe, Result<Design, String>)>,
}

impl Default for DesignForm {
    fn default() -> Self {
        Self {
            acid: String::new(),
            base: String::new(),
            target_ph: 5.5,
            capacity: 0.02,
            answer: None,
        }
    }
}

/// Draws the design section, closed until asked for.
pub fn design_ui(
    ui: &mut Ui,
    project: &Project,
    engine: &Engine,
    form: &mut DesignForm,
    commands: &mut Vec<Command>,
) {
    egui::CollapsingHeader::new("Buffer design")
        .id_salt("design_section")
        .default_open(false)
        .show(ui, |ui| {
            let Ok(library) = engine.library() else {
                return;
            };
            ui.weak("Grams of an acid form and a salt form of one system for a target pH and buffer capacity, with the rest of the recipe present (lines of the two are replaced).");
            pickers_ui(ui, library, form);
            ui.horizontal_wrapped(|ui| {
                ui.label("Target pH");
                let ph = ui.add(DragValue::new(&mut form.target_ph).range(0.0..=14.0).speed(0.01).max_decimals(2));
                super::name_drag(ph, form.target_ph, "Design target pH");
                ui.label("Capacity");
                let cap = ui.add(
                    DragValue::new(&mut form.capacity)
                        .range(1e-5..=5.0)
                        .speed(0.001)
                        .max_decimals(4),
                );
                super::name_drag(cap, form.capacity, "Design buffer capacity")
                    .on_hover_text("Buffer capacity at the target pH, mol/kg water per pH");
                ui.label("mol/kg per pH");
            });
            let ready = !form.acid.is_empty() && !form.base.is_empty();
            let work = ui.add_enabled(ready, egui::Button::new("Work out amounts"));
            if work.clicked() {
                let answer = engine.design_buffer(
                    project.recipe(),
                    &form.acid,
                    &form.base,
                    form.target_ph,
                    form.capacity,
                );
                form.answer = Some((project.recipe().clone(), answer));
            }
            answer_ui(ui, project, library, form, commands);
        });
}

fn name_of(library: &Library, id: &str) -> String {
    library
        .entry(id)
        .map_or_else(|| id.to_owned(), |e| e.ingredient.name.clone())
}

fn pickers_ui(ui: &mut Ui, library: &Library, form: &mut DesignForm) {
    let one_system: Vec<(&str, usize, u32)> = library
        .entries()
        .iter()
        .filter_map(|e| {
            single_system(library, &e.ingredient.id)
                .map(|(s, _, f)| (e.ingredient.id.as_str(), s, f))
        })
        .collect();
    let chosen_acid = one_system
        .iter()
        .find(|(id, _, _)| *id == form.acid)
        .copied();
    ui.horizontal_wrapped(|ui| {
        ui.label("Acid form");
        let text = if form.acid.is_empty() {
            "choose…".to_owned()
        } else {
            name_of(library, &form.acid)
        };
        let r = egui::ComboBox::from_id_salt("design_acid")
            .selected_text(text)
            .width(220.0)
            .show_ui(ui, |ui| {
                for (id, _, _) in &one_system {
                    if ui
                        .selectable_label(form.acid == *id, name_of(library, id))
                        .clicked()
                    {
                        form.acid = (*id).to_owned();
                        form.base.clear();
                        form.answer = None;
                    }
                }
            })
            .response;
        super::name_widget(r, Role::ComboBox, "Design acid form");
        ui.label("Salt form");
        let text = if form.base.is_empty() {
            "choose…".to_owned()
        } else {
            name_of(library, &form.base)
        };
        let r = egui::ComboBox::from_id_salt("design_base")
            .selected_text(text)
            .width(220.0)
            .show_ui(ui, |ui| {
                let Some((_, system, acid_form)) = chosen_acid else {
                    ui.weak("Choose the acid form first");
                    return;
                };
                for (id, s, f) in &one_system {
                    if *s == system
                        && *f > acid_form
                        && ui
                            .selectable_label(form.base == *id, name_of(library, id))
                            .clicked()
                    {
                        form.base = (*id).to_owned();
                        form.answer = None;
                    }
                }
            })
            .response;
        super::name_widget(r, Role::ComboBox, "Design salt form")
            .on_hover_text("Only less protonated forms of the acid form's system are offered");
    });
}

fn answer_ui(
    ui: &mut Ui,
    project: &Project,
    library: &Library,
    form: &DesignForm,
    commands: &mut Vec<Command>,
) {
    let Some((recipe, answer)) = &form.answer else {
        return;
    };
    match answer {
        Err(why) => {
            ui.colored_label(super::WARN, crate::messages::sentence(why));
        }
        Ok(d) => {
            ui.label(
                RichText::new(format!(
                    "{} g of {} and {} g of {}: pH {:.2}, buffer capacity {} mol/kg water per pH",
                    sig(d.acid_g, 4),
                    name_of(library, &form.acid),
                    sig(d.base_g, 4),
                    name_of(library, &form.base),
                    d.ph,
                    sig(d.buffer_capacity, 3)
                ))
                .strong()
                .color(super::TARGET),
            );
            if recipe != project.recipe() {
                ui.weak("The recipe has changed since: work out again to use it.");
            } else if ui
                .button("Put these amounts into the recipe")
                .on_hover_text("One step you can undo")
                .clicked()
            {
                commands.push(Command::Variant(VariantEdit::UseDesign {
                    pair: [(form.acid.clone(), d.acid_g), (form.base.clone(), d.base_g)],
                }));
            }
        }
    }
}
