//! Weighing tolerances and assay ranges: the pH band of a recipe by seeded Monte Carlo, and the
//! sensitivity of the pH to each line's amount by central differences.
//!
//! The model, stated once:
//! - Each enabled line is weighed at its nominal mass (as the batch resolves it, % w/w lines
//!   included) times `1 + δ`, with `δ` drawn **uniformly** in ±tolerance. Uniform is chosen
//!   because a tolerance is a stated bound on a balance reading, with no preferred value inside.
//! - An ingredient with an assay range has its assay drawn **uniformly** in `LO..=HI`, once per
//!   sample for all its lines (one lot); the grams weighed stay those of the nominal assay, so a
//!   richer lot brings more substance and less water per gram.
//! - Water added q.s. fills the batch to its stated mass exactly: it takes up what the weighed
//!   lines leave (never below zero).
//! - Percentiles interpolate linearly between order statistics (the p-th value at rank
//!   `p·(n−1)`).
//!
//! Samples are built from per-line totals per mol of substance, so no recipe is re-resolved
//! and no library is copied; each solve starts from the nominal state.

use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::formula::WATER_MOLAR_MASS_G_PER_MOL;
use crate::library::{Library, WATER};
use crate::recipe::{Recipe, Totals};
use crate::solver::{self, Constants, Guess, Solution};

/// A tolerance specification that cannot be used, or a recipe that cannot be solved.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum ToleranceError {
    /// A weighing tolerance outside 0–50 %.
    #[error(
        "weighing tolerance {percent} % for {id} is not allowed: tolerances are from 0 to 50 %"
    )]
    BadTolerance {
        /// The ingredient id, or "every line".
        id: String,
        /// The tolerance as given, %.
        percent: f64,
    },
    /// An assay range that is not 0 < LO ≤ HI ≤ 1.
    #[error(
        "assay range {lo}..{hi} for {id} is not allowed: the range must satisfy 0 < LO ≤ HI ≤ 1 (as a fraction)"
    )]
    BadAssay {
        /// The ingredient id.
        id: String,
        /// Low end, fraction.
        lo: f64,
        /// High end, fraction.
        hi: f64,
    },
    /// A tolerance or assay range names an ingredient that no enabled line holds.
    #[error("{what} names '{id}', which no enabled line of the recipe holds")]
    NotInRecipe {
        /// "weighing tolerance" or "assay range".
        what: &'static str,
        /// The id as given.
        id: String,
    },
    /// A sample count of 0 or above the limit.
    #[error("{samples} samples is not allowed: give 1 to {max}", max = MAX_SAMPLES)]
    Samples {
        /// The count as given.
        samples: usize,
    },
    /// The recipe itself cannot be solved.
    #[error(transparent)]
    Recipe(#[from] crate::error::RecipeError),
}

/// The most samples one band may take.
pub const MAX_SAMPLES: usize = 1_000_000;

/// What varies: weighing tolerances (± %) and assay ranges (fractions).
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Tolerances {
    /// Tolerance (± %) for every line not named in `per_ingredient`.
    pub all_percent: f64,
    /// Tolerance (± %) for the lines of one ingredient id.
    pub per_ingredient: Vec<(String, f64)>,
    /// Assay range (LO, HI as fractions of the named substance) for one ingredient id.
    pub assay: Vec<(String, f64, f64)>,
}

/// The pH change per 1 % change of one line's amount.
#[derive(Debug, Clone, PartialEq)]
pub struct Sensitivity {
    /// Ingredient id of the line.
    pub id: String,
    /// Index of the line in the recipe.
    pub line: usize,
    /// dpH per +1 % of the line's amount (central difference over ±1 %).
    pub dph_per_percent: f64,
}

/// The pH band of a recipe under its tolerances.
#[derive(Debug, Clone, PartialEq)]
pub struct Band {
    /// pH of the recipe as written.
    pub nominal_ph: f64,
    /// 5th percentile of the sampled pH.
    pub p05: f64,
    /// Median of the sampled pH.
    pub p50: f64,
    /// 95th percentile of the sampled pH.
    pub p95: f64,
    /// Number of samples.
    pub samples: usize,
    /// The seed used.
    pub seed: u64,
    /// Lines by the size of their effect, largest first.
    pub sensitivity: Vec<Sensitivity>,
    /// Samples whose solve did not converge (their last estimate is still counted).
    pub not_converged: usize,
}

