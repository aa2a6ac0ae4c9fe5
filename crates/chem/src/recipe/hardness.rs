//! The hardness of the water a recipe is made with: calcium and magnesium in ppm as CaCO₃.

use serde::{Deserialize, Serialize};

use super::Totals;
use crate::error::RecipeError;
use crate::library::Library;

/// Molar mass of CaCO₃, g/mol (IUPAC 2021 standard atomic weights, from memory), the basis of
/// "ppm as CaCO₃".
pub const CACO3_G_PER_MOL: f64 = 100.086;

/// Highest hardness accepted, ppm as CaCO₃ (sea water is about 6 500; common practice, no source).
pub const MAX_PPM: f64 = 10_000.0;

/// The anion that comes with the hardness.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum HardnessAnion {
    /// Hydrogen carbonate, as in most natural water (carbonate or "temporary" hardness).
    #[default]
    HydrogenCarbonate,
    /// Chloride ("permanent" hardness, no alkalinity).
    Chloride,
}

/// The hardness of the water lines and the q.s. water of a recipe.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Hardness {
    /// Total hardness (Ca²⁺ plus Mg²⁺), mg/kg of water as CaCO₃.
    pub ppm_caco3: f64,
    /// Share of the hardness that is calcium (mol fraction); the rest is magnesium.
    #[serde(default = "default_calcium_share")]
    pub calcium_share: f64,
    /// The anion that comes with it.
    #[serde(default)]
    pub anion: HardnessAnion,
}

/// A usual calcium share of tap water hardness (common practice, no source).
pub const DEFAULT_CALCIUM_SHARE: f64 = 0.7;

fn default_calcium_share() -> f64 {
    DEFAULT_CALCIUM_SHARE
}

impl Hardness {
    /// Hardness of a given ppm as CaCO₃ with the usual calcium share and hydrogen carbonate.
    pub fn ppm(ppm_caco3: f64) -> Self {
        Self {
            ppm_caco3,
            calcium_share: DEFAULT_CALCIUM_SHARE,
            anion: HardnessAnion::default(),
        }
    }

    /// Checks the values against their ranges.
    pub fn check(&self) -> Result<(), RecipeError> {
        crate::limits::HARDNESS_PPM.check(self.ppm_caco3)?;
        crate::limits::CALCIUM_SHARE.check(self.calcium_share)?;
        Ok(())
    }

    /// Mol of Ca²⁺ plus Mg²⁺ per kg of water.
    pub fn mol_per_kg(&self) -> f64 {
        self.ppm_caco3 * 1e-3 / CACO3_G_PER_MOL
    }
}

impl Totals {
    /// Adds the hardness that `water_g` grams of hard water bring (its salts' mass, a few
    /// hundred mg per kg, is not added to the batch).
    pub fn add_hardness(&mut self, library: &Library, hardness: &Hardness, water_g: f64) {
        let mol = hardness.mol_per_kg() * water_g * 1e-3;
        if mol <= 0.0 {
            return;
        }
        let (Some(ca), Some(mg)) = (library.ion_index("calcium"), library.ion_index("magnesium"))
        else {
            return;
        };
        self.ion_mol[ca] += mol * hardness.calcium_share;
        self.ion_mol[mg] += mol * (1.0 - hardness.calcium_share);
        match hardness.anion {
            HardnessAnion::Chloride => {
                if let Some(cl) = library.ion_index("chloride") {
                    self.ion_mol[cl] += 2.0 * mol;
                }
            }
            HardnessAnion::HydrogenCarbonate => {
                if let Some(carbonic) = library.system_index("carbonic") {
                    // HCO₃⁻ is form 1: one proton removed from the reference level.
                    self.system_mol[carbonic] += 2.0 * mol;
                    self.proton_excess_mol -= 2.0 * mol;
                }
            }
        }
    }
}
