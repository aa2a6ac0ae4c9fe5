//! The custom-ingredient form: a weak acid (or its salt) with formula, pKa values and source,
//! added to the project's own library.

use egui::{RichText, Ui};
use saltwise_chem::Library;
use saltwise_chem::library::{Ingredient, Release, System};
use saltwise_chem::project::Project;

/// What has been typed into the form.
#[derive(Debug, Clone, Default)]
pub struct CustomForm {
    /// Display name.
    pub name: String,
    /// Formula of the acid form.
    pub formula: String,
    /// pKa values, separated by spaces or commas.
    pub pka: String,
    /// Where the constants come from.
    pub source: String,
    /// Assay, % (blank means 100).
    pub assay_percent: String,
    /// The last problem found, shown under the form.
    pub problem: Option<String>,
}

/// Draws the form.
pub fn custom_ingredient_ui(
    ui: &mut Ui,
    project: &mut Project,
    library: &Library,
    form: &mut CustomForm,
) {
    egui::CollapsingHeader::new("Custom ingredient (a weak acid)")
        .default_open(false)
        .show(ui, |ui| {
            ui.label(
                RichText::new("A neutral weak acid as supplied; its pKa values at 25 °C, strongest first, and where they come from.")
                    .weak(),
            );
            egui::Grid::new("custom_form").spacing([8.0, 4.0]).show(ui, |ui| {
                field(ui, "Name", &mut form.name, "e.g. sorbic acid");
                field(ui, "Formula", &mut form.formula, "e.g. C6H8O2");
                field(ui, "pKa values", &mut form.pka, "e.g. 4.76");
                field(ui, "Assay %", &mut form.assay_percent, "100");
                field(ui, "Source", &mut form.source, "where the pKa values come from");
            });
            if ui.button("Add to the project").clicked() {
                match build(form, library) {
                    Ok((system, ingredient)) => {
                        let id = ingredient.id.clone();
                        project.custom.systems.push(system);
                        project.custom.ingredients.push(ingredient);
                        project.recipe.lines.push(saltwise_chem::RecipeLine::grams(&id, 1.0));
                        *form = CustomForm::default();
                    }
                    Err(e) => form.problem = Some(e),
                }
            }
            if let Some(p) = &form.problem {
                ui.colored_label(super::ERROR, p);
            }
        });
}

fn field(ui: &mut Ui, label: &str, value: &mut String, hint: &str) {
    let l = ui.label(label);
    ui.add(
        egui::TextEdit::singleline(value)
            .hint_text(hint)
            .desired_width(240.0),
    )
    .labelled_by(l.id);
    ui.end_row();
}

/// Checks the form and builds the system and ingredient it describes.
fn build(form: &CustomForm, library: &Library) -> Result<(System, Ingredient), String> {
    let name = form.name.trim();
    if name.is_empty() {
        return Err("give the ingredient a name".into());
    }
    let id: String = name
        .to_lowercase()
        .chars()
        .map(|c| if c.is_ascii_alphanumeric() { c } else { '_' })
        .collect();
    let id = format!("custom_{}", id.trim_matches('_'));
    if library.entry_index(&id).is_some() || library.system_index(&id).is_some() {
        return Err(format!("'{name}' is already in the library"));
    }
    let mut pka = Vec::new();
    for part in form
        .pka
        .split([',', ' ', ';'])
        .filter(|p| !p.trim().is_empty())
    {
        let v: f64 = part
            .trim()
            .parse()
            .map_err(|_| format!("pKa '{part}' is not a number"))?;
        pka.push(v);
    }
    if pka.is_empty() {
        return Err("give at least one pKa value".into());
    }
    if form.source.trim().is_empty() {
        return Err(
            "say where the pKa values come from (a handbook, a paper, a data sheet)".into(),
        );
    }
    let assay = if form.assay_percent.trim().is_empty() {
        1.0
    } else {
        let a: f64 = form
            .assay_percent
            .trim()
            .trim_end_matches('%')
            .trim()
            .parse()
            .map_err(|_| format!("assay '{}' is not a number", form.assay_percent))?;
        a / 100.0
    };
    let system = System {
        id: id.clone(),
        name: name.to_owned(),
        charge_of_fully_protonated: 0,
        forms: Vec::new(),
        dh_kj_mol: vec![0.0; pka.len()],
        pka,
        dcp_j_mol_k: Vec::new(),
        pka_ionic_strength: 0.0,
        source: form.source.trim().to_owned(),
    };
    let ingredient = Ingredient {
        id: id.clone(),
        name: name.to_owned(),
        formula: form.formula.trim().to_owned(),
        assay,
        releases: vec![Release::System {
            id: id.clone(),
            count: 1,
            form: 0,
        }],
        water_per_formula: None,
        hazards: Vec::new(),
        note: format!("custom: {}", form.source.trim()),
    };
    // Validate against a copy so a bad entry never reaches the project.
    let mut trial = library.clone();
    trial
        .extend(saltwise_chem::library::LibraryData {
            systems: vec![system.clone()],
            ions: Vec::new(),
            ingredients: vec![ingredient.clone()],
        })
        .map_err(|e| e.to_string())?;
    Ok((system, ingredient))
}