/// A small deterministic generator: SplitMix64 (Steele, Lea & Flood 2014, from memory).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SplitMix64(u64);

impl SplitMix64 {
    /// A generator from a seed.
    pub fn new(seed: u64) -> Self {
        Self(seed)
    }

    /// The next 64 random bits.
    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// A uniform number in [0, 1).
    pub fn next_f64(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 * (1.0 / (1u64 << 53) as f64)
    }
}

/// One weighed line: what a gram brings, per mol of substance.
#[derive(Debug, Clone)]
struct Line {
    index: usize,
    id: String,
    mass_g: f64,
    molar_mass: f64,
    assay: f64,
    hydrate_water_kg_per_mol: f64,
    /// Totals per mol of substance (water excluded).
    per_mol: Totals,
    tolerance: f64,
    /// Index into the assay draws.
    assay_slot: Option<usize>,
}

/// A recipe prepared for perturbation: its lines, q.s. target and the nominal solution.
#[derive(Debug, Clone)]
pub struct Perturber<'a> {
    library: &'a Library,
    constants: &'a Constants,
    lines: Vec<Line>,
    qs_to_g: Option<f64>,
    qs_per_gram: Totals,
    assay_ranges: Vec<(f64, f64)>,
    nominal: Solution,
}

impl<'a> Perturber<'a> {
    /// Resolves the recipe once and checks the tolerances against it.
    pub fn new(
        library: &'a Library,
        constants: &'a Constants,
        recipe: &Recipe,
        tolerances: &Tolerances,
    ) -> Result<Self, ToleranceError> {
        let check = |id: &str, p: f64| {
            if p.is_finite() && (0.0..=50.0).contains(&p) {
                Ok(p / 100.0)
            } else {
                Err(ToleranceError::BadTolerance {
                    id: id.to_owned(),
                    percent: p,
                })
            }
        };
        let all = check("every line", tolerances.all_percent)?;
        let batch = recipe.batch(library)?;
        let held = |id: &str| {
            batch
                .lines
                .iter()
                .any(|l| l.enabled && library.entries()[l.entry].ingredient.id == id)
        };
        for (id, p) in &tolerances.per_ingredient {
            check(id, *p)?;
            if !held(id) {
                return Err(ToleranceError::NotInRecipe {
                    what: "weighing tolerance",
                    id: id.clone(),
                });
            }
        }
        let mut assay_ranges = Vec::new();
        let mut assay_ids: Vec<&str> = Vec::new();
        for (id, lo, hi) in &tolerances.assay {
            if !(lo.is_finite() && hi.is_finite() && *lo > 0.0 && lo <= hi && *hi <= 1.0) {
                return Err(ToleranceError::BadAssay {
                    id: id.clone(),
                    lo: *lo,
                    hi: *hi,
                });
            }
            if !held(id) {
                return Err(ToleranceError::NotInRecipe {
                    what: "assay range",
                    id: id.clone(),
                });
            }
            assay_ranges.push((*lo, *hi));
            assay_ids.push(id);
        }
        let mut lines = Vec::new();
        for (index, l) in batch.lines.iter().enumerate() {
            if !l.enabled || l.mass_g <= 0.0 {
                continue;
            }
            let e = &library.entries()[l.entry];
            let id = e.ingredient.id.clone();
            let mut per_mol = Totals::per_gram(library, l.entry);
            if let (true, Some(h)) = (id == WATER, &recipe.water_hardness) {
                per_mol.add_hardness(library, h, 1.0);
            }
            let mol_per_g = e.ingredient.assay / e.molar_mass_g_per_mol;
            per_mol.water_kg = 0.0;
            for v in per_mol
                .system_mol
                .iter_mut()
                .chain(per_mol.ion_mol.iter_mut())
            {
                *v /= mol_per_g;
            }
            per_mol.proton_excess_mol /= mol_per_g;
            let tolerance = tolerances
                .per_ingredient
                .iter()
                .rev()
                .find(|(i, _)| *i == id)
                .map_or(all, |(_, p)| p / 100.0);
            let assay_slot = assay_ids.iter().rposition(|i| *i == id);
            lines.push(Line {
                index,
                id,
                mass_g: l.mass_g,
                molar_mass: e.molar_mass_g_per_mol,
                assay: e.ingredient.assay,
                hydrate_water_kg_per_mol: e.water_mol_per_mol * WATER_MOLAR_MASS_G_PER_MOL * 1e-3,
                per_mol,
                tolerance,
                assay_slot,
            });
        }
        let mut qs_per_gram = match library.entry_index(WATER) {
            Some(w) => Totals::per_gram(library, w),
            None => {
                let mut t = Totals::zero(library);
                t.water_kg = 1e-3;
                t
            }
        };
        if let Some(h) = &recipe.water_hardness {
            qs_per_gram.add_hardness(library, h, 1.0);
        }
        let composition = batch.composition(library)?;
        let nominal = solver::solve(constants, &composition, None);
        Ok(Self {
            library,
            constants,
            lines,
            qs_to_g: recipe.qs_to_g,
            qs_per_gram,
            assay_ranges,
            nominal,
        })
    }

