//! The one table of input limits: what each number a person types may be, in the same words
//! everywhere (command line, project files, recipes, the library, the window).
//!
//! Every refusal reads "{what} {value} {unit} is not allowed: {problem}; {rule}".

use crate::error::LimitError;
use crate::solver::{TEMP_MAX_C, TEMP_MIN_C};

/// What one kind of input may be.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Limit {
    /// What the number is, as it starts a sentence ("temperature").
    pub what: &'static str,
    /// Smallest value.
    pub min: f64,
    /// Whether the smallest value itself is allowed.
    pub min_inclusive: bool,
    /// Largest value (always allowed).
    pub max: f64,
    /// Unit written after the value ("g", "°C"); empty for plain numbers.
    pub unit: &'static str,
    /// The rule in words, said with every refusal.
    pub rule: &'static str,
}

/// An amount on a recipe line, in its own unit (g, kg, mg, mol or %).
pub const AMOUNT: Limit = Limit {
    what: "amount",
    min: 0.0,
    min_inclusive: true,
    max: 1e7,
    unit: "",
    rule: "amounts are finite numbers from 0 to 10 000 000 in their unit",
};

/// The batch size water is added to (q.s.), g.
pub const BATCH_G: Limit = Limit {
    what: "q.s. batch size",
    min: 0.0,
    min_inclusive: false,
    max: 1e8,
    unit: "g",
    rule: "a q.s. batch size is above 0 g and at most 100 000 000 g",
};

/// Temperature, °C: the range of the temperature model.
pub const TEMPERATURE_C: Limit = Limit {
    what: "temperature",
    min: TEMP_MIN_C,
    min_inclusive: true,
    max: TEMP_MAX_C,
    unit: "°C",
    rule: "temperatures are 0–95 °C, the range of the temperature model",
};

/// Target pH of a batch.
pub const TARGET_PH: Limit = Limit {
    what: "target pH",
    min: -1.0,
    min_inclusive: true,
    max: 15.0,
    unit: "",
    rule: "a target pH is from −1 to 15",
};

/// Half-width of the target band, pH units.
pub const BAND: Limit = Limit {
    what: "target band half-width",
    min: 0.0,
    min_inclusive: true,
    max: 3.0,
    unit: "pH units",
    rule: "the target band is 0 to 3 pH units either side of the target",
};

/// Largest dose on a dose curve, and the end of a dose range, g.
pub const DOSE_MAX_G: Limit = Limit {
    what: "largest dose",
    min: 0.0,
    min_inclusive: false,
    max: 1e6,
    unit: "g",
    rule: "the largest dose is above 0 g and at most 1 000 000 g",
};

/// A pKa value of an acid–base step.
pub const PKA: Limit = Limit {
    what: "pKa",
    min: -5.0,
    min_inclusive: true,
    max: 20.0,
    unit: "",
    rule: "pKa values are from −5 to 20",
};

/// Assay: the mass fraction of the named substance in an ingredient as supplied.
pub const ASSAY: Limit = Limit {
    what: "assay",
    min: 0.0,
    min_inclusive: false,
    max: 1.0,
    unit: "",
    rule: "an assay is the mass fraction of the named substance, above 0 and at most 1",
};

/// A price of an ingredient as bought, per kg, in the user's own currency.
pub const PRICE_PER_KG: Limit = Limit {
    what: "price per kg",
    min: 0.0,
    min_inclusive: true,
    max: 1e6,
    unit: "per kg",
    rule: "a price is from 0 to 1 000 000 per kg, in any one currency",
};

/// A weighing tolerance, ± % of a line's amount.
pub const WEIGHING_TOLERANCE: Limit = Limit {
    what: "weighing tolerance",
    min: 0.0,
    min_inclusive: true,
    max: 50.0,
    unit: "%",
    rule: "a weighing tolerance is from 0 to 50 % either side of the amount",
};

/// Hardness of the recipe's water, ppm as CaCO₃.
pub const HARDNESS_PPM: Limit = Limit {
    what: "water hardness",
    min: 0.0,
    min_inclusive: true,
    max: crate::recipe::hardness::MAX_PPM,
    unit: "ppm",
    rule: "water hardness is from 0 to 10 000 ppm as CaCO₃",
};

/// Share of the water's hardness that is calcium.
pub const CALCIUM_SHARE: Limit = Limit {
    what: "calcium share",
    min: 0.0,
    min_inclusive: true,
    max: 1.0,
    unit: "",
    rule: "the calcium share of the hardness is from 0 to 1; the rest is magnesium",
};

/// The mass of a sample of product taken for a titration, g.
pub const SAMPLE_G: Limit = Limit {
    what: "sample",
    min: 0.0,
    min_inclusive: false,
    max: 1e4,
    unit: "g",
    rule: "a titration sample is above 0 g and at most 10 000 g of product",
};

/// The normality of a titrant, mol of H⁺ or OH⁻ per L (its density is taken as 1.00 kg/L).
pub const NORMALITY: Limit = Limit {
    what: "titrant normality",
    min: 0.0,
    min_inclusive: false,
    max: 1.0,
    unit: "mol/L",
    rule: "a titrant's normality is above 0 and at most 1 mol/L, where its density is taken as 1.00 kg/L",
};

/// The pH of a titration end point.
pub const END_POINT_PH: Limit = Limit {
    what: "end point pH",
    min: 0.0,
    min_inclusive: true,
    max: 14.0,
    unit: "",
    rule: "an end point is from pH 0 to pH 14",
};

