//! Dose curves: pH against the amount of an adjuster added to a batch, the dose to a target pH,
//! and the equivalence points on the way.

use crate::error::{DoseError, RecipeError};
use crate::library::{Library, ResolvedRelease};
use crate::recipe::{Batch, Totals};
use crate::solver::{self, ActivityModel, Composition, Constants, Guess, Solution};

/// One point of a dose curve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CurvePoint {
    /// Mass of adjuster added, g (as supplied).
    pub dose_g: f64,
    /// pH at that dose.
    pub ph: f64,
    /// Buffer capacity at that dose, mol/kg per pH.
    pub buffer_capacity: f64,
}

/// A point where the pH changes fastest with dose.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EquivalencePoint {
    /// Dose, g.
    pub dose_g: f64,
    /// pH there.
    pub ph: f64,
}

/// A swept dose curve.
#[derive(Debug, Clone, PartialEq)]
pub struct DoseCurve {
    /// Adjuster id.
    pub adjuster: String,
    /// Points from zero to the largest dose.
    pub points: Vec<CurvePoint>,
    /// Equivalence points found on the curve.
    pub equivalence: Vec<EquivalencePoint>,
}

/// The dose that brings a batch to a target pH.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DoseResult {
    /// Mass of adjuster, g (as supplied).
    pub amount_g: f64,
    /// The pH reached with it.
    pub ph_reached: f64,
    /// The dose as a percentage of the batch before dosing.
    pub percent_of_batch: f64,
}

/// A batch with an adjuster to add: molal composition as a function of dose, solved on demand.
///
/// Doses are grams of an ingredient as supplied ([`Doser::new`]) or units of anything else whose
/// one unit brings known water and moles ([`Doser::with_dose_unit`], e.g. mL of a titrant).
#[derive(Debug, Clone)]
pub struct Doser<'a> {
    constants: &'a Constants,
    adjuster: String,
    batch_mass_g: f64,
    water_kg: f64,
    /// Water per unit of dose (per g of an adjuster), kg.
    water_kg_per_g: f64,
    /// (system index, mol in batch, mol per unit of dose, i.e. per g of an adjuster).
    systems: Vec<(usize, f64, f64)>,
    /// The activity model of every point: the one the batch as weighed took.
    activity: ActivityModel,
    /// (ion index, mol in batch, mol per unit of dose), hydron and hydroxide excluded.
    ions: Vec<(usize, f64, f64)>,
    /// (Σ z·n, Σ z²·n, Σ |z|·n, proton excess) in the batch and per unit of dose.
    spectators: [f64; 4],
    spectators_per_g: [f64; 4],
}

impl<'a> Doser<'a> {
    /// Prepares dosing a batch with an ingredient of the library.
    pub fn new(
        library: &Library,
        constants: &'a Constants,
        batch: &Batch,
        adjuster_id: &str,
    ) -> Result<Self, DoseError> {
        let Some(entry) = library.entry_index(adjuster_id) else {
            return Err(RecipeError::UnknownIngredient {
                id: adjuster_id.into(),
                suggestions: library.suggest(adjuster_id),
            }
            .into());
        };
        let acts = library.entries()[entry].releases.iter().any(|r| match *r {
            ResolvedRelease::System { .. } => true,
            ResolvedRelease::Ion { ion, .. } => library.is_proton_ion(ion),
        });
        if !acts {
            return Err(DoseError::NotAnAdjuster {
                adjuster: adjuster_id.into(),
            });
        }
        let per_gram = Totals::per_gram(library, entry);
        Ok(Self::with_dose_unit(
            library,
            constants,
            batch,
            adjuster_id,
            &per_gram,
        ))
    }

