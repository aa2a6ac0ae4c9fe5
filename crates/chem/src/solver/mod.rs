//! The equilibrium solver: constants at a temperature, the charge balance and its safeguarded Newton.
//!
//! The pieces are kept apart so that more unknowns (free metal and free ligand for complexation
//! and precipitation) can join later: `species.rs` turns free activities into every species'
//! molality; `balance.rs` sums them into residuals and their derivatives; `newton.rs` drives the
//! unknowns to zero residual inside a bracket; the outer loop here makes the ionic strength
//! self-consistent.

pub mod activity;
mod balance;
mod binding;
mod layout;
mod newton;
pub mod pitzer;
mod speciation;
mod species;
pub mod temperature;
pub mod water;

use serde::{Deserialize, Serialize};

pub use activity::ActivityModel;
pub use speciation::{
    ComplexAmount, IonAmount, MetalAtPh, Saturation, Speciation, metal_against_ph, saturation,
    speciation,
};
pub use species::SystemState;

use crate::library::{Library, PitzerTable, Species};

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
            activity: ActivityModel::Auto,
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
    /// Every library complex at the temperature, in library order.
    pub(crate) complexes: Vec<ComplexConstant>,
    /// Every library solid at the temperature, in library order.
    pub(crate) solids: Vec<SolidConstant>,
    /// The library's Pitzer parameters, numbers only.
    pub(crate) pitzer: PitzerParams,
    /// Charge of every library ion.
    pub(crate) ion_charges: Vec<i32>,
    /// Index of hydroxide among the ions.
    pub(crate) hydroxide: usize,
    /// Index of hydron among the ions.
    pub(crate) hydron: usize,
    /// NaCl's β⁽⁰⁾, β⁽¹⁾, C^φ, for the fallback of the Pitzer model.
    pub(crate) pitzer_reference: [f64; 3],
}

/// Pitzer parameters by species: pairs (β⁽⁰⁾, β⁽¹⁾, β⁽²⁾, C^φ), θ and ψ.
#[derive(Debug, Clone, Default, PartialEq)]
pub(crate) struct PitzerParams {
    pub pairs: Vec<(Species, Species, [f64; 4])>,
    pub mixing: Vec<(Species, Species, f64)>,
    pub triples: Vec<(Species, Species, Species, f64)>,
}

impl PitzerParams {
    fn of(table: &PitzerTable) -> Self {
        Self {
            pairs: table
                .pairs
                .iter()
                .map(|(c, a, p)| (*c, *a, [p.beta0, p.beta1, p.beta2, p.c_phi]))
                .collect(),
            mixing: table.mixing.clone(),
            triples: table.triples.clone(),
        }
    }
}

/// A complex's constant at a temperature, with its metal and ligand.
#[derive(Debug, Clone, PartialEq)]
pub(crate) struct ComplexConstant {
    /// Index into the library's complexes.
    pub index: usize,
    pub metal: usize,
    pub ligand: Species,
    pub charge: i32,
    /// Ligands per complex (above 1 only for hydroxo complexes).
    pub ligand_count: u32,
    /// Thermodynamic formation constant (I = 0) at the temperature.
    pub k: f64,
    /// Whether the Pitzer table has a pair for the metal and ligand (which then holds the pairing).
    pub in_pitzer: bool,
}

