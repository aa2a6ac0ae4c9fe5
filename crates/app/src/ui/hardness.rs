//! Hard water, ions and scale: the hardness of the recipe's water, the free calcium and
//! magnesium, the chelants' capacity, the saturation of scale-forming solids, and every ion
//! with its activity coefficient.

use egui::{RichText, Role, Ui};
use saltwise_chem::limits::{CALCIUM_SHARE, HARDNESS_PPM};
use saltwise_chem::precipitation::Precipitation;
use saltwise_chem::project::Project;
use saltwise_chem::recipe::{Hardness, HardnessAnion};
use saltwise_chem::report::Report;

use super::{Field, Refusals, checked_drag, sig};
use crate::engine::Engine;

/// Saturation index above which a solid is shown as a scale risk.
const SCALE_SI: f64 = saltwise_chem::hazard::SCALE_SI;

/// One line for the readout: free Ca²⁺ and Mg²⁺ and the highest saturation index, when the
/// recipe holds calcium or magnesium.
pub fn summary(report: &Report) -> Option<String> {
    let sp = &report.speciation;
    let (ca, mg) = (sp.free("calcium"), sp.free("magnesium"));
    if ca <= 0.0 && mg <= 0.0 {
        return None;
    }
    let mut text = format!(
        "Free Ca²⁺ {} mmol/kg water · free Mg²⁺ {} mmol/kg water",
        sig(ca * 1e3, 3),
        sig(mg * 1e3, 3)
    );
    if let Some(top) = sp
        .saturation
        .iter()
        .max_by(|a, b| a.saturation_index.total_cmp(&b.saturation_index))
    {
        text += &format!(
            " · highest saturation: {} {:+.2}",
            top.solid.replace('_', " "),
            top.saturation_index
        );
    }
    Some(text)
}

/// Draws the section, closed until asked for.
pub fn hardness_ui(ui: &mut Ui, project: &mut Project, engine: &Engine, refused: &mut Refusals) {
    egui::CollapsingHeader::new("Hard water, ions and scale")
        .id_salt("hardness_section")
        .default_open(false)
        .show(ui, |ui| {
            water_ui(ui, project, refused);
            ui.checkbox(
                &mut project.settings.precipitate,
                "Let supersaturated solids settle out",
            )
            .on_hover_text(
                "Solids above saturation leave the solution until saturated; the readout lists them and the pH left. The dose curve and sweeps do not precipitate.",
            );
            if let Some(report) = engine.solved() {
                ui.separator();
                if let Some(p) = engine.settled() {
                    settled_ui(ui, report, p);
                }
                results_ui(ui, report);
            }
        });
}

fn water_ui(ui: &mut Ui, project: &mut Project, refused: &mut Refusals) {
    let recipe = project.recipe_mut();
    let mut hard = recipe.water_hardness.is_some();
    if ui
        .checkbox(&mut hard, "Made with hard water")
        .on_hover_text("The water lines and the q.s. water carry calcium and magnesium")
        .changed()
    {
        recipe.water_hardness = hard.then(|| Hardness::ppm(250.0));
    }
    let Some(h) = recipe.water_hardness.as_mut() else {
        ui.weak("Purified water: no calcium or magnesium from the water.");
        return;
    };
    egui::Grid::new("hardness_grid")
        .spacing([8.0, 4.0])
        .show(ui, |ui| {
            ui.label("Hardness");
            ui.horizontal(|ui| {
                checked_drag(
                    ui,
                    &mut h.ppm_caco3,
                    |d| {
                        d.range(HARDNESS_PPM.min..=HARDNESS_PPM.max)
                            .speed(2.0)
                            .max_decimals(0)
                    },
                    Field {
                        name: "Water hardness",
                        hint: "Calcium plus magnesium, mg per kg of water as CaCO₃ (ppm as CaCO₃)",
                    },
                    HARDNESS_PPM,
                    refused,
                );
                ui.label("ppm as CaCO₃");
            });
            ui.end_row();
            ui.label("Calcium share");
            checked_drag(
                ui,
                &mut h.calcium_share,
                |d| d.range(0.0..=1.0).speed(0.01).max_decimals(2),
                Field {
                    name: "Calcium share",
                    hint: "Mol fraction of the hardness that is calcium; the rest is magnesium",
                },
                CALCIUM_SHARE,
                refused,
            );
            ui.end_row();
            ui.label("Comes with");
            let r = egui::ComboBox::from_id_salt("hardness_anion")
                .selected_text(anion_words(h.anion))
                .show_ui(ui, |ui| {
                    for a in [HardnessAnion::HydrogenCarbonate, HardnessAnion::Chloride] {
                        ui.selectable_value(&mut h.anion, a, anion_words(a));
                    }
                })
                .response;
            super::name_widget(r, Role::ComboBox, "Hardness comes with");
            ui.end_row();
        });
}

