//! Precipitation, when the user turns it on: supersaturated solids leave the solution until each
//! one formed is at saturation and none left out is above it.
//!
//! A solid formed at n mol per kg water takes n·ν of each component out of the composition: a
//! metal ion from the ions (and its charge from the spectator sums), a form j of a system from
//! that system's total (with j protons' worth added to the proton excess, the form being the
//! reference form less j H⁺), and OH⁻ as protons added. The amounts are found solid by solid,
//! in sweeps: each solid's n is the root of SI(n) = 0 between 0 and the amount its scarcest
//! component allows (SI falls from above 0 to −∞ over that bracket), the others held; a solid
//! whose SI is at or below 0 with none formed is left out; the most supersaturated solid left
//! out joins after each sweep, until none is above [`SI_TOL`]. Water of crystallisation is not
//! taken from the solvent (under 0.1 % of the water for the amounts of a scale).

use crate::formula::Formula;
use crate::library::{Library, Species};
use crate::solver::{self, Composition, Constants, Guess, Saturation, Solution};

/// A solid counts as saturated within this saturation index.
pub const SI_TOL: f64 = 1e-8;
/// Most sweeps over the solids formed.
const MAX_SWEEPS: usize = 60;
/// Most evaluations of one solid's root.
const MAX_ROOT_STEPS: usize = 80;

/// One solid formed.
#[derive(Debug, Clone, PartialEq)]
pub struct Formed {
    /// Library solid id (its mineral or chemical name).
    pub solid: String,
    /// Display name.
    pub name: String,
    /// Amount formed, mol per kg water.
    pub mol_per_kg_water: f64,
    /// Molar mass from the solid's formula, g/mol (none when it has no formula).
    pub molar_mass_g_per_mol: Option<f64>,
}

impl Formed {
    /// Grams formed per kg of water (none without a molar mass).
    pub fn g_per_kg_water(&self) -> Option<f64> {
        self.molar_mass_g_per_mol.map(|m| m * self.mol_per_kg_water)
    }
}

/// The state after precipitation.
#[derive(Debug, Clone, PartialEq)]
pub struct Precipitation {
    /// The solids formed, most first (empty when nothing is supersaturated).
    pub formed: Vec<Formed>,
    /// The composition left in solution.
    pub composition: Composition,
    /// The solved state left in solution.
    pub solution: Solution,
    /// Saturation indices after precipitation.
    pub saturation: Vec<Saturation>,
    /// Whether every solid formed is at saturation and none left out is above it.
    pub converged: bool,
}

/// The composition with the given amounts (mol/kg water) of library solids taken out.
pub fn remove(
    library: &Library,
    constants: &Constants,
    base: &Composition,
    amounts: &[(usize, f64)],
) -> Composition {
    let mut c = base.clone();
    for &(solid, n) in amounts {
        for &(sp, count) in &library.solids()[solid].components {
            let x = n * count;
            match sp {
                Species::Ion(i) if i == constants.hydroxide => c.proton_excess += x,
                Species::Ion(i) if i == constants.hydron => c.proton_excess -= x,
                Species::Ion(i) => {
                    if let Some(entry) = c.ions.iter_mut().find(|(ion, _)| *ion == i) {
                        entry.1 = (entry.1 - x).max(0.0);
                    }
                    let z = f64::from(library.ions()[i].charge);
                    c.spectator_charge -= z * x;
                    c.spectator_z2 = (c.spectator_z2 - z * z * x).max(0.0);
                    c.spectator_abs_charge = (c.spectator_abs_charge - z.abs() * x).max(0.0);
                }
                Species::Form { system, form } => {
                    if let Some(entry) = c.systems.iter_mut().find(|(s, _)| *s == system) {
                        entry.1 = (entry.1 - x).max(0.0);
                    }
                    c.proton_excess += form as f64 * x;
                }
            }
        }
    }
    c
}

/// The most of `solid` that can form from `c`: its scarcest component (other than OH⁻ and H⁺,
/// which the pH supplies) over its count.
fn most_formed(library: &Library, constants: &Constants, c: &Composition, solid: usize) -> f64 {
    library.solids()[solid]
        .components
        .iter()
        .filter_map(|&(sp, count)| match sp {
            Species::Ion(i) if i == constants.hydroxide || i == constants.hydron => None,
            Species::Ion(i) => Some(
                c.ions
                    .iter()
                    .find(|(ion, _)| *ion == i)
                    .map_or(0.0, |e| e.1)
                    / count,
            ),
            Species::Form { system, .. } => Some(
                c.systems
                    .iter()
                    .find(|(s, _)| *s == system)
                    .map_or(0.0, |e| e.1)
                    / count,
            ),
        })
        .fold(f64::INFINITY, f64::min)
}

/// The working state of the search: the solids taken out and the last solve.
struct Search<'a> {
    library: &'a Library,
    constants: &'a Constants,
    base: &'a Composition,
    activity: solver::ActivityModel,
    amounts: Vec<(usize, f64)>,
    last: Solution,
    /// A pH held fixed (as by an acid or base added to hold it), the coefficients held too.
    fixed_ph: Option<f64>,
}