/// A solid's solubility product at a temperature.
#[derive(Debug, Clone, PartialEq)]
pub(crate) struct SolidConstant {
    /// Index into the library's solids.
    pub index: usize,
    pub log_ksp: f64,
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
        let pitzer = PitzerParams::of(library.pitzer());
        let complexes = library
            .complexes()
            .iter()
            .enumerate()
            .map(|(index, c)| {
                // log K(I) = log K° − A·f(I)·(z_M² + n·z_L² − z_MLn²), as for the pKa values.
                let z_m = library.ions()[c.metal].charge;
                let z_l = library.species_charge(c.ligand);
                let n = f64::from(c.data.ligand_count);
                let f = activity::davies_function(c.data.ionic_strength);
                let dz2 = f64::from(z_m * z_m) + n * f64::from(z_l * z_l)
                    - f64::from(c.charge * c.charge);
                let log_k0 = c.data.log_k + a25 * f * dz2;
                let log_k = -temperature::pka_at(-log_k0, c.data.dh_kj_mol, 0.0, temp_k);
                ComplexConstant {
                    index,
                    metal: c.metal,
                    ligand: c.ligand,
                    charge: c.charge,
                    ligand_count: c.data.ligand_count,
                    k: 10f64.powf(log_k),
                    in_pitzer: pitzer
                        .pairs
                        .iter()
                        .any(|(m, l, _)| *m == Species::Ion(c.metal) && *l == c.ligand),
                }
            })
            .collect();
        let solids = library
            .solids()
            .iter()
            .enumerate()
            .map(|(index, s)| SolidConstant {
                index,
                log_ksp: -temperature::pka_at(-s.data.log_ksp, s.data.dh_kj_mol, 0.0, temp_k),
            })
            .collect();
        let reference = library
            .species("sodium")
            .zip(library.species("chloride"))
            .and_then(|(na, cl)| pitzer.pairs.iter().find(|(c, a, _)| *c == na && *a == cl))
            .map_or([0.0; 3], |(_, _, p)| [p[0], p[1], p[3]]);
        Self {
            conditions,
            kw: 10f64.powf(-water::pkw(conditions.temp_c)),
            davies_a: activity::debye_huckel_a(conditions.temp_c),
            z0,
            ka_start,
            ka,
            complexes,
            solids,
            pitzer,
            ion_charges: library.ions().iter().map(|i| i.charge).collect(),
            hydroxide: library.hydroxide(),
            hydron: library.hydron(),
            pitzer_reference: reference,
        }
    }

    /// The same constants under another activity model.
    pub fn with_activity(&self, activity: ActivityModel) -> Self {
        let mut c = self.clone();
        c.conditions.activity = activity;
        c
    }

    /// Thermodynamic Ka values of one system at this temperature.
    pub fn ka(&self, system: usize) -> &[f64] {
        &self.ka[self.ka_start[system]..self.ka_start[system + 1]]
    }

    /// Sets the thermodynamic pKa of step `step` of a system at these conditions (a fitted
    /// constant, taken as it is at this temperature); false when there is no such step.
    pub fn set_pka(&mut self, system: usize, step: usize, pka: f64) -> bool {
        match (self.ka_start.get(system), self.ka_start.get(system + 1)) {
            (Some(&from), Some(&to)) if from + step < to => {
                self.ka[from + step] = 10f64.powf(-pka);
                true
            }
            _ => false,
        }
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
    /// Molality of each ion other than H⁺ and OH⁻, by library ion index (its charge is in the
    /// spectator sums; charge in the sums beyond these ions is treated as a 1:1 background).
    pub ions: Vec<(usize, f64)>,
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
    /// Largest metal-balance residual relative to the metal's total (0 without complexes).
    pub metal_residual: f64,
    /// Newton iterations in total.
    pub iterations: u32,
    /// Outer (ionic strength) iterations.
    pub outer_iterations: u32,
    /// How the solve ended.
    pub status: SolveStatus,
    /// The activity model the coefficients came from.
    pub activity: ActivityModel,
    /// Activity coefficient of every species of the composition, in the solver's order.
    pub gamma: Vec<f64>,
    /// ln free molality of each metal that complexes bind, in the solver's order.
    pub free_metals: Vec<f64>,
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

/// Solves the charge balance for pH, with the activity coefficients made self-consistent.
///
/// Under [`ActivityModel::Auto`] the state is solved with Davies and kept if Davies holds for
/// its ionic strength and charges ([`davies_holds`]), and solved again with Pitzer otherwise;
/// a curve should fix the model its first point chose (`Solution::activity`), so that it stays
/// continuous.
pub fn solve(constants: &Constants, composition: &Composition, guess: Option<Guess>) -> Solution {
    let requested = constants.conditions.activity;
    let (first, mut model) = solve_model(constants, composition, guess, requested.fixed(), &[]);
    if requested != ActivityModel::Auto || holds(&mut model, &first) {
        return first;
    }
    let from = Guess {
        ph: first.ph,
        ionic_strength: first.ionic_strength,
    };
    solve_with(
        constants,
        composition,
        Some(from),
        ActivityModel::Pitzer,
        &[],
    )
}

/// Whether Davies holds at a solved state: its ionic strength within the limit for the
/// largest charge that carries a tenth of the ionic strength.
pub fn davies_holds(constants: &Constants, composition: &Composition, solution: &Solution) -> bool {
    let mut model = balance::ChargeBalance::at_solution(constants, composition, solution);
    holds(&mut model, solution)
}

/// [`davies_holds`] with the balance the state was solved with.
fn holds(model: &mut balance::ChargeBalance<'_>, solution: &Solution) -> bool {
    let i = solution.ionic_strength;
    if i <= ActivityModel::davies_limit(3) {
        return true;
    }
    if i > ActivityModel::davies_limit(1) {
        return false;
    }
    i <= ActivityModel::davies_limit(significant_charge(model, solution.ph))
}

/// Largest |z| among the species carrying at least a tenth of the ionic strength.
pub fn largest_significant_charge(
    constants: &Constants,
    composition: &Composition,
    solution: &Solution,
) -> i32 {
    let mut model = balance::ChargeBalance::at_solution(constants, composition, solution);
    significant_charge(&mut model, solution.ph)
}

/// [`largest_significant_charge`] from the balance of the solved state.
fn significant_charge(model: &mut balance::ChargeBalance<'_>, ph: f64) -> i32 {
    let m = model.molalities(ph);
    let (layout, _, _) = model.parts();
    let ionic: f64 = layout
        .charges
        .iter()
        .zip(&m)
        .map(|(&z, &x)| 0.5 * f64::from(z * z) * x)
        .sum();
    layout
        .charges
        .iter()
        .zip(&m)
        .filter(|&(&z, &x)| 0.5 * f64::from(z * z) * x >= 0.1 * ionic)
        .map(|(&z, _)| z.abs())
        .max()
        .unwrap_or(1)
}

/// Solves under the model a first solve chose (`Solution::activity`): curves and sweeps keep
/// it for every point so that they stay continuous. `Auto` here is the same as [`solve`].
pub fn solve_as(
    constants: &Constants,
    composition: &Composition,
    guess: Option<Guess>,
    activity: ActivityModel,
) -> Solution {
    if activity == ActivityModel::Auto {
        solve(constants, composition, guess)
    } else {
        solve_with(constants, composition, guess, activity, &[])
    }
}

/// [`solve_as`] with the free metals started from a neighbouring solved state (the previous
/// point of a curve), which saves most of the metal iterations.
pub fn solve_near(
    constants: &Constants,
    composition: &Composition,
    guess: Option<Guess>,
    activity: ActivityModel,
    near: &Solution,
) -> Solution {
    if activity == ActivityModel::Auto {
        solve(constants, composition, guess)
    } else {
        solve_with(constants, composition, guess, activity, &near.free_metals)
    }
}

/// Solves one composition after another of the same shape (the points of a curve), keeping one
/// charge balance between them, so its layout, binding and scratch space are made once.
pub struct Sequence<'a> {
    constants: &'a Constants,
    balance: Option<balance::ChargeBalance<'a>>,
    /// ln free metals of the last (up to) three states solved, latest first: the next start is
    /// their extrapolation, as the pH's is.
    history: Vec<Vec<f64>>,
    /// The extrapolated start (kept so that no point allocates one).
    start: Vec<f64>,
}