/// One line for the readout: the solids that settle out and the pH left, when precipitation is on.
pub fn settled_summary(report: &Report, p: &Precipitation) -> String {
    if p.formed.is_empty() {
        return "Settling: no solid is above saturation".into();
    }
    let per_product = water_per_product(report);
    let list: Vec<String> = p
        .formed
        .iter()
        .map(|f| match f.g_per_kg_water() {
            Some(g) => format!(
                "{} {} g/kg",
                f.solid.replace('_', " "),
                sig(g * per_product, 3)
            ),
            None => format!(
                "{} {} mmol/kg water",
                f.solid.replace('_', " "),
                sig(f.mol_per_kg_water * 1e3, 3)
            ),
        })
        .collect();
    format!(
        "Settles out: {} of product · pH left {:.2}{}",
        list.join(", "),
        p.solution.ph,
        if p.converged { "" } else { " (not converged)" }
    )
}

/// kg of water per kg of product.
fn water_per_product(report: &Report) -> f64 {
    report.batch.totals.water_kg / (report.batch.total_mass_g * 1e-3)
}

fn settled_ui(ui: &mut Ui, report: &Report, p: &Precipitation) {
    ui.label(RichText::new(settled_summary(report, p)).strong());
    if p.formed.is_empty() {
        return;
    }
    let per_product = water_per_product(report);
    egui::Grid::new("settled_grid")
        .spacing([12.0, 2.0])
        .striped(true)
        .show(ui, |ui| {
            ui.strong("solid formed");
            ui.strong("mmol/kg water");
            ui.strong("g per kg of product");
            ui.end_row();
            for f in &p.formed {
                ui.label(&f.name);
                ui.label(sig(f.mol_per_kg_water * 1e3, 3));
                ui.label(
                    f.g_per_kg_water()
                        .map_or_else(|| "—".into(), |g| sig(g * per_product, 3)),
                );
                ui.end_row();
            }
        });
    ui.weak(format!(
        "Left in solution: pH {:.2}, ionic strength {} mol/kg water. The saturation below is of the recipe as made.",
        p.solution.ph,
        sig(p.solution.ionic_strength, 3)
    ));
}

fn anion_words(a: HardnessAnion) -> &'static str {
    match a {
        HardnessAnion::HydrogenCarbonate => "hydrogen carbonate (natural water)",
        HardnessAnion::Chloride => "chloride (no alkalinity)",
    }
}

fn results_ui(ui: &mut Ui, report: &Report) {
    let sp = &report.speciation;
    if let Some(text) = summary(report) {
        ui.label(text);
    }
    if let Some(cap) = report.capacity.as_ref().filter(|c| !c.chelants.is_empty()) {
        ui.label(RichText::new(format!(
            "Chelant capacity at this pH: {} ppm hardness as CaCO₃ of product",
            sig(cap.ppm_caco3, 3)
        )).strong())
        .on_hover_text("The calcium the ligands hold at the recipe's pH while the free Ca²⁺ stays at 10 µmol/kg (about 1 ppm as CaCO₃), calcium alone");
        for c in &cap.chelants {
            ui.label(format!(
                "{}: {} ppm · {:.0} % bound in the recipe as made",
                c.system,
                sig(c.capacity_ppm, 3),
                c.bound_fraction * 100.0
            ));
        }
    }
    if !sp.saturation.is_empty() {
        ui.label(RichText::new("Saturation index (log of ion activity product over Ksp)").strong());
        egui::Grid::new("saturation_grid")
            .spacing([12.0, 2.0])
            .show(ui, |ui| {
                for x in &sp.saturation {
                    ui.label(x.solid.replace('_', " "));
                    let text = format!("{:+.2}", x.saturation_index);
                    if x.saturation_index > SCALE_SI {
                        ui.colored_label(super::WARN, format!("{text} can deposit"));
                    } else {
                        ui.label(text);
                    }
                    ui.end_row();
                }
            });
    }
    if !sp.complexes.is_empty() {
        let mut list: Vec<_> = sp.complexes.iter().collect();
        list.sort_by(|a, b| b.molality.total_cmp(&a.molality));
        ui.label(RichText::new("Largest complexes").strong());
        for c in list.iter().take(8) {
            ui.label(format!(
                "{} ({} with {}): {} mmol/kg water",
                c.id.replace('_', " "),
                c.metal,
                c.ligand,
                sig(c.molality * 1e3, 3)
            ));
        }
    }
    egui::CollapsingHeader::new(format!("Every ion ({} activity model)", report.solution.activity.label()))
        .id_salt("ions_list")
        .default_open(false)
        .show(ui, |ui| {
            egui::Grid::new("ions_grid").spacing([12.0, 2.0]).striped(true).show(ui, |ui| {
                ui.strong("ion");
                ui.strong("z");
                ui.strong("mol/kg water");
                ui.strong("γ");
                ui.end_row();
                for i in &sp.ions {
                    ui.label(&i.id);
                    ui.label(format!("{:+}", i.charge));
                    ui.label(sig(i.molality, 3));
                    if i.fallback {
                        ui.colored_label(super::WARN, format!("{} estimated", sig(i.gamma, 3)))
                            .on_hover_text("No published Pitzer parameters: the coefficient is a charge-based estimate");
                    } else {
                        ui.label(sig(i.gamma, 3));
                    }
                    ui.end_row();
                }
            });
            if let Some(phi) = sp.osmotic {
                ui.label(format!("Osmotic coefficient φ = {phi:.4}"));
            }
        });
}