impl Search<'_> {
    /// Solves with the current amounts (solid `k` at `n`), returning the SI of every solid.
    fn evaluate(&mut self, k: Option<(usize, f64)>) -> (Composition, Solution, Vec<Saturation>) {
        let mut amounts = self.amounts.clone();
        if let Some((i, n)) = k {
            amounts[i].1 = n;
        }
        let c = remove(self.library, self.constants, self.base, &amounts);
        let s = match self.fixed_ph {
            Some(ph) => Solution {
                ph,
                ..self.last.clone()
            },
            None => {
                let guess = Guess {
                    ph: self.last.ph,
                    ionic_strength: self.last.ionic_strength,
                };
                solver::solve_near(self.constants, &c, Some(guess), self.activity, &self.last)
            }
        };
        let si = solver::saturation(self.library, self.constants, &c, &s);
        self.last = s.clone();
        (c, s, si)
    }

    fn si_of(&self, si: &[Saturation], solid: usize) -> f64 {
        let id = &self.library.solids()[solid].data.id;
        si.iter()
            .find(|s| &s.solid == id)
            .map_or(f64::NEG_INFINITY, |s| s.saturation_index)
    }

    /// Sets solid `k`'s amount to its root of SI = 0, the others held.
    fn settle(&mut self, k: usize) {
        let solid = self.amounts[k].0;
        let mut others = self.amounts.clone();
        others[k].1 = 0.0;
        let available = remove(self.library, self.constants, self.base, &others);
        let top = most_formed(self.library, self.constants, &available, solid);
        let (_, _, si0) = self.evaluate(Some((k, 0.0)));
        let f0 = self.si_of(&si0, solid);
        if f0 <= SI_TOL || top <= 0.0 {
            self.amounts[k].1 = 0.0;
            return;
        }
        // Illinois false position on (0, top): f falls from f0 > 0 to −∞ at top.
        let (mut a, mut fa) = (0.0, f0);
        let mut b = top * (1.0 - 1e-9);
        let (_, _, si_b) = self.evaluate(Some((k, b)));
        let mut fb = self.si_of(&si_b, solid);
        if !fb.is_finite() {
            fb = -1e3;
        }
        let mut side = 0;
        let mut x = self.amounts[k].1.clamp(a, b);
        for step in 0..MAX_ROOT_STEPS {
            if step > 0 || x <= a || x >= b {
                x = if fa - fb != 0.0 {
                    b - fb * (b - a) / (fb - fa)
                } else {
                    0.5 * (a + b)
                };
                if !(x > a && x < b) {
                    x = 0.5 * (a + b);
                }
            }
            let (_, _, si) = self.evaluate(Some((k, x)));
            let fx = self.si_of(&si, solid);
            let fx = if fx.is_finite() { fx } else { -1e3 };
            if fx.abs() <= 0.1 * SI_TOL || (b - a) <= 1e-15 * top {
                break;
            }
            if fx > 0.0 {
                a = x;
                fa = fx;
                if side == 1 {
                    fb *= 0.5;
                }
                side = 1;
            } else {
                b = x;
                fb = fx;
                if side == -1 {
                    fa *= 0.5;
                }
                side = -1;
            }
        }
        self.amounts[k].1 = x;
    }
}

/// Takes supersaturated solids out of a solved composition until every solid formed is at
/// saturation; the curves and sweeps of the window do not do this.
pub fn precipitate(
    library: &Library,
    constants: &Constants,
    composition: &Composition,
    solution: &Solution,
) -> Precipitation {
    settle(library, constants, composition, solution, None)
}

/// [`precipitate`] with the pH held at `ph` (as by acid or base added to hold it) and the
/// activity coefficients held at those of `solution`: what settles out at each pH of a chart.
pub fn precipitate_at_ph(
    library: &Library,
    constants: &Constants,
    composition: &Composition,
    solution: &Solution,
    ph: f64,
) -> Precipitation {
    settle(library, constants, composition, solution, Some(ph))
}

fn settle(
    library: &Library,
    constants: &Constants,
    composition: &Composition,
    solution: &Solution,
    fixed_ph: Option<f64>,
) -> Precipitation {
    let mut search = Search {
        library,
        constants,
        base: composition,
        activity: solution.activity,
        amounts: Vec::new(),
        last: solution.clone(),
        fixed_ph,
    };
    let index_of = |id: &str| library.solids().iter().position(|s| s.data.id == id);
    let mut converged = false;
    for _ in 0..MAX_SWEEPS {
        let (_, _, si) = search.evaluate(None);
        let formed_ok = search
            .amounts
            .iter()
            .all(|&(s, n)| n <= 0.0 || (search.si_of(&si, s)).abs() <= 10.0 * SI_TOL);
        let candidate = si
            .iter()
            .filter(|s| s.saturation_index > 10.0 * SI_TOL)
            .filter_map(|s| index_of(&s.solid).map(|i| (i, s.saturation_index)))
            .filter(|&(i, _)| search.amounts.iter().all(|&(j, n)| j != i || n <= 0.0))
            .max_by(|a, b| a.1.total_cmp(&b.1));
        if formed_ok && candidate.is_none() {
            converged = true;
            break;
        }
        if let Some((i, _)) = candidate
            && search.amounts.iter().all(|&(j, _)| j != i)
        {
            search.amounts.push((i, 0.0));
        }
        for k in 0..search.amounts.len() {
            search.settle(k);
        }
    }
    let (composition, solution, saturation) = search.evaluate(None);
    let mut formed: Vec<Formed> = search
        .amounts
        .iter()
        .filter(|&&(_, n)| n > 0.0)
        .map(|&(i, n)| {
            let s = &library.solids()[i].data;
            Formed {
                solid: s.id.clone(),
                name: s.name.clone(),
                mol_per_kg_water: n,
                molar_mass_g_per_mol: Formula::parse(&s.formula)
                    .ok()
                    .map(|f| f.molar_mass_g_per_mol()),
            }
        })
        .collect();
    formed.sort_by(|a, b| b.mol_per_kg_water.total_cmp(&a.mol_per_kg_water));
    Precipitation {
        formed,
        composition,
        solution,
        saturation,
        converged,
    }
}
