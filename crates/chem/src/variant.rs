//! Variants of one project's recipe (name, lines, ingredient prices) and the figures that set
//! them side by side: pH, buffer capacity, ionic strength, buffer-forming grams, cost, cautions.

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};

use crate::error::RecipeError;
use crate::hazard::{self, DEFER_TITLE};
use crate::library::{Library, ResolvedRelease};
use crate::recipe::{Batch, Recipe};
use crate::report::{Report, evaluate_with};
use crate::solver::Constants;

/// The ingredient id counted free of charge unless the user prices it (q.s. water too).
pub const WATER_ID: &str = "water";
/// The longest variant name accepted, in characters.
pub const MAX_NAME_CHARS: usize = 80;

/// One variant of a project's recipe.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Variant {
    /// Name shown in the table and the chart legend; unique within a project.
    pub name: String,
    /// The lines and q.s. batch size.
    pub recipe: Recipe,
    /// Price per kg of each ingredient as bought, by ingredient id, in one currency.
    #[serde(default)]
    pub prices: BTreeMap<String, f64>,
}

impl Variant {
    /// A variant with no prices.
    pub fn new(name: &str, recipe: Recipe) -> Self {
        Self {
            name: name.to_owned(),
            recipe,
            prices: BTreeMap::new(),
        }
    }
}

/// Why a variant name is refused, in plain words; `None` when it is fine.
pub fn name_problem(name: &str, others: impl IntoIterator<Item = String>) -> Option<String> {
    let trimmed = name.trim();
    if trimmed.is_empty() {
        return Some("a variant needs a name".into());
    }
    if trimmed.chars().count() > MAX_NAME_CHARS {
        return Some(format!(
            "variant name '{trimmed}' is longer than {MAX_NAME_CHARS} characters"
        ));
    }
    if others.into_iter().any(|o| o.trim() == trimmed) {
        return Some(format!(
            "there is already a variant called '{trimmed}'; names must differ"
        ));
    }
    None
}

/// A name for a copy of `base` that none of `taken` has: "base (copy)", "base (copy 2)", …
pub fn copy_name(base: &str, taken: &[&str]) -> String {
    let stem: String = base.trim().chars().take(MAX_NAME_CHARS - 12).collect();
    let free = |n: &str| !taken.iter().any(|t| t.trim() == n);
    let first = format!("{stem} (copy)");
    if free(&first) {
        return first;
    }
    (2..)
        .map(|k| format!("{stem} (copy {k})"))
        .find(|n| free(n))
        .unwrap_or(first)
}

/// Cost of the product per kg from the variant's prices, and the ids of the enabled lines
/// that have no price (the cost is then `None`). Water is free unless priced.
pub fn cost_per_kg(
    library: &Library,
    variant: &Variant,
    batch: &Batch,
) -> (Option<f64>, Vec<String>) {
    let mut missing: Vec<String> = Vec::new();
    let mut cost = 0.0;
    for line in batch.lines.iter().filter(|l| l.enabled) {
        let id = &library.entries()[line.entry].ingredient.id;
        match variant.prices.get(id) {
            Some(p) => cost += p * line.mass_g / 1000.0,
            None if id == WATER_ID => {}
            None => {
                if !missing.contains(id) {
                    missing.push(id.clone());
                }
            }
        }
    }
    cost += variant.prices.get(WATER_ID).copied().unwrap_or(0.0) * batch.qs_water_g / 1000.0;
    if !missing.is_empty() || batch.total_mass_g <= 0.0 {
        return (None, missing);
    }
    (Some(cost / (batch.total_mass_g / 1000.0)), missing)
}

/// Grams per kg of product, as weighed, of the enabled lines that bring a weak acid–base
/// system (the ingredients that form the buffer).
pub fn buffer_forming_g_per_kg(library: &Library, batch: &Batch) -> f64 {
    if batch.total_mass_g <= 0.0 {
        return 0.0;
    }
    let g: f64 = batch
        .lines
        .iter()
        .filter(|l| l.enabled)
        .filter(|l| {
            library.entries()[l.entry]
                .releases
                .iter()
                .any(|r| matches!(r, ResolvedRelease::System { .. }))
        })
        .map(|l| l.mass_g)
        .sum();
    g / (batch.total_mass_g / 1000.0)
}

/// One variant's row of the side-by-side table.
#[derive(Debug, Clone, PartialEq)]
pub struct Summary {
    /// The variant's name.
    pub name: String,
    /// pH (activity scale).
    pub ph: f64,
    /// p\[H\]: −log10 of the hydrogen-ion molality.
    pub p_h_conc: f64,
    /// Buffer capacity at the product pH, mol/kg water per pH.
    pub buffer_capacity: f64,
    /// Ionic strength, mol/kg water.
    pub ionic_strength: f64,
    /// Grams of buffer-forming ingredients per kg of product, as weighed.
    pub buffer_forming_g_per_kg: f64,
    /// Cost per kg of product; `None` when a line has no price.
    pub cost_per_kg: Option<f64>,
    /// Ingredient ids without a price.
    pub missing_prices: Vec<String>,
    /// The titles of the cautions, the closing deferral left out.
    pub cautions: Vec<String>,
    /// Validity warnings of the solve.
    pub warnings: Vec<String>,
}

/// Solves one variant at the project's conditions and gathers its row of the table.
pub fn summarise(
    library: &Library,
    constants: &Constants,
    variant: &Variant,
    adjuster: Option<&str>,
) -> Result<Summary, RecipeError> {
    let report = evaluate_with(library, constants, &variant.recipe)?;
    Ok(summary_of(library, constants, variant, &report, adjuster))
}

/// A variant's row of the table from its report, already solved at the project's conditions.
pub fn summary_of(
    library: &Library,
    constants: &Constants,
    variant: &Variant,
    report: &Report,
    adjuster: Option<&str>,
) -> Summary {
    let s = &report.solution;
    let cautions = hazard::assemble(library, constants, &report.batch, Some(s), adjuster);
    let (cost, missing) = cost_per_kg(library, variant, &report.batch);
    Summary {
        name: variant.name.clone(),
        ph: s.ph,
        p_h_conc: s.p_h_conc,
        buffer_capacity: s.buffer_capacity,
        ionic_strength: s.ionic_strength,
        buffer_forming_g_per_kg: buffer_forming_g_per_kg(library, &report.batch),
        cost_per_kg: cost,
        missing_prices: missing,
        cautions: cautions
            .iter()
            .filter(|c| c.title != DEFER_TITLE)
            .map(|c| c.title.clone())
            .collect(),
        warnings: report.warnings.clone(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn copy_names_do_not_clash() {
        assert_eq!(copy_name("A", &["A"]), "A (copy)");
        assert_eq!(copy_name("A", &["A", "A (copy)"]), "A (copy 2)");
        assert_eq!(
            copy_name("A", &["A", "A (copy)", "A (copy 2)"]),
            "A (copy 3)"
        );
    }

    #[test]
    fn names_are_checked() {
        assert!(name_problem("  ", Vec::new()).is_some());
        assert!(name_problem("B", vec!["B ".to_string()]).is_some());
        assert!(name_problem(&"x".repeat(81), Vec::new()).is_some());
        assert_eq!(name_problem("B", vec!["A".to_string()]), None);
    }
}