impl<'a> Sequence<'a> {
    /// An empty sequence under some constants.
    pub fn new(constants: &'a Constants) -> Self {
        Self {
            constants,
            balance: None,
            history: Vec::with_capacity(3),
            start: Vec::new(),
        }
    }

    /// The free metals' start extrapolated from the states before (each step at most ±2 in
    /// ln m from the last), into `start`; false with no state before.
    fn extrapolate_metals(&mut self) -> bool {
        let Some(last) = self.history.first() else {
            return false;
        };
        self.start.clear();
        self.start.extend(last.iter().enumerate().map(|(i, &a)| {
            let step = match (self.history.get(1), self.history.get(2)) {
                (Some(b), Some(c)) => 2.0 * (a - b[i]) - (b[i] - c[i]),
                (Some(b), None) => a - b[i],
                _ => 0.0,
            };
            a + step.clamp(-2.0, 2.0)
        }));
        true
    }

    /// [`solve_near`] of `composition`, reusing the last balance when the shape allows.
    pub fn solve(
        &mut self,
        composition: &'a Composition,
        guess: Option<Guess>,
        activity: ActivityModel,
        near: Option<&Solution>,
    ) -> Solution {
        if activity == ActivityModel::Auto {
            return solve(self.constants, composition, guess);
        }
        let kept = self
            .balance
            .as_mut()
            .is_some_and(|b| b.model() == activity && b.retarget(composition));
        if kept {
            if self.extrapolate_metals()
                && let Some(b) = self.balance.as_mut()
            {
                b.set_free_metals(&self.start);
            }
        } else {
            self.history.clear();
            let mut model =
                balance::ChargeBalance::with_model(self.constants, composition, activity);
            if let Some(n) = near {
                model.set_free_metals(&n.free_metals);
            }
            self.balance = Some(model);
        }
        let Some(model) = self.balance.as_mut() else {
            return solve_as(self.constants, composition, guess, activity);
        };
        let start_ionic = guess
            .map_or(0.5 * composition.spectator_z2, |g| g.ionic_strength)
            .max(0.0);
        let start_ph = guess.map_or(7.0, |g| g.ph);
        let solution = if model.is_pitzer() {
            solve_pitzer(model, start_ph, start_ionic)
        } else {
            solve_by_charge(model, activity, start_ph, start_ionic, guess.is_none())
        };
        // The oldest state's vector takes the newest values, so no point allocates.
        let mut newest = if self.history.len() == 3 {
            self.history.pop().unwrap_or_default()
        } else {
            Vec::new()
        };
        newest.clear();
        newest.extend_from_slice(&solution.free_metals);
        self.history.insert(0, newest);
        solution
    }
}