    /// Prepares dosing a batch with anything whose one unit of dose brings `per_unit` (water and
    /// moles), e.g. one mL of a titrant; doses are then counted in that unit, not in grams.
    pub fn with_dose_unit(
        library: &Library,
        constants: &'a Constants,
        batch: &Batch,
        name: &str,
        per_unit: &Totals,
    ) -> Self {
        let base = &batch.totals;
        let systems = base
            .system_mol
            .iter()
            .zip(&per_unit.system_mol)
            .enumerate()
            .filter(|(_, (b, p))| **b > 0.0 || **p > 0.0)
            .map(|(i, (b, p))| (i, *b, *p))
            .collect();
        let ions = base
            .ion_mol
            .iter()
            .zip(&per_unit.ion_mol)
            .enumerate()
            .filter(|(i, (b, p))| (**b > 0.0 || **p > 0.0) && !library.is_proton_ion(*i))
            .map(|(i, (b, p))| (i, *b, *p))
            .collect();
        let sums = |t: &Totals| {
            let [charge, z2, abs_charge] = t.spectator_sums(library);
            [charge, z2, abs_charge, t.proton_excess_mol]
        };
        let mut doser = Self {
            constants,
            activity: constants.conditions.activity,
            adjuster: name.to_owned(),
            batch_mass_g: batch.total_mass_g,
            water_kg: base.water_kg,
            water_kg_per_g: per_unit.water_kg,
            systems,
            ions,
            spectators: sums(base),
            spectators_per_g: sums(per_unit),
        };
        if doser.activity == ActivityModel::Auto {
            doser.activity = solver::solve(constants, &doser.composition(0.0), None).activity;
        }
        doser
    }

    /// The activity model every point is solved with.
    pub fn activity(&self) -> ActivityModel {
        self.activity
    }

    /// Molal composition after adding a dose (g).
    pub fn composition(&self, dose_g: f64) -> Composition {
        let w = self.water_kg + dose_g * self.water_kg_per_g;
        let s = |k: usize| (self.spectators[k] + dose_g * self.spectators_per_g[k]) / w;
        Composition {
            systems: self
                .systems
                .iter()
                .map(|&(i, b, p)| (i, (b + dose_g * p) / w))
                .filter(|(_, m)| *m > 0.0)
                .collect(),
            ions: self
                .ions
                .iter()
                .map(|&(i, b, p)| (i, (b + dose_g * p) / w))
                .filter(|(_, m)| *m > 0.0)
                .collect(),
            spectator_charge: s(0),
            spectator_z2: s(1),
            spectator_abs_charge: s(2),
            proton_excess: s(3),
        }
    }

    /// Solves the batch after adding a dose (g), optionally from a starting point.
    pub fn solve(&self, dose_g: f64, guess: Option<Guess>) -> Solution {
        solver::solve_as(
            self.constants,
            &self.composition(dose_g),
            guess,
            self.activity,
        )
    }

    /// Sweeps `points` doses evenly from 0 to `max_g`, each solve starting from the previous one.
    pub fn curve(&self, max_g: f64, points: usize) -> DoseCurve {
        self.curve_between(0.0, max_g, points)
    }

