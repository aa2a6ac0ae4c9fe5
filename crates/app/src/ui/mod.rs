//! The panels of the window, one per file, and small drawing helpers they share.

pub mod cautions;
pub mod custom_ingredient;
pub mod dose_curve;
pub mod readout;
pub mod recipe_table;
pub mod species_chart;
pub mod top_bar;

use egui::{Color32, Response, Role, Ui, WidgetInfo};

/// Colour of warnings (amber, readable on both themes).
pub const WARN: Color32 = Color32::from_rgb(0xd9, 0x8c, 0x00);
/// Colour of errors.
pub const ERROR: Color32 = Color32::from_rgb(0xd0, 0x3a, 0x2f);
/// Colour of the target band and target marks.
pub const TARGET: Color32 = Color32::from_rgb(0x2e, 0x9d, 0x6b);

/// A button whose visible text may be an icon but whose accessible name is `name`.
pub fn named_button(ui: &mut Ui, text: &str, name: &str) -> Response {
    let enabled = ui.is_enabled();
    let response = ui.button(text).on_hover_text(name);
    response.widget_info(|| WidgetInfo::labeled(Role::Button, enabled, name));
    response
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
