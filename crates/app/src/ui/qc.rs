//! The QC titration: the method saved with the project (sample, titrant, normality, end points,
//! in-use sample, carbonation) and what the lab will read — mL to each end point, the titration
//! factor and the predicted curve.

use egui::{RichText, Role, Ui};
use egui_plot::{Line, MarkerShape, Points};
use saltwise_chem::Library;
use saltwise_chem::limits::{
    CARBONATED_PERCENT, END_POINT_PH, IN_USE_SAMPLE_ML, NORMALITY, SAMPLE_G,
};
use saltwise_chem::qc::{self, Method, TITRANT_DENSITY_KG_PER_L, TitrantKind};

use super::{Field, PanelState, checked_drag, sig};
use crate::engine::{Engine, QcData};

/// Draws the section, closed until asked for; the titration is computed only while it is open.
pub fn qc_ui(ui: &mut Ui, method: &mut Method, engine: &Engine, panels: &mut PanelState) {
    egui::CollapsingHeader::new("QC titration")
        .id_salt("qc_section")
        .default_open(false)
        .show(ui, |ui| {
            let Ok(library) = engine.library() else {
                return;
            };
            method_ui(ui, method, library, panels);
            ui.separator();
            match engine.qc() {
                Some(Ok(data)) => results_ui(ui, data, library),
                Some(Err(e)) => {
                    ui.colored_label(super::ERROR, format!("No titration: {e}"));
                }
                None => {
                    ui.weak("Predicting the titration…");
                }
            }
        });
}

fn method_ui(ui: &mut Ui, method: &mut Method, library: &Library, panels: &mut PanelState) {
    egui::Grid::new("qc_method_grid")
        .spacing([8.0, 4.0])
        .show(ui, |ui| {
            ui.label("Sample");
            ui.horizontal(|ui| {
                checked_drag(
                    ui,
                    &mut method.sample_g,
                    |d| d.range(0.001..=SAMPLE_G.max).speed(0.1).max_decimals(3),
                    Field {
                        name: "Sample mass",
                        hint: "Grams of product weighed into the titration",
                    },
                    SAMPLE_G,
                    &mut panels.refused,
                );
                ui.label("g of product");
            });
            ui.end_row();
            ui.label("Titrant");
            titrant_picker(ui, method, library);
            ui.end_row();
            ui.label("Normality");
            ui.horizontal(|ui| {
                checked_drag(
                    ui,
                    &mut method.normality,
                    |d| d.range(0.001..=NORMALITY.max).speed(0.005).max_decimals(3),
                    Field {
                        name: "Titrant normality",
                        hint: "mol of H⁺ or OH⁻ per litre of titrant",
                    },
                    NORMALITY,
                    &mut panels.refused,
                );
                ui.label(format!(
                    "mol/L (density taken as {TITRANT_DENSITY_KG_PER_L:.2} kg/L)"
                ));
            });
            ui.end_row();
            ui.label("End points");
            end_points_ui(ui, method, panels);
            ui.end_row();
            ui.label("Titration factor");
            optional_ui(
                ui,
                &mut method.in_use_sample_ml,
                100.0,
                ("For an in-use sample", "mL of in-use solution"),
                Field {
                    name: "In-use sample",
                    hint: "mL of in-use solution titrated on the plant floor; the factor is % of product per mL of titrant at the first end point",
                },
                IN_USE_SAMPLE_ML,
                panels,
            );
            ui.end_row();
            ui.label("Carbonation");
            optional_ui(
                ui,
                &mut method.carbonated_percent,
                10.0,
                ("After CO₂ uptake", "% of the free hydroxide carbonated"),
                Field {
                    name: "Carbonated share",
                    hint: "For caustic products: this share of the free hydroxide has taken up CO₂ as carbonate before sampling",
                },
                CARBONATED_PERCENT,
                panels,
            );
            ui.end_row();
        });
}

fn titrant_picker(ui: &mut Ui, method: &mut Method, library: &Library) {
    let name = |id: &str| titrant_words(library, id);
    const AUTO: &str = "Automatic: HCl for an alkaline product, NaOH for an acidic one";
    let selected = method
        .titrant
        .as_deref()
        .map_or_else(|| AUTO.to_owned(), name);
    let response = egui::ComboBox::from_id_salt("qc_titrant")
        .selected_text(selected)
        .width(300.0)
        .show_ui(ui, |ui| {
            ui.selectable_value(&mut method.titrant, None, AUTO);
            for id in qc::strong_titrant_ids(library) {
                ui.selectable_value(&mut method.titrant, Some(id.to_owned()), name(id));
            }
        })
        .response;
    super::name_widget(response, Role::ComboBox, "QC titrant").on_hover_text(
        "A strong acid or base of the library; its grade does not matter, the normality sets its strength",
    );
}

/// A titrant by its formula, with the library entry it is taken from.
fn titrant_words(library: &Library, id: &str) -> String {
    library.entry(id).map_or_else(
        || id.to_owned(),
        |e| format!("{} (as {})", e.ingredient.formula, e.ingredient.name),
    )
}

