//! The panels of the window, one per file, and small drawing helpers they share.

pub mod cautions;
pub mod custom_ingredient;
pub mod dose_curve;
pub mod readout;
pub mod recipe_table;
pub mod species_chart;
pub mod top_bar;

use std::cell::RefCell;
use std::collections::BTreeMap;
use std::rc::Rc;

use egui::{Color32, DragValue, Response, RichText, Role, Ui, WidgetInfo};

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

/// Why the last text typed into a number field was refused, by the field's accessible name.
pub type Refusals = BTreeMap<String, String>;

/// What a number typed into a field may be.
#[derive(Debug, Clone, Copy)]
pub struct Allowed {
    /// Smallest value.
    pub min: f64,
    /// Whether the smallest value itself is refused (a batch of 0 g).
    pub min_exclusive: bool,
    /// Largest value.
    pub max: f64,
    /// The rule in words, shown when a number is refused ("amounts are 0 or more").
    pub rule: &'static str,
}

impl Allowed {
    /// Why `text` cannot be taken, or the number it means.
    pub fn check(&self, text: &str) -> Result<f64, String> {
        let shown = text.trim();
        if shown.is_empty() {
            return Err(format!("type a number: {}", self.rule));
        }
        let Some(v) = parse_number(shown) else {
            return Err(format!("'{shown}' is not a number: {}", self.rule));
        };
        if !v.is_finite() {
            return Err(format!("'{shown}' is not a finite number: {}", self.rule));
        }
        let low = if self.min_exclusive {
            v <= self.min
        } else {
            v < self.min
        };
        if low || v > self.max {
            return Err(format!("{shown} refused: {}", self.rule));
        }
        Ok(v)
    }
}

/// A number as people type it: spaces ignored, the minus sign or a hyphen, and a decimal comma
/// when there is no decimal point.
pub fn parse_number(text: &str) -> Option<f64> {
    let mut t: String = text
        .chars()
        .filter(|c| !c.is_whitespace())
        .map(|c| if c == '−' { '-' } else { c })
        .collect();
    if !t.contains('.') && t.matches(',').count() == 1 {
        t = t.replace(',', ".");
    }
    t.parse().ok()
}

/// A drag value whose typed text is checked against `allowed`: refused text leaves the value as
/// it was, and the reason is shown beside the field until a change is accepted.
pub fn checked_drag(
    ui: &mut Ui,
    drag: DragValue<'_>,
    name: &str,
    allowed: Allowed,
    refused: &mut Refusals,
) -> Response {
    let verdict: Rc<RefCell<Option<Result<f64, String>>>> = Rc::default();
    let seen = Rc::clone(&verdict);
    let response = ui
        .add(drag.custom_parser(move |text| {
            let result = allowed.check(text);
            let value = result.as_ref().ok().copied();
            *seen.borrow_mut() = Some(result);
            value
        }))
        .on_hover_text(name);
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
        ui.label(RichText::new(why).color(ERROR).small());
    }
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
    use super::{Allowed, parse_number, sig};

    #[test]
    fn numbers_keep_their_significant_figures() {
        assert_eq!(sig(0.012_345, 3), "0.0123");
        assert_eq!(sig(123.456, 4), "123.5");
        assert_eq!(sig(0.0, 3), "0");
        assert_eq!(sig(1.5e-7, 2), "1.5e-7");
    }

    #[test]
    fn typed_numbers_are_read_as_people_write_them() {
        assert_eq!(parse_number(" 12.5 "), Some(12.5));
        assert_eq!(parse_number("12,5"), Some(12.5));
        assert_eq!(parse_number("−3"), Some(-3.0));
        assert_eq!(parse_number("1 000"), Some(1000.0));
        assert_eq!(parse_number("1,000.5"), None);
        assert_eq!(parse_number("abc"), None);
    }

    #[test]
    fn refused_numbers_say_why() {
        let a = Allowed {
            min: 0.0,
            min_exclusive: true,
            max: 10.0,
            rule: "between 0 and 10",
        };
        assert_eq!(a.check("5"), Ok(5.0));
        assert_eq!(a.check("0").unwrap_err(), "0 refused: between 0 and 10");
        assert_eq!(a.check("11").unwrap_err(), "11 refused: between 0 and 10");
        assert!(a.check("inf").unwrap_err().contains("not a finite number"));
        assert!(a.check("x").unwrap_err().starts_with("'x' is not a number"));
    }
}
