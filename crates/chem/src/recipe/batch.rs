//! A recipe resolved into a batch: the mass of every line, q.s. water and the molal totals.

use super::{Recipe, Totals};
use crate::error::RecipeError;
use crate::library::{Library, WATER};
use crate::solver::Composition;

/// One recipe line resolved to masses and moles.
#[derive(Debug, Clone, PartialEq)]
pub struct LineMass {
    /// Library index of the ingredient.
    pub entry: usize,
    /// Mass as supplied, g (0 when the line is off).
    pub mass_g: f64,
    /// Mol of the named substance.
    pub substance_mol: f64,
    /// Water the line brings, g.
    pub water_g: f64,
    /// Whether the line counts.
    pub enabled: bool,
}

/// A recipe resolved into a batch: masses, water and molal totals.
#[derive(Debug, Clone, PartialEq)]
pub struct Batch {
    /// One per recipe line, in order.
    pub lines: Vec<LineMass>,
    /// Water added q.s., g.
    pub qs_water_g: f64,
    /// Mass of the whole batch, g.
    pub total_mass_g: f64,
    /// Everything the batch holds.
    pub totals: Totals,
}

impl Batch {
    /// Molal totals for the solver.
    pub fn composition(&self, library: &Library) -> Result<Composition, RecipeError> {
        self.totals.composition(library).ok_or(RecipeError::NoWater)
    }

    /// A part of the batch weighing `mass_g`, everything in it in proportion (as a sample taken from it).
    pub fn scaled_to(&self, mass_g: f64) -> Batch {
        let f = if self.total_mass_g > 0.0 {
            mass_g / self.total_mass_g
        } else {
            0.0
        };
        Batch {
            lines: self
                .lines
                .iter()
                .map(|l| LineMass {
                    mass_g: l.mass_g * f,
                    substance_mol: l.substance_mol * f,
                    water_g: l.water_g * f,
                    ..l.clone()
                })
                .collect(),
            qs_water_g: self.qs_water_g * f,
            total_mass_g: mass_g,
            totals: self.totals.scaled(f),
        }
    }

    /// Molality (mol/kg water) of the named substance of line `i`.
    pub fn line_molality(&self, i: usize) -> f64 {
        self.lines.get(i).map_or(0.0, |l| {
            if self.totals.water_kg > 0.0 {
                l.substance_mol / self.totals.water_kg
            } else {
                0.0
            }
        })
    }
}

impl Recipe {
    /// Resolves the recipe into masses and molal totals.
    pub fn batch(&self, library: &Library) -> Result<Batch, RecipeError> {
        let mut fixed_g = 0.0;
        let mut percent = 0.0;
        let mut resolved = Vec::with_capacity(self.lines.len());
        for line in &self.lines {
            let Some(entry) = library.entry_index(&line.ingredient) else {
                return Err(RecipeError::UnknownIngredient {
                    id: line.ingredient.clone(),
                    suggestions: library.suggest(&line.ingredient),
                });
            };
            let v = line.amount.value;
            crate::limits::AMOUNT.check_as(v, &format!("amount of {}", line.ingredient))?;
            let e = &library.entries()[entry];
            let grams = e.grams(line.amount);
            if line.enabled {
                match grams {
                    Some(g) => fixed_g += g,
                    None => percent += v,
                }
            }
            resolved.push((entry, grams, line));
        }
        if let Some(qs) = self.qs_to_g {
            crate::limits::BATCH_G.check(qs)?;
        }
        let total_g = match self.qs_to_g {
            Some(qs) => qs,
            None if percent > 0.0 && fixed_g == 0.0 => 100.0,
            None if percent >= 100.0 => {
                return Err(RecipeError::BadUnit {
                    id: "recipe".into(),
                    message: format!(
                        "the % w/w lines add up to {percent} %, leaving nothing for the lines in g"
                    ),
                });
            }
            None => fixed_g / (1.0 - percent / 100.0),
        };
        let mut totals = Totals::zero(library);
        let mut lines = Vec::with_capacity(resolved.len());
        let mut used_g = 0.0;
        for (entry, grams, line) in resolved {
            let mass_g = if line.enabled {
                grams.unwrap_or(line.amount.value / 100.0 * total_g)
            } else {
                0.0
            };
            let water_before = totals.water_kg;
            totals.add(library, entry, mass_g);
            used_g += mass_g;
            let e = &library.entries()[entry];
            lines.push(LineMass {
                entry,
                mass_g,
                substance_mol: mass_g * e.ingredient.assay / e.molar_mass_g_per_mol,
                water_g: (totals.water_kg - water_before) * 1e3,
                enabled: line.enabled,
            });
        }
        let qs_water_g = match self.qs_to_g {
            Some(qs) => {
                let rest = qs - used_g;
                if rest < -1e-9 * qs {
                    return Err(RecipeError::OverfullBatch {
                        qs_g: qs,
                        solids_g: used_g,
                    });
                }
                rest.max(0.0)
            }
            None => 0.0,
        };
        if qs_water_g > 0.0 {
            if let Some(w) = library.entry_index(WATER) {
                totals.add(library, w, qs_water_g);
            } else {
                totals.water_kg += qs_water_g * 1e-3;
            }
        }
        if totals.water_kg.partial_cmp(&0.0) != Some(std::cmp::Ordering::Greater) {
            return Err(RecipeError::NoWater);
        }
        let mut batch = Batch {
            lines,
            qs_water_g,
            total_mass_g: used_g + qs_water_g,
            totals,
        };
        if let Some(h) = &self.water_hardness {
            h.check()?;
            let water_g = self.water_lines_g(library, &batch);
            batch.totals.add_hardness(library, h, water_g);
        }
        Ok(batch)
    }
}
