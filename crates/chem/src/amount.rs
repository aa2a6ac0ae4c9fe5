//! Amounts with units (g, kg, mg, mol, % w/w): parsing, display and conversion for one ingredient.

use std::fmt;

use serde::{Deserialize, Serialize};

/// The unit of an amount.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum Unit {
    /// Grams of the ingredient as supplied.
    #[serde(rename = "g")]
    Gram,
    /// Kilograms of the ingredient as supplied.
    #[serde(rename = "kg")]
    Kilogram,
    /// Milligrams of the ingredient as supplied.
    #[serde(rename = "mg")]
    Milligram,
    /// Moles of the named substance (the water its assay implies comes with it).
    #[serde(rename = "mol")]
    Mole,
    /// Percent by mass of the whole batch (% w/w).
    #[serde(rename = "percent")]
    Percent,
}

impl Unit {
    /// The unit's symbol.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::Gram => "g",
            Self::Kilogram => "kg",
            Self::Milligram => "mg",
            Self::Mole => "mol",
            Self::Percent => "%",
        }
    }

    /// Every unit, in menu order.
    pub const ALL: [Self; 5] = [
        Self::Gram,
        Self::Kilogram,
        Self::Milligram,
        Self::Mole,
        Self::Percent,
    ];

    /// Grams in one of this unit, for the units of mass; `None` for mol and % w/w.
    fn grams_per_unit(self) -> Option<f64> {
        match self {
            Self::Gram => Some(1.0),
            Self::Kilogram => Some(1e3),
            Self::Milligram => Some(1e-3),
            Self::Mole | Self::Percent => None,
        }
    }
}

/// An amount with its unit.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Amount {
    /// The number.
    pub value: f64,
    /// The unit.
    pub unit: Unit,
}

impl Amount {
    /// Grams.
    pub fn grams(value: f64) -> Self {
        Self {
            value,
            unit: Unit::Gram,
        }
    }

    /// Parses `20g`, `1.5 kg`, `250mg`, `0.1mol` or `2%`.
    pub fn parse(text: &str) -> Result<Self, String> {
        let t = text.trim();
        const UNITS: [(&str, Unit); 5] = [
            ("mol", Unit::Mole),
            ("kg", Unit::Kilogram),
            ("mg", Unit::Milligram),
            ("g", Unit::Gram),
            ("%", Unit::Percent),
        ];
        let Some((num, unit)) = UNITS
            .iter()
            .find_map(|(sym, u)| t.strip_suffix(sym).map(|n| (n.trim(), *u)))
        else {
            let tail: String = t
                .chars()
                .rev()
                .take_while(|c| c.is_alphabetic())
                .collect::<Vec<_>>()
                .into_iter()
                .rev()
                .collect();
            return Err(if tail.is_empty() {
                format!("'{t}' has no unit; write g, kg, mg, mol or % (e.g. 20g)")
            } else {
                format!("'{tail}' is not a unit; use g, kg, mg, mol or %")
            });
        };
        let value: f64 = num
            .parse()
            .map_err(|_| format!("'{num}' is not a number"))?;
        Ok(Self { value, unit })
    }

    /// Grams when the amount is a mass (g, kg, mg); `None` for mol and % w/w.
    pub fn grams_if_mass(self) -> Option<f64> {
        self.unit.grams_per_unit().map(|g| self.value * g)
    }

    /// Grams as supplied of an ingredient whose named substance has this molar mass and assay;
    /// `None` for % w/w, which needs the batch size.
    pub fn grams_as_supplied(self, molar_mass_g_per_mol: f64, assay: f64) -> Option<f64> {
        match self.unit {
            Unit::Mole => Some(self.value * molar_mass_g_per_mol / assay),
            Unit::Percent => None,
            _ => self.grams_if_mass(),
        }
    }
}

impl fmt::Display for Amount {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}{}", self.value, self.unit.symbol())
    }
}

