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
    /// Its charge squared.
    pub z2: f64,
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
    /// The complex's charge squared.
    pub z2: f64,
    /// z² of the complex less z² of its metal: with the ligand's own distribution, how its
    /// conditional formation moves with the Davies function.
    pub dz2: f64,
    /// Ligands held (hydroxo complexes may hold up to four OH⁻).
    pub count: f64,
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
    /// The complexes whose metal and ligand the composition holds. Under the Pitzer model the
    /// pairs its parameters already hold are left out; in ideal solutions the ion pairs of
    /// singly charged metals (Na⁺, K⁺), an electrostatic effect such solutions lack by
    /// definition, are left out too.
    pub fn new(constants: &Constants, composition: &Composition, model: ActivityModel) -> Self {
        let pitzer = model == ActivityModel::Pitzer;
        let ideal = model == ActivityModel::Ideal;
        let mut b = Binding {
            by_slot: vec![Vec::new(); composition.systems.len()],
            ..Binding::default()
        };
        for (index, c) in constants.complexes.iter().enumerate() {
            if (pitzer && c.in_pitzer) || (ideal && constants.ion_charges[c.metal] == 1) {
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
                        z2: f64::from(constants.ion_charges[c.metal].pow(2)),
                    });
                    b.metals.len() - 1
                }
            };
            let k = b.complexes.len();
            match ligand {
                Ligand::Hydroxide => b.hydroxo.push(k),
                Ligand::Form { slot, .. } => b.by_slot[slot].push(k),
            }
            let z2 = f64::from(c.charge * c.charge);
            b.complexes.push(Bound {
                constant: index,
                metal,
                ligand,
                z2,
                dz2: z2 - f64::from(constants.ion_charges[c.metal].pow(2)),
                count: f64::from(c.ligand_count),
            });
        }
        b
    }

    /// Whether no complex takes part.
    pub fn is_empty(&self) -> bool {
        self.complexes.is_empty()
    }
}

/// The bound state at one pH: complexes, free ligand totals and derivatives, with the scratch
/// space of the metal Newton iteration (kept between evaluations so none allocates).
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
    /// d(charge residual)/dpH correction for the metal balances held closed.
    pub derivative_correction: f64,
    /// Largest relative metal-balance residual.
    pub metal_residual: f64,
    /// ∂(bound part of the charge residual)/∂pH at fixed free metals.
    pub partial_p: f64,
    f: Vec<f64>,
    jac: Vec<f64>,
    work: Vec<f64>,
    step: Vec<f64>,
    metal_sum: Vec<f64>,
    /// λ of the last residuals.
    lambda: f64,
    dp_slot: Vec<f64>,
    dln_d: Vec<f64>,
    dsum_ja: Vec<f64>,
    dr: Vec<f64>,
    dfdp: Vec<f64>,
    dfdphi: Vec<f64>,
    /// d(Σ z²m of the bound and ligand species)/d(pH, ln m, φ) at fixed everything else.
    dz2: Vec<f64>,
    /// pH of the last solve and d(ln m)/dpH there: the first-order start of the next solve.
    last_ph: Option<f64>,
    du_dp: Vec<f64>,
}

/// The linearization of the metal balances and the bound part of the charge residual.
pub struct Linearization<'s> {
    /// Metal residuals F = free + bound − total, per metal.
    pub f: &'s [f64],
    /// ∂F/∂u, k×k row-major (u = ln free metal).
    pub dfdu: &'s [f64],
    /// ∂F/∂pH.
    pub dfdp: &'s [f64],
    /// ∂R/∂pH of the bound part at fixed u.
    pub drdp: f64,
    /// ∂R/∂u of the bound part.
    pub drdu: &'s [f64],
    /// ∂R/∂φ of the bound part (φ the Davies function of the ionic strength).
    pub drdphi: f64,
    /// ∂F/∂φ.
    pub dfdphi: &'s [f64],
    /// ∂(Σ z²m)/∂(pH, ln m…, φ) of the ligand, metal and complex species.
    pub dz2: &'s [f64],
}

