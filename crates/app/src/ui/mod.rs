//! The panels of the window, one per file, and small drawing helpers they share.

pub mod cautions;
pub mod custom_ingredient;
pub mod design;
pub mod dose_curve;
pub mod fit;
pub mod hardness;
pub mod qc;
pub mod readout;
pub mod recipe_table;
pub mod species_chart;
pub mod sweeps;
pub mod tolerance;
pub mod top_bar;
pub mod variants;

use std::cell::RefCell;
use std::collections::BTreeMap;
use std::rc::Rc;

use egui::{Color32, DragValue, Response, RichText, Role, Ui, WidgetInfo};
use saltwise_chem::limits::Limit;

/// Runtime state of the panels that is not part of the project.
#[derive(Debug, Clone, Default)]
pub struct PanelState {
    /// Text typed into the ingredient picker.
    pub picker_query: String,
    /// Whether the dose curve shows buffer capacity.
    pub show_buffer_capacity: bool,
    /// The custom-ingredient form.
    pub custom: custom_ingredient::CustomForm,
    /// Why the last text typed into a number field was refused, by the field's name.
    pub refused: Refusals,
    /// The name being typed for the current variant, while renaming.
    pub renaming: Option<String>,
    /// Price text as typed, by ingredient id.
    pub price_text: BTreeMap<String, String>,
    /// The buffer design form.
    pub design: design::DesignForm,
    /// The QC end points as typed (pH values separated by commas).
    pub qc_end_points: Option<String>,
    /// Batch size of an exported batch sheet, kg (0: the recipe's own).
    pub sheet_batch_kg: f64,
    /// The measured-titration and fit form.
    pub fit: crate::measured::FitForm,
}

// One colour, one meaning. The colours are from the Okabe–Ito set, chosen to stay apart for
// the common kinds of colour blindness (no red against green); the species use a set of their
// own, with dashes on every other form so no form is told apart by colour alone.

/// Warnings and limits of the prediction (orange).
pub const WARN: Color32 = Color32::from_rgb(0xc2, 0x7c, 0x00);
/// Errors and refusals (vermillion).
pub const ERROR: Color32 = Color32::from_rgb(0xd5, 0x5e, 0x00);
/// The target band and everything about reaching it (bluish green).
pub const TARGET: Color32 = Color32::from_rgb(0x00, 0x9e, 0x73);
/// The pH on the dose curve (blue).
pub const PH_LINE: Color32 = Color32::from_rgb(0x00, 0x72, 0xb2);
/// Buffer capacity (sky blue, dashed).
pub const BUFFER: Color32 = Color32::from_rgb(0x56, 0xb4, 0xe9);
/// Equivalence points (reddish purple, open circles).
pub const EQUIVALENCE: Color32 = Color32::from_rgb(0xcc, 0x79, 0xa7);
/// The forms of a system on the species chart, in order.
pub const SPECIES: [Color32; 7] = [
    Color32::from_rgb(0xcc, 0xbb, 0x44),
    Color32::from_rgb(0xaa, 0x33, 0x77),
    Color32::from_rgb(0x44, 0x77, 0xaa),
    Color32::from_rgb(0x99, 0x99, 0x99),
    Color32::from_rgb(0xee, 0x66, 0x77),
    Color32::from_rgb(0x66, 0xcc, 0xee),
    Color32::from_rgb(0x22, 0x88, 0x33),
];

/// The variants on the comparison chart, in order (mostly Tol's muted set, lightened for the dark theme; apart from every colour
/// above).
pub const VARIANT: [Color32; 8] = [
    Color32::from_rgb(0xdd, 0xcc, 0x77),
    Color32::from_rgb(0x44, 0xaa, 0x99),
    Color32::from_rgb(0xcc, 0x66, 0x77),
    Color32::from_rgb(0x99, 0x99, 0x33),
    Color32::from_rgb(0xee, 0x99, 0x33),
    Color32::from_rgb(0x88, 0xcc, 0xee),
    Color32::from_rgb(0x11, 0x77, 0x33),
    Color32::from_rgb(0xaa, 0x44, 0x99),
];

/// The current recipe on any chart: the theme's own strongest text colour.
/// Height of a titration chart (QC prediction, measured titration), points.
const TITRATION_CHART_HEIGHT: f32 = 220.0;

/// A fixed (not zoomable) chart of pH against mL of titrant, with a legend, from 0 mL.
pub fn titration_plot(id: &str) -> egui_plot::Plot<'_> {
    egui_plot::Plot::new(id)
        .height(TITRATION_CHART_HEIGHT)
        .x_axis_label("Titrant, mL")
        .y_axis_label("pH")
        .legend(egui_plot::Legend::default())
        .include_x(0.0)
        .allow_scroll(false)
        .allow_zoom(false)
        .allow_drag(false)
}

pub fn current_color(ui: &Ui) -> Color32 {
    ui.visuals().strong_text_color()
}

/// The built-in fonts, with the monospace face behind the proportional one for the glyphs it
/// lacks (superscript ⁺ and ⁻ of charges and powers of ten, arrows).
pub fn fonts() -> egui::FontDefinitions {
    let mut fonts = egui::FontDefinitions::default();
    if let Some(family) = fonts.families.get_mut(&egui::FontFamily::Proportional) {
        let at = family.len().min(1);
        family.insert(at, "Hack".to_owned());
    }
    fonts
}

/// A button whose visible text may be an icon but whose accessible name is `name`.
pub fn named_button(ui: &mut Ui, text: &str, name: &str) -> Response {
    let enabled = ui.is_enabled();
    let mut response = ui.button(text);
    // An icon says nothing on its own: its tooltip gives the name. Words need no echo.
    if !text.chars().any(char::is_alphabetic) {
        response = response.on_hover_text(name);
    }
    response.widget_info(|| WidgetInfo::labeled(Role::Button, enabled, name));
    response
}

