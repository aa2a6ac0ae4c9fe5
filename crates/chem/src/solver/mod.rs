//! The equilibrium solver: constants at a temperature, the charge balance and its safeguarded Newton.
//!
//! The pieces are kept apart so that more unknowns (free metal and free ligand for complexation
//! and precipitation) can join later: `species.rs` turns free activities into every species'
//! molality; `balance.rs` sums them into residuals and their derivatives; `newton.rs` drives the
//! unknowns to zero residual inside a bracket; the outer loop here makes the ionic strength
//! self-consistent.

pub mod activity;
mod balance;
mod newton;
mod species;
pub mod temperature;
pub mod water;

use serde::{Deserialize, Serialize};

pub use activity::ActivityModel;
pub use species::SystemState;

use crate::library::Library;

/// 0 °C in kelvin.
pub const KELVIN_OFFSET: f64 = 273.15;
/// Lowest pH the solver searches.
pub const PH_MIN: f64 = -2.0;
/// Highest pH the solver searches.
pub const PH_MAX: f64 = 16.0;
/// Lowest temperature of the temperature model, °C.
pub const TEMP_MIN_C: f64 = 0.0;
/// Highest temperature of the temperature model, °C.
pub const TEMP_MAX_C: f64 = 95.0;
/// Largest charge magnitude of any species the solver handles.
const MAX_CHARGE: i32 = 12;

/// Temperature and activity model of a solve.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Conditions {
    /// Temperature, °C.
    pub temp_c: f64,
    /// Activity model.
    pub activity: ActivityModel,
}

impl Default for Conditions {
    fn default() -> Self {
        Self {
            temp_c: 25.0,
            activity: ActivityModel::Davies,
        }
    }
}

/// Every constant a solve needs at one temperature: Kw, A, and each system's Ka values.
#[derive(Debug, Clone, PartialEq)]
pub struct Constants {
    /// The conditions these constants are for.
    pub conditions: Conditions,
    /// Ion product of water (molal², activity basis).
    pub kw: f64,
    /// Debye–Hückel A of the Davies equation.
    pub davies_a: f64,
    /// Per system: charge of the fully protonated form.
    z0: Vec<i32>,
    /// Per system: start of its Ka values in `ka`.
    ka_start: Vec<usize>,
    /// Thermodynamic Ka values of every step of every system, at the temperature.
    ka: Vec<f64>,
}

impl Constants {
    /// Computes the constants of every library system at the given conditions.
    pub fn new(library: &Library, conditions: Conditions) -> Self {
        let temp_k = conditions.temp_c + KELVIN_OFFSET;
        let a25 = activity::debye_huckel_a(25.0);
        let mut z0 = Vec::with_capacity(library.systems().len());
        let mut ka_start = Vec::with_capacity(library.systems().len() + 1);
        let mut ka = Vec::new();
        for s in library.systems() {
            z0.push(s.charge_of_fully_protonated);
            ka_start.push(ka.len());
            // Constants measured at an ionic strength are brought to I = 0 with Davies at 25 °C,
            // each step at the ionic strength it was measured at.
            for (k, &pka_i) in s.pka.iter().enumerate() {
                let f = activity::davies_function(s.ionic_strength_of_step(k));
                let z_acid = s.charge_of_fully_protonated - k as i32;
                let pka0 = pka_i + a25 * f * f64::from(2 - 2 * z_acid);
                let dcp = s.dcp_j_mol_k.get(k).copied().unwrap_or(0.0);
                let pka_t = temperature::pka_at(pka0, s.dh_kj_mol[k], dcp, temp_k);
                ka.push(10f64.powf(-pka_t));
            }
        }
        ka_start.push(ka.len());
        Self {
            conditions,
            kw: 10f64.powf(-water::pkw(conditions.temp_c)),
            davies_a: activity::debye_huckel_a(conditions.temp_c),
            z0,
            ka_start,
            ka,
        }
    }

    /// Thermodynamic Ka values of one system at this temperature.
    pub fn ka(&self, system: usize) -> &[f64] {
        &self.ka[self.ka_start[system]..self.ka_start[system + 1]]
    }

    /// Charge of a system's fully protonated form.
    pub fn z0(&self, system: usize) -> i32 {
        self.z0[system]
    }

    /// pKw at this temperature.
    pub fn pkw(&self) -> f64 {
        -self.kw.log10()
    }
}

/// Molal totals of a solution: what the charge balance needs.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Composition {
    /// Total molality of each system present, by library system index.
    pub systems: Vec<(usize, f64)>,
    /// Σ z·m over spectator ions, mol/kg.
    pub spectator_charge: f64,
    /// Σ z²·m over spectator ions, mol/kg.
    pub spectator_z2: f64,
    /// Σ |z|·m over spectator ions, mol/kg (the scale of the charge balance).
    pub spectator_abs_charge: f64,
    /// Protons in excess of the reference levels (fully protonated systems, neutral water), mol/kg.
    pub proton_excess: f64,
}

/// How a solve ended.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum SolveStatus {
    /// Charge balance and ionic strength converged.
    Converged,
    /// The root lies below the lowest pH searched (the solution is more acidic than the model covers).
    BelowRange,
    /// The root lies above the highest pH searched.
    AboveRange,
    /// The iteration limit was reached; the values are the last iterate.
    NotConverged,
}