/// Inputs of one bound-state evaluation.
pub struct Inputs<'a> {
    /// Conditional formation constant of each complex (molal).
    pub k_cond: &'a [f64],
    /// Free-form distribution q_j of every slot, flat; slot s starts at `q_start[s]`.
    pub q: &'a [f64],
    /// Start of each slot's distribution in `q`.
    pub q_start: &'a [usize],
    /// ⟨j⟩ of each slot's free distribution.
    pub mean: &'a [f64],
    /// Var(j) of each slot.
    pub variance: &'a [f64],
    /// ⟨z²⟩, Cov(j, z²) and Var(z²) of each slot's free distribution.
    pub charge_moments: &'a [[f64; 3]],
    /// ln 10 · A of the Davies equation (0 when the coefficients do not follow it): with
    /// ln γ = −λ z² φ, the rate the distributions move with φ.
    pub lambda: f64,
    /// Total of each slot.
    pub totals: &'a [f64],
    /// Free OH⁻ molality.
    pub oh: f64,
    /// The pH (for the warm start's first-order step).
    pub ph: f64,
}

const LN10: f64 = std::f64::consts::LN_10;

impl BoundState {
    /// Drops the first-order start, so the next solve starts from the free metals as given.
    pub fn forget_warm_start(&mut self) {
        self.last_ph = None;
    }
}

impl Binding {
    /// Solves the metal balances at fixed free-ligand distributions, from `u` (ln free metal,
    /// updated in place), leaving the bound state and dR/dpH's correction in `state`.
    /// At most `max_steps` Newton steps are taken; `metal_residual` says how closed they are.
    pub fn solve(
        &self,
        inputs: &Inputs<'_>,
        u: &mut [f64],
        state: &mut BoundState,
        max_steps: usize,
    ) {
        let k = self.metals.len();
        // Every entry is written before it is read, so only the lengths need setting.
        self.prepare(state);
        if let Some(last) = state.last_ph
            && state.du_dp.len() == k
        {
            // First-order step along the curve of closed balances from the last solve.
            let dp = inputs.ph - last;
            for (x, g) in u.iter_mut().zip(&state.du_dp) {
                *x += (g * dp).clamp(-2.0, 2.0);
            }
        }
        for (n, m) in self.metals.iter().enumerate() {
            let top = m.total.ln();
            if !u[n].is_finite() || u[n] > top {
                u[n] = top;
            }
        }
        let mut worst = f64::INFINITY;
        let mut converged = false;
        for _ in 0..max_steps {
            self.residuals(inputs, u, state);
            worst = self.worst(state);
            if worst < 1e-14 {
                converged = true;
                break;
            }
            state.step.clear();
            state.step.extend(state.f.iter().map(|r| -r));
            state.work.clear();
            state.work.extend_from_slice(&state.jac);
            if !solve_linear(&mut state.work, &mut state.step, k) {
                break;
            }
            let big = state.step.iter().fold(0.0f64, |a, s| a.max(s.abs()));
            let scale = if big > 2.0 { 2.0 / big } else { 1.0 };
            for (n, m) in self.metals.iter().enumerate() {
                u[n] = (u[n] + scale * state.step[n]).min(m.total.ln());
            }
        }
        if !converged {
            // The state left is that of the last step; evaluate it so everything matches `u`.
            self.residuals(inputs, u, state);
            worst = self.worst(state);
        }
        state.metal_residual = worst;
        self.derivatives(state);
        state.last_ph = Some(inputs.ph);
    }

    /// Largest metal-balance residual relative to the metal's total, at the last residuals.
    fn worst(&self, state: &BoundState) -> f64 {
        self.metals
            .iter()
            .zip(&state.f)
            .map(|(m, r)| (r / m.total).abs())
            .fold(0.0, f64::max)
    }

