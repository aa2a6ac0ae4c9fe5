//! Drift figures of a solved product: the pH change from a little strong acid or base getting in,
//! the pH it settles at open to air (CO₂ exchange), and the fraction of each system in its active form.
//!
//! Strong acid and base are added as H⁺ or OH⁻ with a monovalent spectator counter-ion (as HCl or
//! NaOH would bring), with the product's own activity model and temperature. "1 mmol per kg of product" is converted to molality by dividing the
//! moles by the water of the product: Δm = 1e-3 mol/kg × (batch mass in kg) / (water in kg), the
//! water mass itself left unchanged.
//!
//! Open to air, dissolved CO₂ (the fully protonated carbonic form, its activity) equals
//! K_H(T)·p(CO₂) with p(CO₂) = 420 µatm (420 ppm of dry air at 1 atm, water vapour neglected).
//! K_H(T), mol/(kg·atm), is the fit of Plummer & Busenberg, Geochim. Cosmochim. Acta 46 (1982)
//! 1011 (from memory): log K_H = 108.3865 + 0.01985076 T − 6919.53/T − 40.45154 log T + 669365/T²,
//! about 10^−1.47 = 0.034 at 25 °C. The total carbonate is free to change at constant alkalinity
//! (CO₂ is the fully protonated form, so taking it up or giving it off leaves the proton excess as
//! it is); the carbonate total is found by a bracketed 1-D root, since a(CO₂) rises with it.

use thiserror::Error;

use crate::library::Library;
use crate::recipe::Batch;
use crate::solver::{self, Composition, Constants, Guess, Solution, SystemState};

/// Partial pressure of CO₂ in air, atm (420 ppm by volume of dry air at 1 atm).
pub const CO2_AIR_ATM: f64 = 420e-6;

/// Library id of the carbonic acid system used for air exchange.
pub const CARBONIC_ID: &str = "carbonic";

/// Amount of strong acid or base of the drift figures, mmol per kg of product.
pub const DRIFT_MMOL_PER_KG: f64 = 1.0;

/// Why drift figures could not be computed.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum DriftError {
    /// The library has no carbonic acid system to exchange CO₂ with air.
    #[error(
        "the library has no '{CARBONIC_ID}' system, so exchange of CO2 with air cannot be computed"
    )]
    NoCarbonic,
    /// The product has no water.
    #[error("the product has no water, so drift figures cannot be computed")]
    NoWater,
    /// The carbonate total in equilibrium with air could not be bracketed.
    #[error(
        "no carbonate total up to {max_molal} mol/kg water brings dissolved CO2 to equilibrium with air"
    )]
    NoAirEquilibrium {
        /// Largest carbonate total tried, mol/kg water.
        max_molal: f64,
    },
}

/// How the pH of a product drifts.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Drift {
    /// pH change (signed) when 1 mmol of strong acid per kg of product gets in.
    pub acid_1mmol_per_kg: f64,
    /// pH change (signed) when 1 mmol of strong base per kg of product gets in.
    pub base_1mmol_per_kg: f64,
    /// pH the product settles at open to air (CO₂ at 420 ppm in equilibrium).
    pub open_to_air_ph: f64,
}

/// The fraction of one system in its active form at the product pH.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ActiveForm {
    /// Library index of the system.
    pub system: usize,
    /// Form index (protons removed from the fully protonated form).
    pub form: usize,
    /// Fraction of the system's total in that form.
    pub fraction: f64,
}

/// Henry's constant of CO₂, mol/(kg·atm), at a temperature in °C (Plummer & Busenberg 1982).
pub fn henry_co2(temp_c: f64) -> f64 {
    // Plummer & Busenberg, Geochim. Cosmochim. Acta 46 (1982) 1011, eq. for K_CO2 (from memory).
    let t = temp_c + solver::KELVIN_OFFSET;
    let log_k =
        108.3865 + 0.01985076 * t - 6919.53 / t - 40.45154 * t.log10() + 669_365.0 / (t * t);
    10f64.powf(log_k)
}

/// Molality (mol/kg water) of `mmol_per_kg` mmol per kg of product in a batch.
pub fn molality_per_kg_product(batch: &Batch, mmol_per_kg: f64) -> Result<f64, DriftError> {
    let water_kg = batch.totals.water_kg;
    if water_kg.partial_cmp(&0.0) != Some(std::cmp::Ordering::Greater) {
        return Err(DriftError::NoWater);
    }
    Ok(mmol_per_kg * 1e-3 * (batch.total_mass_g * 1e-3) / water_kg)
}

/// The composition with `molal` mol/kg water of strong acid added (negative: strong base).
///
/// H⁺ (or OH⁻) comes with a monovalent spectator counter-ion (as Cl⁻ or Na⁺), which keeps the
/// liquid electroneutral and counts in the ionic strength.
pub fn with_strong_acid(composition: &Composition, molal: f64) -> Composition {
    Composition {
        proton_excess: composition.proton_excess + molal,
        spectator_charge: composition.spectator_charge - molal,
        spectator_z2: composition.spectator_z2 + molal.abs(),
        spectator_abs_charge: composition.spectator_abs_charge + molal.abs(),
        ..composition.clone()
    }
}

