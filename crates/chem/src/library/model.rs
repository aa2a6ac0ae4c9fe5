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
    /// Pitzer interaction parameters of the concentrate activity model.
    #[serde(default, skip_serializing_if = "PitzerData::is_empty")]
    pub pitzer: PitzerData,
    /// Complexes and ion pairs of a metal ion with one ligand.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub complexes: Vec<Complex>,
    /// Sparingly soluble solids whose saturation is reported.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub solids: Vec<Solid>,
}

/// Pitzer parameters at 25 °C, each naming its source.
///
/// Species are named by ion id (`sodium`) or as `SYSTEM/FORM`, FORM the protons removed
/// (`carbonic/2` is CO₃²⁻).
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct PitzerData {
    /// Cation–anion parameters β⁽⁰⁾, β⁽¹⁾, β⁽²⁾ and C^φ.
    #[serde(default)]
    pub pairs: Vec<PitzerPair>,
    /// θ of two ions of the same sign.
    #[serde(default)]
    pub mixing: Vec<PitzerMixing>,
    /// ψ of two ions of the same sign with one of the other sign.
    #[serde(default)]
    pub triples: Vec<PitzerTriple>,
}

impl PitzerData {
    /// Whether no parameter is given.
    pub fn is_empty(&self) -> bool {
        self.pairs.is_empty() && self.mixing.is_empty() && self.triples.is_empty()
    }
}

/// Pitzer parameters of one cation–anion pair.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct PitzerPair {
    /// The cation.
    pub cation: String,
    /// The anion.
    pub anion: String,
    /// β⁽⁰⁾, kg/mol.
    pub beta0: f64,
    /// β⁽¹⁾, kg/mol.
    pub beta1: f64,
    /// β⁽²⁾, kg/mol (2:2 pairs).
    #[serde(default)]
    pub beta2: f64,
    /// C^φ, kg²/mol².
    #[serde(default)]
    pub c_phi: f64,
    /// Where the values come from.
    pub source: String,
}

/// θ of two ions of the same sign.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct PitzerMixing {
    /// The two ions.
    pub ions: (String, String),
    /// θ, kg/mol.
    pub theta: f64,
    /// Where the value comes from.
    pub source: String,
}

/// ψ of two ions of the same sign with one ion of the other sign.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct PitzerTriple {
    /// The two ions of the same sign.
    pub ions: (String, String),
    /// The ion of the other sign.
    pub with: String,
    /// ψ, kg²/mol².
    pub psi: f64,
    /// Where the value comes from.
    pub source: String,
}

/// A complex (or ion pair) of a metal ion with its ligands: M + n L ⇌ MLn.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Complex {
    /// Stable id, e.g. `calcium_edta`.
    pub id: String,
    /// The metal ion's id, e.g. `calcium`.
    pub metal: String,
    /// The ligand: `hydroxide` or a form of a system as `SYSTEM/FORM`.
    pub ligand: String,
    /// How many ligands the complex holds (M + n L ⇌ MLn); above 1 only for `hydroxide`.
    #[serde(default = "one_ligand")]
    pub ligand_count: u32,
    /// log10 of the formation constant at 25 °C, molal, at `ionic_strength`.
    pub log_k: f64,
    /// Ionic strength (mol/kg) at which `log_k` was measured; 0 means thermodynamic.
    #[serde(default)]
    pub ionic_strength: f64,
    /// Standard enthalpy of formation of the complex from M and L, kJ/mol.
    #[serde(default)]
    pub dh_kj_mol: f64,
    /// Where the values come from.
    pub source: String,
}

/// The usual ligand count of a complex: one.
fn one_ligand() -> u32 {
    1
}

/// A sparingly soluble solid and its solubility product.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Solid {
    /// Mineral or chemical name used as id, e.g. `calcite`.
    pub id: String,
    /// Display name, e.g. `calcite (CaCO₃)`.
    pub name: String,
    /// Formula for its molar mass, e.g. `CaCO3` or `CaSO4·2H2O` (empty when not given).
    #[serde(default)]
    pub formula: String,
    /// The ions one formula unit dissolves into, each with its count.
    pub components: Vec<(String, u32)>,
    /// log10 Ksp at 25 °C, I = 0 (activity product at saturation).
    pub log_ksp: f64,
    /// Standard enthalpy of dissolution, kJ/mol.
    #[serde(default)]
    pub dh_kj_mol: f64,
    /// Where the values come from.
    pub source: String,
}