    /// The solved recipe as written.
    pub fn nominal(&self) -> &Solution {
        &self.nominal
    }

    /// Solves the batch with each weighed line scaled by `1 + delta[i]` (one per weighed line,
    /// in recipe order) and the given assays (one per assay range, in the order given).
    pub fn solve(&self, delta: &[f64], assays: &[f64]) -> Solution {
        let mut t = Totals::zero(self.library);
        let mut used_g = 0.0;
        for (k, l) in self.lines.iter().enumerate() {
            let mass = l.mass_g * (1.0 + delta.get(k).copied().unwrap_or(0.0));
            let assay = l
                .assay_slot
                .and_then(|s| assays.get(s).copied())
                .unwrap_or(l.assay);
            let mol = mass * assay / l.molar_mass;
            used_g += mass;
            t.water_kg += (mass * (1.0 - assay)) * 1e-3 + mol * l.hydrate_water_kg_per_mol;
            for (a, b) in t.system_mol.iter_mut().zip(&l.per_mol.system_mol) {
                *a += mol * b;
            }
            for (a, b) in t.ion_mol.iter_mut().zip(&l.per_mol.ion_mol) {
                *a += mol * b;
            }
            t.proton_excess_mol += mol * l.per_mol.proton_excess_mol;
        }
        if let Some(qs) = self.qs_to_g {
            // q.s. water, with the hardness it carries.
            let qs_g = (qs - used_g).max(0.0);
            let w = &self.qs_per_gram;
            t.water_kg += qs_g * w.water_kg;
            for (a, b) in t.system_mol.iter_mut().zip(&w.system_mol) {
                *a += qs_g * b;
            }
            for (a, b) in t.ion_mol.iter_mut().zip(&w.ion_mol) {
                *a += qs_g * b;
            }
            t.proton_excess_mol += qs_g * w.proton_excess_mol;
        }
        let guess = Some(Guess {
            ph: self.nominal.ph,
            ionic_strength: self.nominal.ionic_strength,
        });
        match t.composition(self.library) {
            Some(c) => solver::solve_as(self.constants, &c, guess, self.nominal.activity),
            None => self.nominal.clone(),
        }
    }

    /// dpH per +1 % of each weighed line, by central differences, largest effect first.
    pub fn sensitivity(&self) -> Vec<Sensitivity> {
        let n = self.lines.len();
        let mut out: Vec<Sensitivity> = (0..n)
            .map(|k| {
                let mut d = vec![0.0; n];
                d[k] = 0.01;
                let up = self.solve(&d, &[]).ph;
                d[k] = -0.01;
                let down = self.solve(&d, &[]).ph;
                Sensitivity {
                    id: self.lines[k].id.clone(),
                    line: self.lines[k].index,
                    dph_per_percent: (up - down) / 2.0,
                }
            })
            .collect();
        out.sort_by(|a, b| b.dph_per_percent.abs().total_cmp(&a.dph_per_percent.abs()));
        out
    }