/// Where the scrolled results start and how tall their view is, for [`chart_height`].
#[derive(Debug, Clone, Copy)]
pub struct ResultsView {
    /// Top of the results' content, screen points (moves with scrolling).
    pub content_top: f32,
    /// Height of the visible part, points.
    pub view_height: f32,
}

impl ResultsView {
    fn id() -> egui::Id {
        egui::Id::unique("saltwise_results_view")
    }

    /// Records the view for the charts drawn in this pass.
    pub fn store(self, ctx: &egui::Context) {
        ctx.data_mut(|d| d.insert_temp(Self::id(), self));
    }
}

/// Height of a main chart: what the results view leaves for it and `below_points` of text under
/// it, so the window at 1600×1000 shows everything without scrolling; never under 220 points
/// (smaller windows scroll) nor over 560. It does not change as the view scrolls.
pub fn chart_height(ui: &Ui, below_points: f32) -> f32 {
    let view = ui
        .ctx()
        .data(|d| d.get_temp::<ResultsView>(ResultsView::id()));
    let room = view.map_or(400.0, |v| {
        v.view_height - (ui.cursor().top() - v.content_top) - below_points
    });
    room.clamp(220.0, 560.0)
}

/// Gives a widget the accessible name `name` (what tests and screen readers find it by), so its
/// tooltip is free to add information instead of repeating the label.
pub fn name_widget(response: Response, role: Role, name: &str) -> Response {
    let enabled = response.enabled();
    response.widget_info(|| WidgetInfo::labeled(role, enabled, name));
    response
}

/// Gives a drag value showing `value` the accessible name `name`.
pub fn name_drag(response: Response, value: f64, name: &str) -> Response {
    let enabled = response.enabled();
    response.widget_info(|| {
        let mut info = WidgetInfo::drag_value(enabled, value);
        info.label = Some(name.to_owned());
        info
    });
    response
}

/// Why the last text typed into a number field was refused, by the field's accessible name.
pub type Refusals = BTreeMap<String, String>;

/// A drag value whose typed text is checked against `allowed`: refused text leaves the value as
/// it was, and the reason is shown beside the field until a change is accepted. `name` is what
/// the field is found by; `hint` is its tooltip.
pub fn checked_drag(
    ui: &mut Ui,
    value: &mut f64,
    configure: impl FnOnce(DragValue<'_>) -> DragValue<'_>,
    field: Field<'_>,
    allowed: Limit,
    refused: &mut Refusals,
) -> Response {
    let verdict: Rc<RefCell<Option<Result<f64, String>>>> = Rc::default();
    let seen = Rc::clone(&verdict);
    let drag = configure(DragValue::new(value)).custom_parser(move |text| {
        let result = allowed.check_text(text).map_err(|e| e.to_string());
        let value = result.as_ref().ok().copied();
        *seen.borrow_mut() = Some(result);
        value
    });
    let response = ui.add(drag);
    let (enabled, shown) = (response.enabled(), *value);
    response.widget_info(|| {
        let mut info = WidgetInfo::drag_value(enabled, shown);
        info.label = Some(field.name.to_owned());
        info
    });
    let response = response.on_hover_text(field.hint);
    let name = field.name;
    match verdict.borrow_mut().take() {
        Some(Err(why)) => {
            refused.insert(name.to_owned(), why);
        }
        Some(Ok(_)) => {
            refused.remove(name);
        }
        None if response.dragged() => {
            refused.remove(name);
        }
        None => {}
    }
    if let Some(why) = refused.get(name) {
        ui.label(
            RichText::new(crate::messages::sentence(why))
                .color(ERROR)
                .small(),
        );
    }
    response
}

/// A number field's accessible name and its tooltip.
#[derive(Debug, Clone, Copy)]
pub struct Field<'a> {
    /// What the field is found by ("Temperature").
    pub name: &'a str,
    /// What the tooltip adds.
    pub hint: &'a str,
}

/// A number with about `digits` significant figures, without exponent for everyday sizes.
pub fn sig(x: f64, digits: usize) -> String {
    if !x.is_finite() {
        return "—".into();
    }
    if x == 0.0 {
        return "0".into();
    }
    let magnitude = x.abs().log10().floor();
    if !(-4.0..6.0).contains(&magnitude) {
        return format!("{:.*e}", digits.saturating_sub(1), x);
    }
    let decimals = (digits as f64 - 1.0 - magnitude).max(0.0) as usize;
    format!("{x:.decimals$}")
}

#[cfg(test)]
mod tests {
    use super::sig;

    #[test]
    fn numbers_keep_their_significant_figures() {
        assert_eq!(sig(0.012_345, 3), "0.0123");
        assert_eq!(sig(123.456, 4), "123.5");
        assert_eq!(sig(0.0, 3), "0");
        assert_eq!(sig(1.5e-7, 2), "1.5e-7");
    }
}

#[cfg(test)]
mod palette_tests {
    use super::{BUFFER, EQUIVALENCE, ERROR, PH_LINE, SPECIES, TARGET, VARIANT, WARN};

    #[test]
    fn no_colour_has_two_meanings() {
        let mut all = vec![WARN, ERROR, TARGET, PH_LINE, BUFFER, EQUIVALENCE];
        all.extend(SPECIES);
        all.extend(VARIANT);
        for (i, a) in all.iter().enumerate() {
            for b in &all[i + 1..] {
                assert_ne!(a, b, "a colour is used twice");
            }
        }
    }
}