    /// Metal residuals F, Jacobian ∂F/∂u, ∂F/∂pH, ∂F/∂φ and the bound state at `u`.
    ///
    /// A complex c of a ligand slot has d ln C_c = (own terms) − d ln D, with D the slot's
    /// denominator 1 + Σ a_c, so its contributions are summed per slot and metal: no dense row
    /// per complex is built.
    fn residuals(&self, inputs: &Inputs<'_>, u: &[f64], st: &mut BoundState) {
        let k = self.metals.len();
        // Derivative index 0 = pH, 1..=k = ln m, k + 1 = φ (the Davies function).
        let d = k + 2;
        let phi = k + 1;
        let lambda = inputs.lambda;
        st.lambda = lambda;
        st.dz2.fill(0.0);
        st.dfdp.fill(0.0);
        st.dfdphi.fill(0.0);
        st.jac.fill(0.0);
        for (n, ((free, f), (x, m))) in st
            .free
            .iter_mut()
            .zip(st.f.iter_mut())
            .zip(u.iter().zip(&self.metals))
            .enumerate()
        {
            *free = x.exp();
            *f = *free - m.total;
            st.jac[n * k + n] = *free;
            st.dz2[1 + n] += m.z2 * *free;
        }
        st.free_total.copy_from_slice(inputs.totals);
        for (slot, list) in self.by_slot.iter().enumerate() {
            let total = inputs.totals[slot];
            let mean = inputs.mean[slot];
            let variance = inputs.variance[slot];
            let [mz2, cov_jz2, var_z2] = inputs.charge_moments[slot];
            let dps = &mut st.dp_slot[slot * d..(slot + 1) * d];
            dps.fill(0.0);
            if list.is_empty() {
                st.protons_removed[slot] = total * mean;
                dps[0] = total * LN10 * variance;
                dps[phi] = total * lambda * cov_jz2;
                st.dz2[0] += total * LN10 * cov_jz2;
                st.dz2[phi] += total * lambda * var_z2;
                continue;
            }
            let q = &inputs.q[inputs.q_start[slot]..];
            let mut denom = 1.0;
            for &c in list {
                let b = &self.complexes[c];
                if let Ligand::Form { form, .. } = b.ligand {
                    let ac = inputs.k_cond[c] * q[form] * st.free[b.metal];
                    st.complex[c] = ac;
                    denom += ac;
                }
            }
            let s = total / denom;
            st.free_total[slot] = s;
            let inv_denom = 1.0 / denom;
            st.dln_d.fill(0.0);
            st.dsum_ja.fill(0.0);
            st.metal_sum.fill(0.0);
            let mut sum_ja = 0.0;
            let mut z2_sum = 0.0;
            for &c in list {
                let b = &self.complexes[c];
                let Ligand::Form { form, .. } = b.ligand else {
                    continue;
                };
                let ac = st.complex[c];
                let j = form as f64;
                // Own parts of d ln a_c: pH, ln m of its metal (1), φ.
                let own_p = LN10 * (j - mean);
                let own_phi = lambda * (b.dz2 - mz2);
                let w = ac * inv_denom;
                st.dln_d[0] += w * own_p;
                st.dln_d[1 + b.metal] += w;
                st.dln_d[phi] += w * own_phi;
                sum_ja += j * ac;
                st.dsum_ja[0] += j * ac * own_p;
                st.dsum_ja[1 + b.metal] += j * ac;
                st.dsum_ja[phi] += j * ac * own_phi;
                let amount = ac * s;
                st.complex[c] = amount;
                let n = b.metal;
                st.f[n] += amount;
                st.jac[n * k + n] += amount;
                st.dfdp[n] += amount * own_p;
                st.dfdphi[n] += amount * own_phi;
                st.metal_sum[n] += amount;
                let zc = b.z2 * amount;
                st.dz2[0] += zc * own_p;
                st.dz2[1 + n] += zc;
                st.dz2[phi] += zc * own_phi;
                z2_sum += zc;
            }
            // The −d ln D part every complex of the slot shares.
            for (n, &held) in st.metal_sum.iter().enumerate() {
                if held == 0.0 {
                    continue;
                }
                st.dfdp[n] -= held * st.dln_d[0];
                st.dfdphi[n] -= held * st.dln_d[phi];
                for (x, g) in st.jac[n * k..(n + 1) * k].iter_mut().zip(&st.dln_d[1..=k]) {
                    *x -= held * g;
                }
            }
            let p_l = s * (mean + sum_ja);
            st.protons_removed[slot] = p_l;
            for (v, ((out, z2_out), (&g, &sja))) in dps
                .iter_mut()
                .zip(st.dz2.iter_mut())
                .zip(st.dln_d.iter().zip(&st.dsum_ja))
                .enumerate()
            {
                let (own, own_z2) = if v == 0 {
                    (LN10 * variance, LN10 * cov_jz2)
                } else if v == phi {
                    (lambda * cov_jz2, lambda * var_z2)
                } else {
                    (0.0, 0.0)
                };
                *out = -p_l * g + s * (own + sja);
                *z2_out += s * (own_z2 - g * mz2) - z2_sum * g;
            }
        }
        for &c in &self.hydroxo {
            let b = &self.complexes[c];
            let n = b.metal;
            let oh = if b.count == 1.0 {
                inputs.oh
            } else {
                inputs.oh.powi(b.count as i32)
            };
            let amount = inputs.k_cond[c] * st.free[n] * oh;
            st.complex[c] = amount;
            // d ln C: pH n·ln 10, ln m 1, φ λ (z_C² − z_M²).
            let own_p = b.count * LN10;
            let own_phi = lambda * b.dz2;
            st.f[n] += amount;
            st.jac[n * k + n] += amount;
            st.dfdp[n] += amount * own_p;
            st.dfdphi[n] += amount * own_phi;
            let zc = b.z2 * amount;
            st.dz2[0] += zc * own_p;
            st.dz2[1 + n] += zc;
            st.dz2[phi] += zc * own_phi;
        }
    }