/// The end points as text: pH values separated by commas or spaces; empty for the defaults.
fn end_points_ui(ui: &mut Ui, method: &mut Method, panels: &mut PanelState) {
    let text = panels
        .qc_end_points
        .get_or_insert_with(|| list_text(&method.end_points_ph));
    // Undo or another project may have changed the method under the text.
    let matches = parse_end_points(text).is_ok_and(|l| l == method.end_points_ph);
    if !matches && !panels.refused.contains_key("End point pH values") {
        *text = list_text(&method.end_points_ph);
    }
    ui.vertical(|ui| {
        let response = ui.add(
            egui::TextEdit::singleline(text)
                .hint_text("8.3, 4.3 (acid) or 8.3 (base)")
                .desired_width(160.0),
        );
        let response = super::name_widget(response, Role::TextInput, "End point pH values").on_hover_text(
            "pH values in order, separated by commas or spaces; empty for the usual ones: 8.3 and 4.3 with an acid titrant (P and M alkalinity), 8.3 with a base (acidity)",
        );
        if response.changed() {
            match parse_end_points(text) {
                Ok(list) => {
                    method.end_points_ph = list;
                    panels.refused.remove("End point pH values");
                }
                Err(why) => {
                    panels.refused.insert("End point pH values".into(), why);
                }
            }
        }
        if let Some(why) = panels.refused.get("End point pH values") {
            ui.label(
                RichText::new(crate::messages::sentence(why))
                    .color(super::ERROR)
                    .small(),
            );
        }
    });
}

fn list_text(list: &[f64]) -> String {
    list.iter()
        .map(|p| format!("{p}"))
        .collect::<Vec<_>>()
        .join(", ")
}

/// End points typed as pH values separated by commas, semicolons or spaces.
fn parse_end_points(text: &str) -> Result<Vec<f64>, String> {
    text.split(|c: char| c == ',' || c == ';' || c.is_whitespace())
        .filter(|t| !t.is_empty())
        .map(|t| END_POINT_PH.check_text(t).map_err(|e| e.to_string()))
        .collect()
}

/// A value that is either off or on with a number: a checkbox, then the field when on.
fn optional_ui(
    ui: &mut Ui,
    value: &mut Option<f64>,
    default: f64,
    (check, unit): (&str, &str),
    field: Field<'_>,
    allowed: saltwise_chem::limits::Limit,
    panels: &mut PanelState,
) {
    ui.horizontal(|ui| {
        let mut on = value.is_some();
        if ui.checkbox(&mut on, check).changed() {
            *value = on.then_some(default);
        }
        if let Some(v) = value.as_mut() {
            checked_drag(
                ui,
                v,
                |d| {
                    d.range(allowed.min..=allowed.max)
                        .speed(0.5)
                        .max_decimals(2)
                },
                field,
                allowed,
                &mut panels.refused,
            );
            ui.label(unit);
        }
    });
}

/// What an end point is called at the bench (common practice).
fn end_point_words(kind: TitrantKind, ph: f64) -> &'static str {
    let near = |x: f64| (ph - x).abs() < 1e-9;
    match kind {
        TitrantKind::Acid if near(qc::P_END_POINT_PH) => "P alkalinity (phenolphthalein)",
        TitrantKind::Acid if near(qc::M_END_POINT_PH) => "M alkalinity (total)",
        TitrantKind::Base if near(qc::ACIDITY_END_POINT_PH) => "acidity to phenolphthalein",
        TitrantKind::Base if near(qc::NEUTRAL_ACIDITY_PH) => "acidity to neutral",
        _ => "",
    }
}

fn results_ui(ui: &mut Ui, data: &QcData, library: &Library) {
    let p = &data.prediction;
    let titrant = library
        .entry(&data.titrant)
        .map_or_else(|| data.titrant.clone(), |e| e.ingredient.formula.clone());
    ui.label(format!(
        "Titrated with {} N {titrant} ({}); sample at pH {:.2} before any titrant.",
        sig(data.normality, 3),
        data.kind.label(),
        p.start_ph
    ));
    egui::Grid::new("qc_end_points_grid")
        .striped(true)
        .spacing([16.0, 4.0])
        .show(ui, |ui| {
            ui.strong("End point");
            ui.strong("Titrant");
            ui.strong("");
            ui.end_row();
            for e in &p.end_points {
                ui.label(format!("pH {}", sig(e.ph, 3)));
                ui.label(RichText::new(format!("{} mL", sig(e.ml, 4))).strong());
                ui.label(end_point_words(data.kind, e.ph));
                ui.end_row();
            }
        });
    if let Some(f) = &p.factor {
        ui.label(format!(
            "Titration factor: {} % of product per mL of titrant, for {} mL of in-use solution (at pH {}).",
            sig(f.percent_per_ml, 4),
            sig(f.in_use_sample_ml, 4),
            sig(f.end_point_ph, 3)
        ));
    }
    for w in &p.warnings {
        ui.colored_label(super::WARN, w);
    }
    let curve: Vec<[f64; 2]> = p.points.iter().map(|t| [t.ml, t.ph]).collect();
    let ends: Vec<[f64; 2]> = p.end_points.iter().map(|e| [e.ml, e.ph]).collect();
    super::titration_plot("qc_plot").show(ui, |plot| {
        plot.line(
            Line::new("Predicted pH", curve)
                .width(2.0)
                .color(super::PH_LINE),
        );
        plot.points(
            Points::new("End point", ends)
                .shape(MarkerShape::Circle)
                .radius(5.0)
                .filled(false)
                .color(super::EQUIVALENCE),
        );
    });
}

#[cfg(test)]
mod tests {
    use super::parse_end_points;

    #[test]
    fn end_points_are_read_from_commas_or_spaces_and_checked() {
        assert_eq!(parse_end_points("8.3, 4.3"), Ok(vec![8.3, 4.3]));
        assert_eq!(parse_end_points("  7 8.3 "), Ok(vec![7.0, 8.3]));
        assert_eq!(parse_end_points(""), Ok(vec![]));
        assert!(parse_end_points("8.3, 15").is_err());
        assert!(parse_end_points("eight").is_err());
    }
}
