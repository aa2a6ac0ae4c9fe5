//! Metal ions bound by ligands: which complexes take part in a composition, and the free metal
//! molalities that close every metal's mass balance at a given pH.
//!
//! A ligand system's free forms keep their acid–base distribution q_j; with a_c = K'_c·q_j·m_M
//! for each complex c of the system, its free total is S = T/(1 + Σ a_c) and complex c holds
//! a_c·S. Hydroxo complexes take the free OH⁻ the pH sets. The metal balances
//! m_M + Σ_c C_c = T_M are solved by Newton in ln m_M with the analytic Jacobian, each step
//! limited and the free molality kept below the total.

use super::{ActivityModel, Composition, Constants};
use crate::library::Species;

/// A metal ion that some complex of the composition binds.
#[derive(Debug, Clone, Copy)]
pub struct Metal {
    /// Slot in the composition's ions.
    pub slot: usize,
    /// Total molality.
    pub total: f64,
}

/// What a complex binds.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Ligand {
    /// Free OH⁻.
    Hydroxide,
    /// Form `form` of the composition's system in slot `slot`.
    Form {
        /// Slot in the composition's systems.
        slot: usize,
        /// Protons removed.
        form: usize,
    },
}

/// A complex that takes part.
#[derive(Debug, Clone, Copy)]
pub struct Bound {
    /// Index into the constants' complexes.
    pub constant: usize,
    /// Index into [`Binding::metals`].
    pub metal: usize,
    /// The ligand.
    pub ligand: Ligand,
}

/// The metals and complexes of one composition.
#[derive(Debug, Clone, Default)]
pub struct Binding {
    /// Metals bound by at least one complex.
    pub metals: Vec<Metal>,
    /// Complexes taking part.
    pub complexes: Vec<Bound>,
    /// Complexes of each system slot.
    pub by_slot: Vec<Vec<usize>>,
    /// Hydroxo complexes.
    pub hydroxo: Vec<usize>,
}

impl Binding {
    /// The complexes whose metal and ligand the composition holds; under the Pitzer model, the
    /// pairs its parameters already hold are left out.
    pub fn new(constants: &Constants, composition: &Composition, model: ActivityModel) -> Self {
        let pitzer = model == ActivityModel::Pitzer;
        let mut b = Binding {
            by_slot: vec![Vec::new(); composition.systems.len()],
            ..Binding::default()
        };
        for (index, c) in constants.complexes.iter().enumerate() {
            if pitzer && c.in_pitzer {
                continue;
            }
            let Some(ion_slot) = composition
                .ions
                .iter()
                .position(|&(i, m)| i == c.metal && m > 0.0)
            else {
                continue;
            };
            let ligand = match c.ligand {
                Species::Ion(i) if i == constants.hydroxide => Ligand::Hydroxide,
                Species::Form { system, form } => {
                    match composition.systems.iter().position(|&(s, _)| s == system) {
                        Some(slot) => Ligand::Form { slot, form },
                        None => continue,
                    }
                }
                Species::Ion(_) => continue,
            };
            let metal = match b.metals.iter().position(|m| m.slot == ion_slot) {
                Some(m) => m,
                None => {
                    b.metals.push(Metal {
                        slot: ion_slot,
                        total: composition.ions[ion_slot].1,
                    });
                    b.metals.len() - 1
                }
            };
            let k = b.complexes.len();
            match ligand {
                Ligand::Hydroxide => b.hydroxo.push(k),
                Ligand::Form { slot, .. } => b.by_slot[slot].push(k),
            }
            b.complexes.push(Bound {
                constant: index,
                metal,
                ligand,
            });
        }
        b
    }

    /// Whether no complex takes part.
    pub fn is_empty(&self) -> bool {
        self.complexes.is_empty()
    }
}

/// The bound state at one pH: complexes, free ligand totals and derivatives.
#[derive(Debug, Clone, Default)]
pub struct BoundState {
    /// Free metal molalities.
    pub free: Vec<f64>,
    /// Molality of each complex.
    pub complex: Vec<f64>,
    /// Per system slot: free total S (the system total where nothing binds).
    pub free_total: Vec<f64>,
    /// Per system slot: protons removed from the system, free and bound, mol/kg.
    pub protons_removed: Vec<f64>,
    /// d(charge residual)/dpH with the metal balances held closed.
    pub derivative_correction: f64,
    /// Largest relative metal-balance residual.
    pub metal_residual: f64,
    /// ∂(protons removed, all slots, plus hydroxo OH)/∂pH at fixed free metals, for the residual.
    pub partial_p: f64,
}

