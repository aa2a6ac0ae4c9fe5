//! The custom-ingredient form: a weak acid (or its salt) with formula, pKa values and source,
//! added to the project's own library.

use egui::{RichText, Ui};
use saltwise_chem::Library;
use saltwise_chem::formula::Formula;
use saltwise_chem::library::{Ingredient, Release, System};

use crate::command::{Command, RecipeEdit};

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
    library: &Library,
    form: &mut CustomForm,
    commands: &mut Vec<Command>,
) {
    egui::CollapsingHeader::new("Custom ingredient (a weak acid)")
        .default_open(false)
        .show(ui, |ui| {
            ui.label(
                RichText::new("A neutral weak acid as supplied; its pKa values at 25 °C, strongest first, and where they come from.")
                    .weak(),
            );
            let checks = Checks::of(form, library);
            egui::Grid::new("custom_form").spacing([8.0, 4.0]).show(ui, |ui| {
                field(ui, "Name", &mut form.name, "e.g. sorbic acid", checks.name.err());
                field(ui, "Formula", &mut form.formula, "e.g. C6H8O2", checks.formula.err());
                field(ui, "pKa values", &mut form.pka, "e.g. 4.76", checks.pka.err());
                field(ui, "Assay %", &mut form.assay_percent, "100", checks.assay.err());
                field(ui, "Source", &mut form.source, "where the pKa values come from", None);
            });
            if ui.button("Add to the project").clicked() {
                match build(form, library) {
                    Ok((system, ingredient)) => {
                        commands.push(Command::Edit(RecipeEdit::AddCustom {
                            system,
                            ingredient: Box::new(ingredient),
                        }));
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

/// What is wrong with each field as typed so far (an empty field is not yet wrong).
struct Checks {
    name: Result<(), String>,
    formula: Result<(), String>,
    pka: Result<(), String>,
    assay: Result<(), String>,
}

impl Checks {
    fn of(form: &CustomForm, library: &Library) -> Self {
        let typed = |text: &str| !text.trim().is_empty();
        Self {
            name: if typed(&form.name) {
                check_name(&form.name, library).map(drop)
            } else {
                Ok(())
            },
            formula: if typed(&form.formula) {
                check_formula(&form.formula)
            } else {
                Ok(())
            },
            pka: if typed(&form.pka) {
                check_pka(&form.pka).map(drop)
            } else {
                Ok(())
            },
            assay: check_assay(&form.assay_percent).map(drop),
        }
    }
}

/// The display name and the id made from it, if it is free.
fn check_name(text: &str, library: &Library) -> Result<(String, String), String> {
    let name = text.trim();
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
    Ok((name.to_owned(), id))
}

/// The formula parser's own message, with the position of the problem.
fn check_formula(text: &str) -> Result<(), String> {
    if text.trim().is_empty() {
        return Err("give the formula of the acid form, e.g. C6H8O2".into());
    }
    Formula::parse(text.trim())
        .map(drop)
        .map_err(|e| e.to_string())
}

/// pKa values between −5 and 20, each step larger than the one before.
fn check_pka(text: &str) -> Result<Vec<f64>, String> {
    let mut pka: Vec<f64> = Vec::new();
    for part in text.split([',', ' ', ';']).filter(|p| !p.trim().is_empty()) {
        let part = part.trim();
        let v = saltwise_chem::limits::parse_number(part)
            .filter(|v| v.is_finite())
            .ok_or_else(|| format!("pKa '{part}' is not a number"))?;
        if !saltwise_chem::limits::PKA.allows(v) {
            return Err(format!(
                "pKa {part} is outside −5…20, the range a pKa can have here"
            ));
        }
        if let Some(&before) = pka.last()
            && v <= before
        {
            return Err(format!(
                "pKa {part} is not above {before}: give the steps in order, strongest acid first (ascending)"
            ));
        }
        pka.push(v);
    }
    if pka.is_empty() {
        return Err("give at least one pKa value".into());
    }
    Ok(pka)
}

/// The assay as a mass fraction: above 0 and at most 100 % (blank means 100 %).
fn check_assay(text: &str) -> Result<f64, String> {
    let t = text.trim().trim_end_matches('%').trim();
    if t.is_empty() {
        return Ok(1.0);
    }
    let a = saltwise_chem::limits::parse_number(t)
        .filter(|a| a.is_finite())
        .ok_or_else(|| format!("assay '{t}' is not a number"))?;
    if a <= 0.0 || a > 100.0 {
        return Err(format!(
            "assay {t} % refused: it is the share of the acid in the material as supplied, above 0 and at most 100 %"
        ));
    }
    Ok(a / 100.0)
}

fn field(ui: &mut Ui, label: &str, value: &mut String, hint: &str, problem: Option<String>) {
    let l = ui.label(label);
    ui.add(
        egui::TextEdit::singleline(value)
            .hint_text(hint)
            .desired_width(240.0),
    )
    .labelled_by(l.id);
    match problem {
        Some(p) => ui.label(RichText::new(p).color(super::ERROR).small()),
        None => ui.label(""),
    };
    ui.end_row();
}

/// Checks the form and builds the system and ingredient it describes.
fn build(form: &CustomForm, library: &Library) -> Result<(System, Ingredient), String> {
    let (name, id) = check_name(&form.name, library)?;
    let name = name.as_str();
    check_formula(&form.formula)?;
    let pka = check_pka(&form.pka)?;
    let assay = check_assay(&form.assay_percent)?;
    if form.source.trim().is_empty() {
        return Err(
            "say where the pKa values come from (a handbook, a paper, a data sheet)".into(),
        );
    }
    let system = System {
        id: id.clone(),
        name: name.to_owned(),
        charge_of_fully_protonated: 0,
        forms: Vec::new(),
        dh_kj_mol: vec![0.0; pka.len()],
        pka,
        dcp_j_mol_k: Vec::new(),
        pka_ionic_strength: 0.0,
        pka_ionic_strengths: Vec::new(),
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
            ..Default::default()
        })
        .map_err(|e| e.to_string())?;
    Ok((system, ingredient))
}