    /// The metal residuals and every partial derivative at (pH, `u`) as they stand, without
    /// closing the metal balances: the linearization a joint Newton step on pH and the free
    /// metals needs ([`Self::jacobian`] reads it).
    pub fn linearize(&self, inputs: &Inputs<'_>, u: &[f64], state: &mut BoundState) {
        self.prepare(state);
        self.residuals(inputs, u, state);
        state.metal_residual = self.worst(state);
        self.partials(state);
    }

    /// After [`Self::linearize`] at a point where the balances are closed: the derivative
    /// correction and the first-order start of the next solve, as [`Self::solve`] leaves them.
    pub fn close_at(&self, ph: f64, state: &mut BoundState) {
        self.closing(state);
        state.last_ph = Some(ph);
    }

    /// The linearization of the last [`Self::linearize`]: metal residuals F, ∂F/∂u (k×k,
    /// row-major), ∂F/∂pH, ∂R/∂pH and ∂R/∂u of the bound part of the charge residual.
    pub fn jacobian<'s>(&self, state: &'s BoundState) -> Linearization<'s> {
        Linearization {
            f: &state.f,
            dfdu: &state.jac,
            dfdp: &state.dfdp,
            drdp: state.dr[0],
            drdu: &state.dr[1..=self.metals.len()],
            drdphi: state.dr[self.metals.len() + 1],
            dfdphi: &state.dfdphi,
            dz2: &state.dz2,
        }
    }

    /// Sets the scratch lengths for this binding.
    fn prepare(&self, state: &mut BoundState) {
        let k = self.metals.len();
        let d = k + 2;
        let resize = |v: &mut Vec<f64>, n: usize| {
            if v.len() != n {
                v.clear();
                v.resize(n, 0.0);
            }
        };
        resize(&mut state.f, k);
        resize(&mut state.jac, k * k);
        resize(&mut state.free, k);
        resize(&mut state.complex, self.complexes.len());
        resize(&mut state.metal_sum, k);
        resize(&mut state.free_total, self.by_slot.len());
        resize(&mut state.dp_slot, self.by_slot.len() * d);
        resize(&mut state.protons_removed, self.by_slot.len());
        resize(&mut state.dln_d, d);
        resize(&mut state.dsum_ja, d);
        resize(&mut state.dr, d);
        resize(&mut state.dfdp, k);
        resize(&mut state.dfdphi, k);
        resize(&mut state.dz2, d);
    }

    /// ∂F/∂p, ∂R/∂p and ∂R/∂u at the last residuals, with R's bound part −Σ P_L − Σ hydroxo n·C,
    /// and the correction −∂R/∂u · J⁻¹ · ∂F/∂p.
    fn derivatives(&self, st: &mut BoundState) {
        self.partials(st);
        self.closing(st);
    }

    /// ∂R/∂p, ∂R/∂u and ∂R/∂φ at the last residuals (∂F/∂p and ∂F/∂φ come with them).
    fn partials(&self, st: &mut BoundState) {
        let k = self.metals.len();
        let d = k + 2;
        st.dr.fill(0.0);
        for dps in st.dp_slot.chunks_exact(d) {
            for (r, x) in st.dr.iter_mut().zip(dps) {
                *r -= x;
            }
        }
        for &c in &self.hydroxo {
            let b = &self.complexes[c];
            // Each holds `count` OH⁻: its part of R is −n·C.
            let held = b.count * st.complex[c];
            st.dr[0] -= held * b.count * LN10;
            st.dr[1 + b.metal] -= held;
            st.dr[k + 1] -= held * st.lambda * b.dz2;
        }
        st.partial_p = st.dr[0];
    }

    /// The correction −∂R/∂u · J⁻¹ · ∂F/∂p and du/dp, from the partials.
    fn closing(&self, st: &mut BoundState) {
        let k = self.metals.len();
        st.step.clear();
        st.step.extend_from_slice(&st.dfdp);
        st.work.clear();
        st.work.extend_from_slice(&st.jac);
        let solved = k > 0 && solve_linear(&mut st.work, &mut st.step, k);
        let correction = if solved {
            -(0..k).map(|n| st.dr[1 + n] * st.step[n]).sum::<f64>()
        } else {
            0.0
        };
        // J·du/dp = −∂F/∂p.
        st.du_dp.clear();
        if solved {
            st.du_dp.extend(st.step.iter().map(|x| -x));
        }
        st.derivative_correction = correction;
    }
}