/// Inputs of one bound-state evaluation.
pub struct Inputs<'a> {
    /// Conditional formation constant of each complex (molal).
    pub k_cond: &'a [f64],
    /// Free-form distribution q_j of each slot (empty for slots nothing binds).
    pub q: &'a [Vec<f64>],
    /// ⟨j⟩ and Var(j) of each slot's free distribution.
    pub mean: &'a [f64],
    /// Var(j) of each slot.
    pub variance: &'a [f64],
    /// Total of each slot.
    pub totals: &'a [f64],
    /// Free OH⁻ molality.
    pub oh: f64,
}

const LN10: f64 = std::f64::consts::LN_10;

impl Binding {
    /// Solves the metal balances at fixed free-ligand distributions, from `u` (ln free metal,
    /// updated in place), and returns the bound state with dR/dpH's correction.
    pub fn solve(&self, inputs: &Inputs<'_>, u: &mut [f64]) -> BoundState {
        let k = self.metals.len();
        for (n, m) in self.metals.iter().enumerate() {
            let top = m.total.ln();
            if !u[n].is_finite() || u[n] > top {
                u[n] = top;
            }
        }
        let mut jac = vec![0.0; k * k];
        let mut f = vec![0.0; k];
        let mut worst = f64::INFINITY;
        for _ in 0..200 {
            self.residuals(inputs, u, &mut f, &mut jac, None);
            worst = self
                .metals
                .iter()
                .zip(&f)
                .map(|(m, r)| (r / m.total).abs())
                .fold(0.0, f64::max);
            if worst < 1e-14 {
                break;
            }
            let mut step: Vec<f64> = f.iter().map(|r| -r).collect();
            if !solve_linear(&mut jac.clone(), &mut step, k) {
                break;
            }
            let big = step.iter().fold(0.0f64, |a, s| a.max(s.abs()));
            let scale = if big > 2.0 { 2.0 / big } else { 1.0 };
            for (n, m) in self.metals.iter().enumerate() {
                u[n] = (u[n] + scale * step[n]).min(m.total.ln());
            }
        }
        let mut state = BoundState::default();
        let mut dp = vec![0.0; k];
        self.residuals(inputs, u, &mut f, &mut jac, Some((&mut state, &mut dp)));
        state.metal_residual = worst;
        // dR/dpH = ∂R/∂p − ∂R/∂u · J⁻¹ ∂F/∂p; ∂R/∂u is stored in `dp`'s partner below.
        state
    }