/// Solves under one activity model (not `Auto`).
fn solve_with(
    constants: &Constants,
    composition: &Composition,
    guess: Option<Guess>,
    activity: ActivityModel,
    free_metals: &[f64],
) -> Solution {
    solve_model(constants, composition, guess, activity, free_metals).0
}

/// [`solve_with`], also giving the balance it solved (holding the solved state).
fn solve_model<'a>(
    constants: &'a Constants,
    composition: &'a Composition,
    guess: Option<Guess>,
    activity: ActivityModel,
    free_metals: &[f64],
) -> (Solution, balance::ChargeBalance<'a>) {
    let mut model = balance::ChargeBalance::with_model(constants, composition, activity);
    model.set_free_metals(free_metals);
    let start_ionic = guess
        .map_or(0.5 * composition.spectator_z2, |g| g.ionic_strength)
        .max(0.0);
    let start_ph = guess.map_or(7.0, |g| g.ph);
    let solution = if model.is_pitzer() {
        solve_pitzer(&mut model, start_ph, start_ionic)
    } else {
        solve_by_charge(&mut model, activity, start_ph, start_ionic, guess.is_none())
    };
    (solution, model)
}

/// Self-consistency of I to 1e-10 relative moves pH by under 1e-10; the charge balance itself
/// is closed exactly at the activity coefficients of the final I.
const IONIC_TOL: f64 = 1e-10;

/// Davies or ideal: the fixed point of the ionic strength, by secant steps — or, with metals
/// bound, by joint Newton steps that carry it along, falling back to the secant steps.
fn solve_by_charge(
    model: &mut balance::ChargeBalance<'_>,
    activity: ActivityModel,
    start_ph: f64,
    start_ionic: f64,
    cold: bool,
) -> Solution {
    const MAX_OUTER: u32 = 60;
    if let Some(joint) = model.root_with_ionic(start_ph, start_ionic, cold) {
        let steps = joint.iterations;
        return model.finish(joint.x, joint.at_x, steps, steps, SolveStatus::Converged);
    }
    let ideal = activity == ActivityModel::Ideal;
    let mut ionic = start_ionic;
    let mut ph = start_ph;
    let mut iterations = 0;
    let mut outer = 0;
    let mut status = SolveStatus::NotConverged;
    // The previous (I, g(I) − I) pair, for a secant step on the fixed point I = g(I).
    let mut previous: Option<(f64, f64)> = None;
    let mut evaluated = None;
    while outer < MAX_OUTER {
        outer += 1;
        model.set_ionic_strength(ionic);
        let inner = model.root(ph);
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
        evaluated = None;
    }
    model.set_ionic_strength(ionic);
    model.finish(ph, evaluated, iterations, outer, status)
}