/// The volume of in-use solution titrated on the plant floor, mL.
pub const IN_USE_SAMPLE_ML: Limit = Limit {
    what: "in-use sample",
    min: 0.0,
    min_inclusive: false,
    max: 1e4,
    unit: "mL",
    rule: "an in-use sample is above 0 mL and at most 10 000 mL",
};

/// The share of a product's free hydroxide taken up by CO₂ as carbonate, %.
pub const CARBONATED_PERCENT: Limit = Limit {
    what: "carbonated share of the hydroxide",
    min: 0.0,
    min_inclusive: true,
    max: 100.0,
    unit: "%",
    rule: "the carbonated share of the hydroxide is from 0 to 100 %",
};

/// Every limit, for listing and tests.
pub const ALL: [Limit; 17] = [
    AMOUNT,
    BATCH_G,
    TEMPERATURE_C,
    TARGET_PH,
    BAND,
    DOSE_MAX_G,
    PKA,
    ASSAY,
    PRICE_PER_KG,
    WEIGHING_TOLERANCE,
    HARDNESS_PPM,
    CALCIUM_SHARE,
    SAMPLE_G,
    NORMALITY,
    END_POINT_PH,
    IN_USE_SAMPLE_ML,
    CARBONATED_PERCENT,
];

impl Limit {
    /// Whether `value` is allowed.
    pub fn allows(&self, value: f64) -> bool {
        let low_ok = if self.min_inclusive {
            value >= self.min
        } else {
            value > self.min
        };
        value.is_finite() && low_ok && value <= self.max
    }

    /// The value if allowed, or why not.
    pub fn check(&self, value: f64) -> Result<f64, LimitError> {
        self.check_as(value, self.what)
    }

    /// As [`Limit::check`], naming the value `what` (e.g. "amount of citric_acid").
    pub fn check_as(&self, value: f64, what: &str) -> Result<f64, LimitError> {
        if self.allows(value) {
            return Ok(value);
        }
        let problem = if !value.is_finite() {
            "it is not a finite number"
        } else if value < 0.0 && self.min >= 0.0 {
            "it is negative"
        } else if value > self.max {
            "it is too high"
        } else {
            "it is too low"
        };
        Err(LimitError::NotAllowed {
            what: what.to_owned(),
            value: value.to_string(),
            unit: self.unit,
            problem,
            rule: self.rule,
        })
    }

    /// A number as typed (see [`parse_number`]), checked.
    pub fn check_text(&self, text: &str) -> Result<f64, LimitError> {
        self.check_text_as(text, self.what)
    }

    /// As [`Limit::check_text`], naming the value `what`.
    pub fn check_text_as(&self, text: &str, what: &str) -> Result<f64, LimitError> {
        let shown = text.trim();
        if shown.is_empty() {
            return Err(LimitError::Empty {
                what: what.to_owned(),
                rule: self.rule,
            });
        }
        let value = parse_number(shown).ok_or_else(|| LimitError::NotANumber {
            what: what.to_owned(),
            text: shown.to_owned(),
            rule: self.rule,
        })?;
        self.check_as(value, what)
    }
}

/// A number as people type it: spaces ignored, the minus sign `−` or a hyphen, and a decimal
/// comma when there is no decimal point (`1,5` is 1.5; `1,000.5` is not read).
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_as_people_type_them() {
        assert_eq!(parse_number(" 1 000 "), Some(1000.0));
        assert_eq!(parse_number("−2,5"), Some(-2.5));
        assert_eq!(parse_number("1,000.5"), None);
        assert_eq!(parse_number("abc"), None);
    }

    #[test]
    fn bounds_are_inclusive_or_not_as_the_table_says() {
        assert!(AMOUNT.allows(0.0));
        assert!(!BATCH_G.allows(0.0));
        assert!(BATCH_G.allows(1e8));
        assert!(!BATCH_G.allows(1.0001e8));
        assert!(TEMPERATURE_C.allows(95.0) && !TEMPERATURE_C.allows(95.1));
        assert!(!ASSAY.allows(0.0) && ASSAY.allows(1.0));
        assert!(!PKA.allows(f64::NAN));
    }

    #[test]
    fn refusals_use_one_wording() {
        let e = BATCH_G.check(0.0).unwrap_err().to_string();
        assert_eq!(
            e,
            "q.s. batch size 0 g is not allowed: it is too low; a q.s. batch size is above 0 g and at most 100 000 000 g"
        );
        let e = AMOUNT.check_as(-3.0, "amount of citric_acid").unwrap_err();
        assert!(
            e.to_string()
                .starts_with("amount of citric_acid -3 is not allowed: it is negative;")
        );
        let e = TEMPERATURE_C.check_text("120").unwrap_err().to_string();
        assert!(
            e.contains("120 °C is not allowed: it is too high") && e.contains("0–95 °C"),
            "{e}"
        );
        let e = TARGET_PH.check_text("seven").unwrap_err().to_string();
        assert_eq!(
            e,
            "target pH: 'seven' is not a number; a target pH is from −1 to 15"
        );
        let e = BAND.check_text("  ").unwrap_err().to_string();
        assert!(
            e.starts_with("target band half-width: type a number;"),
            "{e}"
        );
        assert_eq!(PKA.check_text("−1,5"), Ok(-1.5));
    }

    #[test]
    fn every_limit_has_a_rule_and_a_sane_range() {
        for l in ALL {
            assert!(
                l.min < l.max && !l.rule.is_empty() && !l.what.is_empty(),
                "{l:?}"
            );
        }
    }
}