    /// Metal residuals F and Jacobian ∂F/∂u at `u`; with `full`, the bound state too.
    fn residuals(
        &self,
        inputs: &Inputs<'_>,
        u: &[f64],
        f: &mut [f64],
        jac: &mut [f64],
        full: Option<(&mut BoundState, &mut Vec<f64>)>,
    ) {
        let k = self.metals.len();
        let d = k + 1; // derivative index 0 = pH, 1.. = ln m
        let free: Vec<f64> = u.iter().map(|x| x.exp()).collect();
        for (n, r) in f.iter_mut().enumerate() {
            *r = free[n] - self.metals[n].total;
        }
        jac.iter_mut().for_each(|x| *x = 0.0);
        for n in 0..k {
            jac[n * k + n] = free[n];
        }
        let mut complex = vec![0.0; self.complexes.len()];
        // ∂ln C_c over (p, u).
        let mut dln_c = vec![0.0; self.complexes.len() * d];
        let slots = self.by_slot.len();
        let mut free_total = inputs.totals.to_vec();
        let mut protons = vec![0.0; slots];
        // ∂P_L over (p, u).
        let mut dp_slot = vec![0.0; slots * d];
        for slot in 0..slots {
            let list = &self.by_slot[slot];
            let total = inputs.totals[slot];
            let mean = inputs.mean[slot];
            if list.is_empty() {
                protons[slot] = total * mean;
                dp_slot[slot * d] = total * LN10 * inputs.variance[slot];
                continue;
            }
            let q = &inputs.q[slot];
            let mut denom = 1.0;
            let mut a = Vec::with_capacity(list.len());
            for &c in list {
                let b = self.complexes[c];
                let Ligand::Form { form, .. } = b.ligand else {
                    continue;
                };
                let ac = inputs.k_cond[c] * q[form] * free[b.metal];
                a.push((c, form, ac));
                denom += ac;
            }
            let s = total / denom;
            free_total[slot] = s;
            // ∂ln D over (p, u).
            let mut dln_d = vec![0.0; d];
            for &(c, form, ac) in &a {
                let w = ac / denom;
                dln_d[0] += w * LN10 * (form as f64 - mean);
                dln_d[1 + self.complexes[c].metal] += w;
            }
            let mut sum_ja = 0.0;
            let mut dsum_ja = vec![0.0; d];
            for &(c, form, ac) in &a {
                let metal = self.complexes[c].metal;
                complex[c] = ac * s;
                let row = &mut dln_c[c * d..(c + 1) * d];
                row[0] = LN10 * (form as f64 - mean) - dln_d[0];
                for (n, r) in row.iter_mut().enumerate().skip(1) {
                    *r = -dln_d[n];
                }
                row[1 + metal] += 1.0;
                let j = form as f64;
                sum_ja += j * ac;
                dsum_ja[0] += j * ac * LN10 * (j - mean);
                dsum_ja[1 + metal] += j * ac;
            }
            let p_l = s * (mean + sum_ja);
            protons[slot] = p_l;
            for v in 0..d {
                let own = if v == 0 {
                    LN10 * inputs.variance[slot]
                } else {
                    0.0
                };
                dp_slot[slot * d + v] = -p_l * dln_d[v] + s * (own + dsum_ja[v]);
            }
        }
        for &c in &self.hydroxo {
            let b = self.complexes[c];
            complex[c] = inputs.k_cond[c] * free[b.metal] * inputs.oh;
            let row = &mut dln_c[c * d..(c + 1) * d];
            row[0] = LN10;
            row[1 + b.metal] = 1.0;
        }
        for (c, b) in self.complexes.iter().enumerate() {
            let n = b.metal;
            f[n] += complex[c];
            for m in 0..k {
                jac[n * k + m] += complex[c] * dln_c[c * d + 1 + m];
            }
        }
        let Some((state, dfdp)) = full else {
            return;
        };
        // ∂F/∂p, ∂R/∂p and ∂R/∂u, with R's bound part −Σ P_L − Σ hydroxo C.
        dfdp.iter_mut().for_each(|x| *x = 0.0);
        for (c, b) in self.complexes.iter().enumerate() {
            dfdp[b.metal] += complex[c] * dln_c[c * d];
        }
        let mut dr = vec![0.0; d];
        for slot in 0..slots {
            for v in 0..d {
                dr[v] -= dp_slot[slot * d + v];
            }
        }
        for &c in &self.hydroxo {
            for v in 0..d {
                dr[v] -= complex[c] * dln_c[c * d + v];
            }
        }
        let mut x = dfdp.clone();
        let correction = if k > 0 && solve_linear(&mut jac.to_vec(), &mut x, k) {
            -(0..k).map(|n| dr[1 + n] * x[n]).sum::<f64>()
        } else {
            0.0
        };
        state.free = free;
        state.complex = complex;
        state.free_total = free_total;
        state.protons_removed = protons;
        state.partial_p = dr[0];
        state.derivative_correction = correction;
    }
}

/// Solves a·x = b in place (k×k, row-major) by Gaussian elimination with partial pivoting.
fn solve_linear(a: &mut [f64], b: &mut [f64], k: usize) -> bool {
    for col in 0..k {
        let pivot = (col..k)
            .max_by(|&i, &j| a[i * k + col].abs().total_cmp(&a[j * k + col].abs()))
            .unwrap_or(col);
        if a[pivot * k + col].abs() < f64::MIN_POSITIVE || !a[pivot * k + col].is_finite() {
            return false;
        }
        if pivot != col {
            for j in 0..k {
                a.swap(col * k + j, pivot * k + j);
            }
            b.swap(col, pivot);
        }
        for row in col + 1..k {
            let factor = a[row * k + col] / a[col * k + col];
            for j in col..k {
                a[row * k + j] -= factor * a[col * k + j];
            }
            b[row] -= factor * b[col];
        }
    }
    for col in (0..k).rev() {
        let mut v = b[col];
        for j in col + 1..k {
            v -= a[col * k + j] * b[j];
        }
        b[col] = v / a[col * k + col];
    }
    b.iter().all(|v| v.is_finite())
}
