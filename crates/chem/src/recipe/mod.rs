//! A recipe by mass: lines of ingredients with amounts and an optional q.s. water target.
//!
//! [`Totals`] (`totals.rs`) counts the moles a batch holds; [`Batch`] (`batch.rs`) is a recipe
//! resolved to masses, water and molal totals.

mod batch;
pub(crate) mod hardness;
mod totals;

use serde::{Deserialize, Serialize};

use crate::amount::Amount;
use crate::library::Library;

pub use batch::{Batch, LineMass};
pub use hardness::{CACO3_G_PER_MOL, DEFAULT_CALCIUM_SHARE, Hardness, HardnessAnion};
pub use totals::Totals;

/// One line of a recipe.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RecipeLine {
    /// Ingredient id.
    pub ingredient: String,
    /// Amount.
    pub amount: Amount,
    /// Whether the line counts (off for a what-if without deleting it).
    #[serde(default = "yes")]
    pub enabled: bool,
}

fn yes() -> bool {
    true
}

impl RecipeLine {
    /// A line of an ingredient in grams.
    pub fn grams(ingredient: &str, mass_g: f64) -> Self {
        Self {
            ingredient: ingredient.to_owned(),
            amount: Amount::grams(mass_g),
            enabled: true,
        }
    }

    /// A line of an ingredient in mol of its named substance.
    pub fn moles(ingredient: &str, mol: f64) -> Self {
        Self {
            ingredient: ingredient.to_owned(),
            amount: Amount {
                value: mol,
                unit: crate::amount::Unit::Mole,
            },
            enabled: true,
        }
    }
}

/// A recipe: ingredient lines and an optional q.s. water target for the batch.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct Recipe {
    /// The lines, in the order the formulator wrote them.
    pub lines: Vec<RecipeLine>,
    /// Batch size in g when water is added q.s. to it.
    #[serde(default)]
    pub qs_to_g: Option<f64>,
    /// Hardness of the water lines and q.s. water; none means purified water.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub water_hardness: Option<Hardness>,
}

impl Recipe {
    /// A recipe of (ingredient id, grams as supplied) lines, all enabled, without q.s. water.
    pub fn in_grams(items: &[(&str, f64)]) -> Self {
        Self {
            lines: items
                .iter()
                .map(|&(id, mass_g)| RecipeLine::grams(id, mass_g))
                .collect(),
            qs_to_g: None,
            water_hardness: None,
        }
    }

    /// Grams of plain water in the batch: the `water` lines and the q.s. water.
    pub fn water_lines_g(&self, library: &Library, batch: &Batch) -> f64 {
        let water = library.entry_index(crate::library::WATER);
        batch
            .lines
            .iter()
            .filter(|l| Some(l.entry) == water)
            .map(|l| l.mass_g)
            .sum::<f64>()
            + batch.qs_water_g
    }
}