/// Solves a·x = b in place (k×k, row-major) by Gaussian elimination with partial pivoting.
/// `a` may be left overwritten. Systems of up to 8 unknowns (every metal count met in practice) are
/// solved on the stack with their size known to the compiler.
pub fn solve_linear(a: &mut [f64], b: &mut [f64], k: usize) -> bool {
    match k {
        1 => solve_fixed::<1>(a, b),
        2 => solve_fixed::<2>(a, b),
        3 => solve_fixed::<3>(a, b),
        4 => solve_fixed::<4>(a, b),
        5 => solve_fixed::<5>(a, b),
        6 => solve_fixed::<6>(a, b),
        7 => solve_fixed::<7>(a, b),
        8 => solve_fixed::<8>(a, b),
        _ => solve_any(a, b, k),
    }
}

/// [`solve_linear`] for N unknowns, in arrays on the stack.
fn solve_fixed<const N: usize>(a: &[f64], b: &mut [f64]) -> bool {
    let mut m = [[0.0; N]; N];
    for (row, src) in m.iter_mut().zip(a.chunks_exact(N)) {
        row.copy_from_slice(src);
    }
    let mut v = [0.0; N];
    v.copy_from_slice(&b[..N]);
    for col in 0..N {
        let mut pivot = col;
        for i in col + 1..N {
            if m[i][col].abs() > m[pivot][col].abs() {
                pivot = i;
            }
        }
        let p = m[pivot][col];
        if p.abs() < f64::MIN_POSITIVE || !p.is_finite() {
            return false;
        }
        m.swap(col, pivot);
        v.swap(col, pivot);
        let inv = 1.0 / p;
        let (upper, lower) = m.split_at_mut(col + 1);
        let pivot_row = &upper[col];
        let v_col = v[col];
        for (row, vi) in lower.iter_mut().zip(&mut v[col + 1..]) {
            let factor = row[col] * inv;
            for (x, y) in row[col..].iter_mut().zip(&pivot_row[col..]) {
                *x -= factor * y;
            }
            *vi -= factor * v_col;
        }
    }
    for col in (0..N).rev() {
        let row = &m[col];
        let mut x = v[col];
        for (r, y) in row[col + 1..].iter().zip(&v[col + 1..]) {
            x -= r * y;
        }
        v[col] = x / row[col];
    }
    b[..N].copy_from_slice(&v);
    v.iter().all(|x| x.is_finite())
}