/// The composition with the carbonic system's total set to `molal` mol/kg water, at constant alkalinity.
pub fn with_carbonate_total(composition: &Composition, carbonic: usize, molal: f64) -> Composition {
    let mut c = composition.clone();
    c.systems.retain(|(s, _)| *s != carbonic);
    if molal > 0.0 {
        c.systems.push((carbonic, molal));
        c.systems.sort_by_key(|(s, _)| *s);
    }
    c
}

/// Activity of dissolved CO₂ (the fully protonated carbonic form, neutral: γ = 1) at a solved state.
fn co2_activity(
    constants: &Constants,
    composition: &Composition,
    carbonic: usize,
    s: &Solution,
) -> f64 {
    solver::system_states(constants, composition, s)
        .iter()
        .find(|st| st.system == carbonic)
        .map_or(0.0, |st| st.molality(0))
}

/// Solves the product open to air: the carbonate total at which a(CO₂) = K_H(T)·p(CO₂).
pub fn open_to_air(
    library: &Library,
    constants: &Constants,
    composition: &Composition,
) -> Result<Solution, DriftError> {
    let carbonic = library
        .system_index(CARBONIC_ID)
        .ok_or(DriftError::NoCarbonic)?;
    let target = henry_co2(constants.conditions.temp_c) * CO2_AIR_ATM;
    let eval = |total: f64, guess: Option<Guess>| {
        let c = with_carbonate_total(composition, carbonic, total);
        let s = solver::solve(constants, &c, guess);
        let f = co2_activity(constants, &c, carbonic, &s) - target;
        (f, s)
    };
    let start = composition
        .systems
        .iter()
        .find(|(s, _)| *s == carbonic)
        .map_or(0.0, |(_, m)| *m);
    // a(CO₂) rises with the total; at a total of 0 it is 0, below the target.
    let mut lo = 0.0;
    let mut hi = start.max(target);
    let (mut f_hi, mut s_hi) = eval(hi, None);
    const MAX_MOLAL: f64 = 1e3;
    while f_hi < 0.0 {
        lo = hi;
        hi *= 4.0;
        if hi > MAX_MOLAL {
            return Err(DriftError::NoAirEquilibrium {
                max_molal: MAX_MOLAL,
            });
        }
        (f_hi, s_hi) = eval(hi, None);
    }
    if f_hi == 0.0 {
        return Ok(s_hi);
    }
    // Bisection on the bracket [lo, hi]: f(lo) < 0 < f(hi).
    let mut best = s_hi;
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        let guess = Guess {
            ph: best.ph,
            ionic_strength: best.ionic_strength,
        };
        let (f, s) = eval(mid, Some(guess));
        best = s;
        if f < 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
        if f == 0.0 || hi - lo <= 1e-13 * hi {
            break;
        }
    }
    // Re-solve at the final total from scratch, as a plain solve of that composition would.
    Ok(eval(0.5 * (lo + hi), None).1)
}

/// Drift figures of a solved product (`solution` is the solve of `composition` from `batch`).
pub fn drift(
    library: &Library,
    constants: &Constants,
    batch: &Batch,
    composition: &Composition,
    solution: &Solution,
) -> Result<Drift, DriftError> {
    let m = molality_per_kg_product(batch, DRIFT_MMOL_PER_KG)?;
    let guess = Some(Guess {
        ph: solution.ph,
        ionic_strength: solution.ionic_strength,
    });
    let acid = solver::solve(constants, &with_strong_acid(composition, m), guess);
    let base = solver::solve(constants, &with_strong_acid(composition, -m), guess);
    let air = open_to_air(library, constants, composition)?;
    Ok(Drift {
        acid_1mmol_per_kg: acid.ph - solution.ph,
        base_1mmol_per_kg: base.ph - solution.ph,
        open_to_air_ph: air.ph,
    })
}

/// The default active form of a system state: its uncharged form if it has one, else the fully protonated form.
pub fn default_active_form(state: &SystemState) -> usize {
    state.charges.iter().position(|&z| z == 0).unwrap_or(0)
}

/// The fraction of each system in its default active form (see [`default_active_form`]).
pub fn active_forms(systems: &[SystemState]) -> Vec<ActiveForm> {
    active_forms_chosen(systems, |_| None)
}

/// The fraction of each system in the form `chosen` gives for its library index, or in its
/// default active form where `chosen` gives none or a form the system does not have.
pub fn active_forms_chosen(
    systems: &[SystemState],
    chosen: impl Fn(usize) -> Option<usize>,
) -> Vec<ActiveForm> {
    systems
        .iter()
        .map(|st| {
            let form = chosen(st.system)
                .filter(|&f| f < st.fractions.len())
                .unwrap_or_else(|| default_active_form(st));
            ActiveForm {
                system: st.system,
                form,
                fraction: st.fractions.get(form).copied().unwrap_or(0.0),
            }
        })
        .collect()
}