    /// Sweeps `points` doses evenly from `from_g` to `to_g`, warm-started point to point.
    pub fn curve_between(&self, from_g: f64, to_g: f64, points: usize) -> DoseCurve {
        let n = points.max(2);
        let doses: Vec<f64> = (0..n)
            .map(|i| from_g + (to_g - from_g) * i as f64 / (n - 1) as f64)
            .collect();
        // Every point's composition is made first, so one balance can move from one to the next.
        let compositions: Vec<Composition> = doses.iter().map(|&d| self.composition(d)).collect();
        let mut sequence = solver::Sequence::new(self.constants);
        let mut out = Vec::with_capacity(n);
        // Each solve starts from the (cubic) extrapolation of the (up to) four before it.
        let mut last: Vec<(f64, f64)> = Vec::with_capacity(4);
        let mut previous: Option<Solution> = None;
        for (i, (&dose_g, composition)) in doses.iter().zip(&compositions).enumerate() {
            let guess = match last.as_slice() {
                [a, b, c, d] => Some(Guess {
                    ph: a.0 + (3.0 * a.0 - 6.0 * b.0 + 4.0 * c.0 - d.0).clamp(-1.0, 1.0),
                    ionic_strength: (4.0 * a.1 - 6.0 * b.1 + 4.0 * c.1 - d.1).max(0.0),
                }),
                [a, b, c] => Some(Guess {
                    ph: a.0 + (2.0 * (a.0 - b.0) - (b.0 - c.0)).clamp(-1.0, 1.0),
                    ionic_strength: (3.0 * a.1 - 3.0 * b.1 + c.1).max(0.0),
                }),
                [a, b] => Some(Guess {
                    ph: a.0 + (a.0 - b.0).clamp(-1.0, 1.0),
                    ionic_strength: (2.0 * a.1 - b.1).max(0.0),
                }),
                [a] => Some(Guess {
                    ph: a.0,
                    ionic_strength: a.1,
                }),
                _ => None,
            };
            let s = if i == 0 {
                self.solve(dose_g, guess)
            } else {
                sequence.solve(composition, guess, self.activity, previous.as_ref())
            };
            if last.len() == 4 {
                last.pop();
            }
            last.insert(0, (s.ph, s.ionic_strength));
            out.push(CurvePoint {
                dose_g,
                ph: s.ph,
                buffer_capacity: s.buffer_capacity,
            });
            previous = Some(s);
        }
        let equivalence = equivalence_points(&out);
        DoseCurve {
            adjuster: self.adjuster.clone(),
            points: out,
            equivalence,
        }
    }

    /// Finds the dose that brings the batch to `target_ph`, by a bracketed root solve on the dose.
    pub fn to_target(&self, target_ph: f64) -> Result<DoseResult, DoseError> {
        self.to_target_within(target_ph, 1e3 * self.batch_mass_g.max(1.0))
    }

    /// As [`Doser::to_target`], searching doses up to about `max_dose` (the bracket grows fourfold
    /// at a time and stops once it has passed `max_dose`).
    pub fn to_target_within(&self, target_ph: f64, max_dose: f64) -> Result<DoseResult, DoseError> {
        let unreachable = |reason: String| DoseError::Unreachable {
            adjuster: self.adjuster.clone(),
            target_ph,
            reason,
        };
        if !target_ph.is_finite() {
            return Err(unreachable("the target is not a number".into()));
        }
        let start = self.solve(0.0, None);
        let f0 = start.ph - target_ph;
        if f0.abs() < 1e-9 {
            return Ok(DoseResult {
                amount_g: 0.0,
                ph_reached: start.ph,
                percent_of_batch: 0.0,
            });
        }
        // Which way does the adjuster move pH? Probe a small dose.
        let scale_g = self.batch_mass_g.max(1.0);
        let probe = self.solve(
            1e-4 * scale_g,
            Some(Guess {
                ph: start.ph,
                ionic_strength: start.ionic_strength,
            }),
        );
        let direction = probe.ph - start.ph;
        if direction == 0.0 || direction.signum() == f0.signum() {
            let way = if direction > 0.0 { "raises" } else { "lowers" };
            return Err(unreachable(format!(
                "adding it {way} pH, and the batch is already at pH {:.2}, on the other side of the target; choose an {}",
                start.ph,
                if f0 > 0.0 { "acid" } else { "alkali" }
            )));
        }
        // Expand the bracket until pH passes the target, up to the largest dose searched.
        let (mut lo, mut f_lo) = (0.0, f0);
        let mut hi = 1e-3 * scale_g;
        let mut s_hi = self.solve(hi, None);
        while (s_hi.ph - target_ph).signum() == f0.signum() {
            if hi > max_dose {
                return Err(unreachable(format!(
                    "even {:.3} kg of it in this {:.0} g batch only reaches pH {:.2}",
                    hi * 1e-3,
                    self.batch_mass_g,
                    s_hi.ph
                )));
            }
            lo = hi;
            f_lo = s_hi.ph - target_ph;
            hi *= 4.0;
            s_hi = self.solve(
                hi,
                Some(Guess {
                    ph: s_hi.ph,
                    ionic_strength: s_hi.ionic_strength,
                }),
            );
        }
        let mut f_hi = s_hi.ph - target_ph;
        // Illinois regula falsi with bisection safeguard.
        let mut best = (hi, s_hi.ph);
        let mut side = 0;
        for _ in 0..200 {
            let mut d = hi - f_hi * (hi - lo) / (f_hi - f_lo);
            if !d.is_finite() || d <= lo || d >= hi {
                d = 0.5 * (lo + hi);
            }
            let s = self.solve(
                d,
                Some(Guess {
                    ph: best.1,
                    ionic_strength: s_hi.ionic_strength,
                }),
            );
            let f = s.ph - target_ph;
            best = (d, s.ph);
            if f.abs() < 1e-10 || (hi - lo) < 1e-13 * hi {
                break;
            }
            if f.signum() == f_lo.signum() {
                lo = d;
                f_lo = f;
                if side == -1 {
                    f_hi *= 0.5;
                }
                side = -1;
            } else {
                hi = d;
                f_hi = f;
                if side == 1 {
                    f_lo *= 0.5;
                }
                side = 1;
            }
        }
        Ok(DoseResult {
            amount_g: best.0,
            ph_reached: best.1,
            percent_of_batch: 100.0 * best.0 / self.batch_mass_g.max(f64::MIN_POSITIVE),
        })
    }
}

