//! Chelant capacity: the hardness a recipe's ligands hold at its pH, and how much of each is
//! already bound.
//!
//! The capacity is the calcium the ligands bind, at the recipe's pH and ionic strength, while
//! the free Ca²⁺ is held at [`FREE_CALCIUM`] (about 1 ppm as CaCO₃: water counted as soft),
//! calcium alone (no competition from magnesium or other metals), expressed as ppm of
//! hardness as CaCO₃ per kg of product. It is a sequestering figure, not a titration result.

use crate::library::{Library, Species};
use crate::recipe::{Batch, CACO3_G_PER_MOL};
use crate::solver::{self, Composition, Constants, Solution, SystemState};

/// Free Ca²⁺ molality at which the capacity is read, mol/kg water (1 ppm as CaCO₃; common
/// practice for "soft", no source).
pub const FREE_CALCIUM: f64 = 1e-5;

/// One ligand system's part.
#[derive(Debug, Clone, PartialEq)]
pub struct Chelant {
    /// System id.
    pub system: String,
    /// Hardness it holds at the recipe's pH, ppm as CaCO₃ of product.
    pub capacity_ppm: f64,
    /// Fraction of it bound to metals in the recipe as made.
    pub bound_fraction: f64,
}

/// The chelant capacity of a recipe.
#[derive(Debug, Clone, PartialEq)]
pub struct Capacity {
    /// Total hardness held, ppm as CaCO₃ of product.
    pub ppm_caco3: f64,
    /// Each system that binds calcium, largest capacity first.
    pub chelants: Vec<Chelant>,
}

/// The chelant capacity of a solved batch.
pub fn capacity(
    library: &Library,
    constants: &Constants,
    batch: &Batch,
    composition: &Composition,
    solution: &Solution,
    systems: &[SystemState],
) -> Option<Capacity> {
    let calcium = library.ion_index("calcium")?;
    let kg_water_per_kg_product = batch.totals.water_kg / (batch.total_mass_g * 1e-3);
    let gammas = solver::charge_gammas(constants, solution);
    let mut chelants = Vec::new();
    for (slot, &(system, total)) in composition.systems.iter().enumerate() {
        let q =
            solver::fractions_against_ph(constants, system, solution.ionic_strength, [solution.ph]);
        let Some((_, q)) = q.first() else { continue };
        let mut a_sum = 0.0;
        for c in constants.complexes.iter().filter(|c| c.metal == calcium) {
            if let Species::Form { system: s, form } = c.ligand
                && s == system
            {
                let z_l = constants.z0(system) - form as i32;
                let k = c.k * gammas(2) * gammas(z_l) / gammas(c.charge);
                a_sum += k * q[form] * FREE_CALCIUM;
            }
        }
        if a_sum <= 0.0 {
            continue;
        }
        let bound_mol = total * a_sum / (1.0 + a_sum);
        chelants.push(Chelant {
            system: library.systems()[system].id.clone(),
            capacity_ppm: bound_mol * kg_water_per_kg_product * CACO3_G_PER_MOL * 1e3,
            bound_fraction: systems.get(slot).map_or(0.0, |s| s.bound),
        });
    }
    chelants.sort_by(|a, b| b.capacity_ppm.total_cmp(&a.capacity_ppm));
    Some(Capacity {
        ppm_caco3: chelants.iter().map(|c| c.capacity_ppm).sum(),
        chelants,
    })
}