    /// The pH band from `samples` seeded draws, with the sensitivity ranking.
    pub fn band(&self, samples: usize, seed: u64) -> Result<Band, ToleranceError> {
        let mut run = BandRun::new(samples, seed)?;
        self.advance(&mut run, samples);
        Ok(self.finish(&run))
    }

    /// Draws up to `count` more samples of `run` (fewer when it is nearly done).
    pub fn advance(&self, run: &mut BandRun, count: usize) {
        let mut delta = vec![0.0; self.lines.len()];
        let mut assays = vec![0.0; self.assay_ranges.len()];
        let todo = count.min(run.samples - run.ph.len());
        for _ in 0..todo {
            for (d, l) in delta.iter_mut().zip(&self.lines) {
                *d = l.tolerance * (2.0 * run.rng.next_f64() - 1.0);
            }
            for (a, &(lo, hi)) in assays.iter_mut().zip(&self.assay_ranges) {
                *a = lo + (hi - lo) * run.rng.next_f64();
            }
            let s = self.solve(&delta, &assays);
            if !s.converged() {
                run.not_converged += 1;
            }
            run.ph.push(s.ph);
        }
    }

    /// The band from a run's samples (all of them drawn or not), with the sensitivity ranking.
    pub fn finish(&self, run: &BandRun) -> Band {
        let mut ph = run.ph.clone();
        ph.sort_by(f64::total_cmp);
        Band {
            nominal_ph: self.nominal.ph,
            p05: percentile(&ph, 0.05),
            p50: percentile(&ph, 0.50),
            p95: percentile(&ph, 0.95),
            samples: ph.len(),
            seed: run.seed,
            sensitivity: self.sensitivity(),
            not_converged: run.not_converged,
        }
    }
}

/// A Monte Carlo band being drawn a part at a time (so a window can show progress): the same
/// seed gives the same samples however the drawing is split.
#[derive(Debug, Clone, PartialEq)]
pub struct BandRun {
    rng: SplitMix64,
    samples: usize,
    seed: u64,
    ph: Vec<f64>,
    not_converged: usize,
}

impl BandRun {
    /// A run of `samples` draws from `seed`, none drawn yet.
    pub fn new(samples: usize, seed: u64) -> Result<Self, ToleranceError> {
        if samples == 0 || samples > MAX_SAMPLES {
            return Err(ToleranceError::Samples { samples });
        }
        Ok(Self {
            rng: SplitMix64::new(seed),
            samples,
            seed,
            ph: Vec::with_capacity(samples),
            not_converged: 0,
        })
    }

    /// Samples drawn so far.
    pub fn drawn(&self) -> usize {
        self.ph.len()
    }

    /// Samples asked for.
    pub fn samples(&self) -> usize {
        self.samples
    }

    /// Whether every sample has been drawn.
    pub fn is_done(&self) -> bool {
        self.ph.len() >= self.samples
    }
}

/// The p-quantile of sorted values, interpolated linearly at rank `p·(n−1)`.
pub fn percentile(sorted: &[f64], p: f64) -> f64 {
    match sorted.len() {
        0 => f64::NAN,
        1 => sorted[0],
        n => {
            let r = p.clamp(0.0, 1.0) * (n - 1) as f64;
            let lo = r.floor() as usize;
            let hi = (lo + 1).min(n - 1);
            sorted[lo] + (sorted[hi] - sorted[lo]) * (r - lo as f64)
        }
    }
}

/// The pH band of a recipe under tolerances: resolve, sample, rank.
pub fn band(
    library: &Library,
    constants: &Constants,
    recipe: &Recipe,
    tolerances: &Tolerances,
    samples: usize,
    seed: u64,
) -> Result<Band, ToleranceError> {
    Perturber::new(library, constants, recipe, tolerances)?.band(samples, seed)
}
