//! An ingredient with what the loader derived from it: molar mass, solvent water and resolved releases.

use super::Ingredient;
use crate::amount::Amount;

/// A release resolved to library indices.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum ResolvedRelease {
    /// A spectator ion (or hydron/hydroxide) by index.
    Ion {
        /// Index into [`Library::ions`](super::Library::ions).
        ion: usize,
        /// Per formula unit.
        count: f64,
    },
    /// A system at a protonation level, by index.
    System {
        /// Index into [`Library::systems`](super::Library::systems).
        system: usize,
        /// Per formula unit.
        count: f64,
        /// Protons removed from the fully protonated form.
        form: u32,
    },
}

/// An ingredient with its derived quantities.
#[derive(Debug, Clone, PartialEq)]
pub struct Entry {
    /// The ingredient as written.
    pub ingredient: Ingredient,
    /// Molar mass of the named substance (hydrate included), g/mol.
    pub molar_mass_g_per_mol: f64,
    /// Mol of water added to the solvent per mol of substance.
    pub water_mol_per_mol: f64,
    /// What one formula unit releases, resolved.
    pub releases: Vec<ResolvedRelease>,
}

impl Entry {
    /// Grams as supplied of an amount; `None` for % w/w, which needs the batch size.
    pub fn grams(&self, amount: Amount) -> Option<f64> {
        amount.grams_as_supplied(self.molar_mass_g_per_mol, self.ingredient.assay)
    }
}
