//! The library's data as written in `assets/library.ron`: systems, ions and ingredients.

use serde::{Deserialize, Serialize};

/// An acid–base system: a fully protonated form and its stepwise acidity constants.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct System {
    /// Stable id, e.g. `citric`.
    pub id: String,
    /// Display name.
    pub name: String,
    /// Charge of the fully protonated form.
    pub charge_of_fully_protonated: i32,
    /// Names of the forms, fully protonated first (n + 1 names); empty means generated.
    #[serde(default)]
    pub forms: Vec<String>,
    /// Stepwise pKa values at 25 °C, in the order protons leave.
    pub pka: Vec<f64>,
    /// Standard enthalpy of each step, kJ/mol.
    pub dh_kj_mol: Vec<f64>,
    /// Heat-capacity change of each step, J/(mol·K); empty or shorter means 0 for the rest.
    #[serde(default)]
    pub dcp_j_mol_k: Vec<f64>,
    /// Ionic strength (mol/kg) at which the pKa values were measured; 0 means thermodynamic.
    #[serde(default)]
    pub pka_ionic_strength: f64,
    /// Ionic strength (mol/kg) of each step's pKa, where the steps were measured at different
    /// ionic strengths; empty means every step is at `pka_ionic_strength`.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub pka_ionic_strengths: Vec<f64>,
    /// Where every constant comes from.
    pub source: String,
}

impl System {
    /// Ionic strength (mol/kg) at which the pKa of step `k` (0-based) was measured.
    pub fn ionic_strength_of_step(&self, k: usize) -> f64 {
        self.pka_ionic_strengths
            .get(k)
            .copied()
            .unwrap_or(self.pka_ionic_strength)
    }
}

/// An ion that takes no part in acid–base equilibria (a spectator), or the reserved `hydron`/`hydroxide`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Ion {
    /// Stable id, e.g. `sodium`.
    pub id: String,
    /// Display formula, e.g. `Na+`.
    pub symbol: String,
    /// Charge.
    pub charge: i32,
    /// The strong acid or base it is the conjugate of, e.g. `sodium hydroxide, a strong base`.
    #[serde(default)]
    pub conjugate_of: String,
}

/// What one formula unit of an ingredient releases into water.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub enum Release {
    /// Ions of a spectator (or `hydron`/`hydroxide`).
    Ion {
        /// Ion id.
        id: String,
        /// How many per formula unit.
        count: u32,
    },
    /// An acid–base system at a protonation level.
    System {
        /// System id.
        id: String,
        /// How many per formula unit.
        count: u32,
        /// Protons removed from the fully protonated form.
        form: u32,
    },
}

/// A hazard class used for cautions.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
pub enum Hazard {
    /// A strong acid.
    StrongAcid,
    /// A strong alkali.
    StrongAlkali,
    /// Corrosive to skin and eyes as supplied.
    Corrosive,
    /// Irritant to skin or eyes as supplied.
    Irritant,
    /// Hypochlorite: releases chlorine with acids, chloramines with ammonium salts and amines.
    Hypochlorite,
    /// A source of ammonia.
    Ammonia,
    /// Carries a primary or secondary amine group (–NH₂, >NH): forms chloramines with
    /// hypochlorite, as ammonia does.
    Amine,
    /// Carries a tertiary amine group (no N–H): reacts with hypochlorite more slowly.
    TertiaryAmine,
    /// Harmful if swallowed or inhaled.
    Harmful,
    /// Oxidising.
    Oxidiser,
}

/// An ingredient as bought: a substance, its assay and what it releases.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Ingredient {
    /// Stable id, e.g. `sodium_hydroxide_50`.
    pub id: String,
    /// Display name.
    pub name: String,
    /// Formula of the named substance; hydrates as `·nH2O`.
    pub formula: String,
    /// Mass fraction of the named substance; the rest is water.
    #[serde(default = "one")]
    pub assay: f64,
    /// What one formula unit releases.
    pub releases: Vec<Release>,
    /// Water each formula unit adds to the solvent, if not its hydrate water (e.g. borax: 3).
    #[serde(default)]
    pub water_per_formula: Option<f64>,
    /// Hazards of the ingredient as supplied.
    #[serde(default)]
    pub hazards: Vec<Hazard>,
    /// Where the ingredient's data come from, and remarks.
    #[serde(default)]
    pub note: String,
}

fn one() -> f64 {
    1.0
}

/// The library file: systems, ions and ingredients.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct LibraryData {
    /// Acid–base systems.
    #[serde(default)]
    pub systems: Vec<System>,
    /// Spectator ions.
    #[serde(default)]
    pub ions: Vec<Ion>,
    /// Ingredients.
    #[serde(default)]
    pub ingredients: Vec<Ingredient>,
}