/// The same mass of one ingredient written in another unit; `None` when % w/w is involved and
/// the batch size is unknown (or not above 0 for a result in %), or the result is not finite.
///
/// `molar_mass_g_per_mol` and `assay` are those of the ingredient's named substance; mol counts
/// the named substance, grams count the ingredient as supplied.
pub fn convert(
    amount: Amount,
    to: Unit,
    molar_mass_g_per_mol: f64,
    assay: f64,
    batch_g: Option<f64>,
) -> Option<f64> {
    let grams = match amount.grams_as_supplied(molar_mass_g_per_mol, assay) {
        Some(g) => g,
        None => amount.value / 100.0 * batch_g?,
    };
    let value = match to {
        Unit::Mole => grams * assay / molar_mass_g_per_mol,
        Unit::Percent => 100.0 * grams / batch_g.filter(|b| *b > 0.0)?,
        mass => grams / mass.grams_per_unit()?,
    };
    value.is_finite().then_some(value)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Sodium hydroxide, NaOH: 22.990 + 15.999 + 1.008 = 39.997 g/mol (IUPAC standard atomic
    /// weights, abridged).
    const NAOH_G_PER_MOL: f64 = 39.997;

    fn close(got: Option<f64>, expected: f64) -> bool {
        got.is_some_and(|g| (g - expected).abs() <= 1e-12 * expected.abs().max(1.0))
    }

    #[test]
    fn masses_convert_by_powers_of_ten() {
        // 1 kg = 1000 g = 1e6 mg (SI definitions).
        let kg = Amount {
            value: 1.5,
            unit: Unit::Kilogram,
        };
        assert!(close(kg.grams_if_mass(), 1500.0));
        assert!(close(convert(kg, Unit::Milligram, 1.0, 1.0, None), 1.5e6));
        let mg = Amount {
            value: 250.0,
            unit: Unit::Milligram,
        };
        assert!(close(mg.grams_if_mass(), 0.25));
        assert!(close(convert(mg, Unit::Kilogram, 1.0, 1.0, None), 2.5e-4));
    }

    #[test]
    fn only_masses_are_masses() {
        for unit in [Unit::Mole, Unit::Percent] {
            assert_eq!(Amount { value: 1.0, unit }.grams_if_mass(), None);
        }
    }

    #[test]
    fn moles_count_the_named_substance_not_the_water_of_the_assay() {
        // 0.5 mol NaOH as a 50 % solution: 0.5 × 39.997 / 0.5 = 39.997 g of solution (by hand).
        let mol = Amount {
            value: 0.5,
            unit: Unit::Mole,
        };
        assert!(close(
            mol.grams_as_supplied(NAOH_G_PER_MOL, 0.5),
            NAOH_G_PER_MOL
        ));
        assert!(close(
            convert(mol, Unit::Gram, NAOH_G_PER_MOL, 0.5, None),
            NAOH_G_PER_MOL
        ));
        // And back: 10 g of 50 % solution hold 5 g NaOH = 5 / 39.997 mol (by hand).
        assert!(close(
            convert(Amount::grams(10.0), Unit::Mole, NAOH_G_PER_MOL, 0.5, None),
            5.0 / NAOH_G_PER_MOL
        ));
    }

    #[test]
    fn percent_needs_the_batch_size() {
        // 2 % w/w of a 500 g batch is 10 g (definition of % w/w).
        let pct = Amount {
            value: 2.0,
            unit: Unit::Percent,
        };
        assert_eq!(pct.grams_as_supplied(NAOH_G_PER_MOL, 1.0), None);
        assert_eq!(convert(pct, Unit::Gram, NAOH_G_PER_MOL, 1.0, None), None);
        assert!(close(
            convert(pct, Unit::Gram, NAOH_G_PER_MOL, 1.0, Some(500.0)),
            10.0
        ));
        assert!(close(
            convert(Amount::grams(10.0), Unit::Percent, 1.0, 1.0, Some(500.0)),
            2.0
        ));
        assert_eq!(
            convert(Amount::grams(10.0), Unit::Percent, 1.0, 1.0, Some(0.0)),
            None
        );
    }

    #[test]
    fn impossible_conversions_give_nothing() {
        // A zero molar mass cannot turn grams into a finite number of moles.
        assert_eq!(
            convert(Amount::grams(1.0), Unit::Mole, 0.0, 1.0, None),
            None
        );
    }

    #[test]
    fn parsing_reads_the_unit_and_refuses_others() {
        let a = Amount::parse(" 1.5 kg ").unwrap();
        assert_eq!((a.value, a.unit), (1.5, Unit::Kilogram));
        assert_eq!(Amount::parse("2%").unwrap().unit, Unit::Percent);
        assert!(Amount::parse("20").unwrap_err().contains("no unit"));
        assert!(
            Amount::parse("20lb")
                .unwrap_err()
                .contains("'lb' is not a unit")
        );
        assert!(Amount::parse("xg").unwrap_err().contains("not a number"));
        assert_eq!(Amount::parse("0.1mol").unwrap().to_string(), "0.1mol");
    }
}