/// A solved equilibrium state.
#[derive(Debug, Clone, PartialEq)]
pub struct Solution {
    /// pH as a meter reads it, −log10 a(H⁺).
    pub ph: f64,
    /// p\[H\], −log10 of the H⁺ molality.
    pub p_h_conc: f64,
    /// Ionic strength, mol/kg.
    pub ionic_strength: f64,
    /// Buffer capacity β = dC_b/dpH, mol/kg per pH unit (at fixed activity coefficients).
    pub buffer_capacity: f64,
    /// Molality of free H⁺.
    pub h_molal: f64,
    /// Molality of free OH⁻.
    pub oh_molal: f64,
    /// Charge-balance residual relative to the sum of charge magnitudes.
    pub charge_residual: f64,
    /// Proton-balance residual relative to the larger of its own terms and the charge-balance scale.
    pub proton_residual: f64,
    /// Newton iterations in total.
    pub iterations: u32,
    /// Outer (ionic strength) iterations.
    pub outer_iterations: u32,
    /// How the solve ended.
    pub status: SolveStatus,
}

impl Solution {
    /// Whether the solve converged inside the searched range.
    pub fn converged(&self) -> bool {
        self.status == SolveStatus::Converged
    }
}

/// A starting point for a solve (the previous point of a curve).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Guess {
    /// Starting pH.
    pub ph: f64,
    /// Starting ionic strength, mol/kg.
    pub ionic_strength: f64,
}

/// Solves the charge balance for pH, with the ionic strength made self-consistent.
pub fn solve(constants: &Constants, composition: &Composition, guess: Option<Guess>) -> Solution {
    const MAX_OUTER: u32 = 60;
    // Self-consistency of I to 1e-10 relative moves pH by under 1e-10; the charge balance itself
    // is closed exactly at the activity coefficients of the final I.
    const IONIC_TOL: f64 = 1e-10;
    let mut model = balance::ChargeBalance::new(constants, composition);
    let ideal = constants.conditions.activity == ActivityModel::Ideal;
    let mut ionic = guess
        .map_or(0.5 * composition.spectator_z2, |g| g.ionic_strength)
        .max(0.0);
    let mut ph = guess.map_or(7.0, |g| g.ph);
    let mut iterations = 0;
    let mut outer = 0;
    let mut status = SolveStatus::NotConverged;
    // The previous (I, g(I) − I) pair, for a secant step on the fixed point I = g(I).
    let mut previous: Option<(f64, f64)> = None;
    let mut evaluated = None;
    while outer < MAX_OUTER {
        outer += 1;
        model.set_ionic_strength(ionic);
        let inner = newton::solve_bracketed(|x| model.evaluate(x), ph, PH_MIN, PH_MAX);
        iterations += inner.iterations;
        ph = inner.x;
        evaluated = inner.at_x;
        if inner.status != newton::Status::Converged {
            status = status_of(inner.status);
            // Out of range at a guessed ionic strength proves nothing: only conclude it once
            // the ionic strength at the range end is self-consistent.
            let gap = inner.ionic_strength - ionic;
            if ideal
                || inner.status == newton::Status::IterationLimit
                || gap.abs() <= IONIC_TOL * (1.0 + ionic)
            {
                break;
            }
            ionic = inner.ionic_strength;
            status = SolveStatus::NotConverged;
            continue;
        }
        let gap = inner.ionic_strength - ionic;
        if ideal || gap.abs() <= IONIC_TOL * (1.0 + ionic) {
            status = SolveStatus::Converged;
            break;
        }
        let plain = inner.ionic_strength;
        let next = match previous {
            Some((i0, d0)) if (gap - d0).abs() > 0.0 => ionic - gap * (ionic - i0) / (gap - d0),
            _ => plain,
        };
        previous = Some((ionic, gap));
        ionic = if next.is_finite() && next >= 0.0 {
            next
        } else {
            plain
        };
    }
    model.finish(ph, ionic, evaluated, iterations, outer, status)
}

/// Solves the charge balance for pH with the activity coefficients held at a given ionic strength.
///
/// The reported `ionic_strength` is that of the species found, which differs from the one given
/// unless it was self-consistent; the buffer capacity is exactly the derivative of this balance.
pub fn solve_at_ionic_strength(
    constants: &Constants,
    composition: &Composition,
    ionic_strength: f64,
    guess_ph: Option<f64>,
) -> Solution {
    let mut model = balance::ChargeBalance::new(constants, composition);
    let ionic = ionic_strength.max(0.0);
    model.set_ionic_strength(ionic);
    let inner = newton::solve_bracketed(
        |x| model.evaluate(x),
        guess_ph.unwrap_or(7.0),
        PH_MIN,
        PH_MAX,
    );
    let status = status_of(inner.status);
    model.finish(inner.x, ionic, inner.at_x, inner.iterations, 1, status)
}

/// How a solve ended, from how its inner Newton iteration ended.
fn status_of(status: newton::Status) -> SolveStatus {
    match status {
        newton::Status::Converged => SolveStatus::Converged,
        newton::Status::BelowBracket => SolveStatus::BelowRange,
        newton::Status::AboveBracket => SolveStatus::AboveRange,
        newton::Status::IterationLimit => SolveStatus::NotConverged,
    }
}

/// Molality and fraction of every form of every system present, at a solved state.
pub fn system_states(
    constants: &Constants,
    composition: &Composition,
    solution: &Solution,
) -> Vec<SystemState> {
    let gammas = species::Gammas::new(constants, solution.ionic_strength);
    composition
        .systems
        .iter()
        .map(|&(system, total)| species::state(constants, system, total, solution.ph, &gammas))
        .collect()
}

/// Fractions of each form of one system against pH, at a given ionic strength.
pub fn fractions_against_ph(
    constants: &Constants,
    system: usize,
    ionic_strength: f64,
    ph_values: impl IntoIterator<Item = f64>,
) -> Vec<(f64, Vec<f64>)> {
    let gammas = species::Gammas::new(constants, ionic_strength);
    ph_values
        .into_iter()
        .map(|ph| {
            let st = species::state(constants, system, 1.0, ph, &gammas);
            (ph, st.fractions)
        })
        .collect()
}