/// Pitzer: the fixed point of every activity coefficient, by damped substitution in ln γ.
fn solve_pitzer(
    model: &mut balance::ChargeBalance<'_>,
    start_ph: f64,
    start_ionic: f64,
) -> Solution {
    const MAX_OUTER: u32 = 200;
    // ln γ self-consistent to 1e-12 moves pH by under 1e-12.
    const LN_GAMMA_TOL: f64 = 1e-12;
    model.set_ionic_strength(start_ionic);
    let mut ph = start_ph;
    let mut iterations = 0;
    let mut outer = 0;
    let mut status = SolveStatus::NotConverged;
    let mut evaluated = None;
    let mut damping: f64 = 1.0;
    let mut last_change = f64::INFINITY;
    while outer < MAX_OUTER {
        outer += 1;
        let inner = model.root(ph);
        iterations += inner.iterations;
        ph = inner.x;
        evaluated = inner.at_x;
        let next = model.model_gammas(ph);
        let change = next
            .iter()
            .zip(model.gammas())
            .map(|(a, b)| (a.ln() - b.ln()).abs())
            .fold(0.0, f64::max);
        if inner.status != newton::Status::Converged && change <= LN_GAMMA_TOL {
            status = status_of(inner.status);
            break;
        }
        if change <= LN_GAMMA_TOL {
            status = SolveStatus::Converged;
            break;
        }
        if change > last_change {
            damping = (damping * 0.5).max(0.05);
        }
        last_change = change;
        let blended = next
            .iter()
            .zip(model.gammas())
            .map(|(a, b)| (b.ln() + damping * (a.ln() - b.ln())).exp())
            .collect();
        model.set_gammas(blended);
        evaluated = None;
    }
    model.finish(ph, evaluated, iterations, outer, status)
}

/// Solves the charge balance for pH with the activity coefficients held at a given ionic strength.
///
/// The reported `ionic_strength` is that of the species found, which differs from the one given
/// unless it was self-consistent; the buffer capacity is exactly the derivative of this balance.
/// Under the Pitzer model the coefficients held are those of a solved state at this composition.
pub fn solve_at_ionic_strength(
    constants: &Constants,
    composition: &Composition,
    ionic_strength: f64,
    guess_ph: Option<f64>,
) -> Solution {
    let mut model = balance::ChargeBalance::new(constants, composition);
    model.set_ionic_strength(ionic_strength.max(0.0));
    let inner = model.root(guess_ph.unwrap_or(7.0));
    let status = status_of(inner.status);
    model.finish(inner.x, inner.at_x, inner.iterations, 1, status)
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
    let mut model = balance::ChargeBalance::at_solution(constants, composition, solution);
    let m = model.molalities(solution.ph);
    let (layout, _, _) = model.parts();
    composition
        .systems
        .iter()
        .enumerate()
        .map(|(slot, &(system, total))| {
            let forms = layout.form_start[slot]..layout.form_start[slot + 1];
            let fractions: Vec<f64> = m[forms].iter().map(|x| x / total).collect();
            let bound = (1.0 - fractions.iter().sum::<f64>()).max(0.0);
            let z0 = constants.z0(system);
            SystemState {
                system,
                total,
                charges: (0..fractions.len()).map(|j| z0 - j as i32).collect(),
                fractions,
                bound,
            }
        })
        .collect()
}

/// Activity coefficient by charge at a solved state's ionic strength (Davies, or 1 when ideal):
/// the estimate used where a species' own coefficient is not at hand.
pub fn charge_gammas(constants: &Constants, solution: &Solution) -> impl Fn(i32) -> f64 + use<> {
    let g = species::Gammas::with_model(
        constants,
        solution.ionic_strength,
        match solution.activity {
            ActivityModel::Ideal => ActivityModel::Ideal,
            _ => ActivityModel::Davies,
        },
    );
    move |z| g.of(z)
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