/// Equivalence points: sharp local maxima of |dpH/d(dose)| along a curve.
pub fn equivalence_points(points: &[CurvePoint]) -> Vec<EquivalencePoint> {
    if points.len() < 5 {
        return Vec::new();
    }
    let slope: Vec<f64> = (1..points.len() - 1)
        .map(|i| {
            ((points[i + 1].ph - points[i - 1].ph) / (points[i + 1].dose_g - points[i - 1].dose_g))
                .abs()
        })
        .collect();
    let peaks: Vec<usize> = (1..slope.len() - 1)
        .filter(|&i| slope[i] > slope[i - 1] && slope[i] >= slope[i + 1])
        .collect();
    let mut out = Vec::new();
    for (k, &i) in peaks.iter().enumerate() {
        let left = if k == 0 { 0 } else { peaks[k - 1] };
        let right = peaks.get(k + 1).copied().unwrap_or(slope.len() - 1);
        let (l_min, l_at) = min_in(&slope, left, i);
        let (r_min, r_at) = min_in(&slope, i, right);
        // A real end point stands well above the buffer regions on both sides, and the pH jumps.
        let jump = (points[r_at + 1].ph - points[l_at + 1].ph).abs();
        if slope[i] < 4.0 * l_min.max(r_min) || jump < 1.0 {
            continue;
        }
        // Refine with the vertex of a parabola through the peak and its neighbours.
        let (y0, y1, y2) = (slope[i - 1], slope[i], slope[i + 1]);
        let denom = y0 - 2.0 * y1 + y2;
        let shift = if denom.abs() > 0.0 {
            (0.5 * (y0 - y2) / denom).clamp(-0.5, 0.5)
        } else {
            0.0
        };
        let p = &points[i + 1];
        let q = if shift >= 0.0 {
            &points[i + 2]
        } else {
            &points[i]
        };
        let t = shift.abs();
        out.push(EquivalencePoint {
            dose_g: p.dose_g + t * (q.dose_g - p.dose_g),
            ph: p.ph + t * (q.ph - p.ph),
        });
    }
    out
}

fn min_in(v: &[f64], from: usize, to: usize) -> (f64, usize) {
    let mut best = (f64::INFINITY, from);
    for (i, &x) in v.iter().enumerate().take(to + 1).skip(from) {
        if x < best.0 {
            best = (x, i);
        }
    }
    best
}