/// [`solve_linear`] for any size, in place.
fn solve_any(a: &mut [f64], b: &mut [f64], k: usize) -> bool {
    let (a, b) = (&mut a[..k * k], &mut b[..k]);
    for col in 0..k {
        let mut pivot = col;
        for i in col + 1..k {
            if a[i * k + col].abs() > a[pivot * k + col].abs() {
                pivot = i;
            }
        }
        let p = a[pivot * k + col];
        if p.abs() < f64::MIN_POSITIVE || !p.is_finite() {
            return false;
        }
        if pivot != col {
            for j in 0..k {
                a.swap(col * k + j, pivot * k + j);
            }
            b.swap(col, pivot);
        }
        let (upper, lower) = a.split_at_mut((col + 1) * k);
        let pivot_row = &upper[col * k + col..col * k + k];
        let inv = 1.0 / pivot_row[0];
        let b_col = b[col];
        for (r, row) in lower.chunks_exact_mut(k).enumerate() {
            let factor = row[col] * inv;
            if factor == 0.0 {
                continue;
            }
            for (x, y) in row[col..].iter_mut().zip(pivot_row) {
                *x -= factor * y;
            }
            b[col + 1 + r] -= factor * b_col;
        }
    }
    for col in (0..k).rev() {
        let row = &a[col * k..(col + 1) * k];
        let mut v = b[col];
        for (x, y) in row[col + 1..].iter().zip(&b[col + 1..]) {
            v -= x * y;
        }
        b[col] = v / row[col];
    }
    b.iter().all(|v| v.is_finite())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A diagonally dominant test matrix of size k with a known solution x_i = i + 1.
    fn system(k: usize) -> (Vec<f64>, Vec<f64>, Vec<f64>) {
        let x: Vec<f64> = (0..k).map(|i| i as f64 + 1.0).collect();
        let mut a = vec![0.0; k * k];
        for i in 0..k {
            for j in 0..k {
                // Off-diagonal entries from a fixed pattern; row 0 starts small so that
                // pivoting has to swap rows.
                a[i * k + j] = if i == j {
                    if i == 0 { 1e-3 } else { 10.0 + i as f64 }
                } else {
                    ((i * 7 + j * 3) % 5) as f64 - 2.0
                };
            }
        }
        let b = (0..k)
            .map(|i| (0..k).map(|j| a[i * k + j] * x[j]).sum())
            .collect();
        (a, b, x)
    }

    #[test]
    fn every_size_solves_to_the_known_solution_alike() {
        for k in 1..=10 {
            let (a, b, x) = system(k);
            let (mut a1, mut b1) = (a.clone(), b.clone());
            assert!(solve_linear(&mut a1, &mut b1, k), "size {k}");
            let (mut a2, mut b2) = (a.clone(), b.clone());
            assert!(solve_any(&mut a2, &mut b2, k), "size {k}");
            for i in 0..k {
                assert!((b1[i] - x[i]).abs() < 1e-9, "size {k}: {b1:?}");
                assert!((b1[i] - b2[i]).abs() < 1e-12, "size {k}");
            }
        }
    }

    #[test]
    fn a_singular_system_is_refused() {
        for k in 1..=10 {
            let mut a = vec![0.0; k * k];
            let mut b = vec![1.0; k];
            assert!(!solve_linear(&mut a, &mut b, k), "size {k}");
        }
    }
}
