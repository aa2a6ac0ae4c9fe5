//! The charge balance in one unknown (pH) with its analytic derivative, at fixed activity
//! coefficients; metal balances, where complexes take part, are closed inside each evaluation.

use std::f64::consts::LN_10;

use super::binding::{Binding, BoundState, Inputs, Ligand};
use super::layout::{self, H, Layout, OH};
use super::pitzer::Model;
use super::species;
use super::{ActivityModel, Composition, Constants, Solution, SolveStatus};

/// Most metal Newton steps per evaluation (each evaluation closes the metals).
const METAL_STEPS: usize = 200;

/// One evaluation of the charge balance at a pH.
#[derive(Debug, Clone, Copy)]
pub struct Evaluation {
    /// Σ z·m over all species, mol/kg (decreasing in pH).
    pub residual: f64,
    /// d(residual)/dpH (negative: minus the buffer capacity).
    pub derivative: f64,
    /// Σ |z|·m, the scale of the residual.
    pub scale: f64,
    /// Ionic strength of this state.
    pub ionic_strength: f64,
    /// Free H⁺ molality.
    pub h_molal: f64,
    /// Free OH⁻ molality.
    pub oh_molal: f64,
    /// Protons removed from the systems and OH⁻ bound to metals, mol/kg.
    pub protons_removed: f64,
    /// Largest relative metal-balance residual (0 without complexes).
    pub metal_residual: f64,
}

/// The charge balance of one composition, with activity coefficients and conditional
/// constants held between calls to [`ChargeBalance::set_gammas`].
pub struct ChargeBalance<'a> {
    constants: &'a Constants,
    composition: &'a Composition,
    model: ActivityModel,
    layout: Layout,
    binding: Binding,
    pitzer: Option<Model>,
    /// γ of every layout position.
    gamma: Vec<f64>,
    /// The ionic strength the by-charge coefficients are for (NaN when set otherwise).
    ionic: f64,
    /// ln 10 · A under Davies (the coefficients follow the ionic strength by charge), else 0.
    lambda: f64,
    /// Conditional Ka of every step of every system present, in composition order.
    ka_c: Vec<f64>,
    /// Conditional formation constant of each complex taking part.
    k_cond: Vec<f64>,
    /// ln free molality of each bound metal (warm start).
    u: Vec<f64>,
    totals: Vec<f64>,
    /// Scratch of the bound state and the free distributions, reused by every evaluation.
    state: BoundState,
    dist: Distributions,
    /// Scratch of the joint Newton steps: the matrix, the right-hand side, the free metals
    /// to return to if the steps fail.
    joint: (Vec<f64>, Vec<f64>, Vec<f64>),
}

/// Free-form distributions of every slot (flat) with their ⟨j⟩ and Var(j).
#[derive(Debug, Clone, Default)]
struct Distributions {
    q: Vec<f64>,
    q_start: Vec<usize>,
    mean: Vec<f64>,
    variance: Vec<f64>,
    /// ⟨z²⟩, Cov(j, z²) and Var(z²) of each slot.
    charge_moments: Vec<[f64; 3]>,
}

impl Distributions {
    /// The inputs of a bound-state evaluation at these distributions.
    fn inputs<'s>(
        &'s self,
        k_cond: &'s [f64],
        totals: &'s [f64],
        lambda: f64,
        oh: f64,
        ph: f64,
    ) -> Inputs<'s> {
        Inputs {
            k_cond,
            q: &self.q,
            q_start: &self.q_start,
            mean: &self.mean,
            variance: &self.variance,
            charge_moments: &self.charge_moments,
            lambda,
            totals,
            oh,
            ph,
        }
    }
}

impl<'a> ChargeBalance<'a> {
    /// The balance of a composition under some constants, at I = 0 until set.
    pub fn new(constants: &'a Constants, composition: &'a Composition) -> Self {
        Self::with_model(
            constants,
            composition,
            constants.conditions.activity.fixed(),
        )
    }

    /// The balance under a given activity model (not `Auto`).
    pub fn with_model(
        constants: &'a Constants,
        composition: &'a Composition,
        model: ActivityModel,
    ) -> Self {
        let binding = Binding::new(constants, composition, model);
        let layout = Layout::new(constants, composition, &binding);
        let pitzer =
            (model == ActivityModel::Pitzer).then(|| layout.pitzer_model(constants, composition));
        let steps = composition
            .systems
            .iter()
            .map(|&(s, _)| constants.ka(s).len())
            .sum();
        let u = binding.metals.iter().map(|m| m.total.ln()).collect();
        let mut b = Self {
            constants,
            composition,
            model,
            gamma: vec![1.0; layout.len()],
            layout,
            pitzer,
            ionic: f64::NAN,
            lambda: if model == ActivityModel::Davies {
                LN_10 * constants.davies_a
            } else {
                0.0
            },
            ka_c: Vec::with_capacity(steps),
            k_cond: vec![0.0; binding.complexes.len()],
            binding,
            u,
            totals: composition.systems.iter().map(|&(_, t)| t).collect(),
            state: BoundState::default(),
            dist: Distributions::default(),
            joint: Default::default(),
        };
        b.set_ionic_strength(0.0);
        b
    }

    /// The balance of a solved state, holding its model, coefficients and free metals.
    pub fn at_solution(
        constants: &'a Constants,
        composition: &'a Composition,
        solution: &Solution,
    ) -> Self {
        let mut model = Self::with_model(constants, composition, solution.activity);
        if solution.gamma.len() == model.gammas().len() {
            model.set_gammas(solution.gamma.clone());
        } else {
            model.set_ionic_strength(solution.ionic_strength);
        }
        model.set_free_metals(&solution.free_metals);
        model
    }

    /// Moves the balance to another composition of the same shape — the same systems and ions
    /// in the same order, the same ions present, the unattributed charge of the same sign — as
    /// the points of a dose curve are; keeps the layout, the binding, the coefficients and the
    /// warm start. Returns false (and changes nothing) when the shape differs.
    pub fn retarget(&mut self, composition: &'a Composition) -> bool {
        let old = self.composition;
        let same_systems = old.systems.len() == composition.systems.len()
            && old
                .systems
                .iter()
                .zip(&composition.systems)
                .all(|(a, b)| a.0 == b.0);
        let same_ions = old.ions.len() == composition.ions.len()
            && old
                .ions
                .iter()
                .zip(&composition.ions)
                .all(|(a, b)| a.0 == b.0 && (a.1 > 0.0) == (b.1 > 0.0));
        if !same_systems || !same_ions {
            return false;
        }
        let attributed: f64 = composition
            .ions
            .iter()
            .map(|&(i, m)| f64::from(self.constants.ion_charges[i]) * m)
            .sum();
        let unattributed = composition.spectator_charge - attributed;
        // A sign that is rounding (the charge of the ions named sums to the spectators') makes
        // no difference: the unattributed charge only enters the ionic strength, as |charge|.
        let rounding = 1e-12 * composition.spectator_abs_charge;
        let held_negative = self.layout.charges[self.layout.unattributed] < 0;
        if (unattributed < 0.0) != held_negative && unattributed.abs() > rounding {
            return false;
        }
        self.composition = composition;
        self.layout.unattributed_charge = unattributed;
        self.totals.clear();
        self.totals
            .extend(composition.systems.iter().map(|&(_, t)| t));
        for m in &mut self.binding.metals {
            m.total = composition.ions[m.slot].1;
        }
        true
    }

    /// The activity model of this balance.
    pub fn model(&self) -> ActivityModel {
        self.model
    }

    /// Sets the coefficients from the charges at an ionic strength (Davies or ideal; the start
    /// of a Pitzer iteration).
    pub fn set_ionic_strength(&mut self, ionic_strength: f64) {
        if ionic_strength.to_bits() == self.ionic.to_bits() {
            return;
        }
        let g = super::species::Gammas::with_model(self.constants, ionic_strength, self.model);
        for (gamma, &z) in self.gamma.iter_mut().zip(&self.layout.charges) {
            *gamma = g.of(z);
        }
        self.conditional();
        self.ionic = ionic_strength;
    }

    /// Holds the given coefficients (layout order) and recomputes the conditional constants.
    pub fn set_gammas(&mut self, gamma: Vec<f64>) {
        self.ionic = f64::NAN;
        self.gamma = gamma;
        self.conditional();
    }

    /// Conditional acidity and formation constants at the coefficients held.
    fn conditional(&mut self) {
        self.ka_c.clear();
        for (slot, &(system, _)) in self.composition.systems.iter().enumerate() {
            let start = self.layout.form_start[slot];
            for (k, &ka) in self.constants.ka(system).iter().enumerate() {
                self.ka_c
                    .push(ka * self.gamma[start + k] / self.gamma[start + k + 1]);
            }
        }
        for (c, b) in self.binding.complexes.iter().enumerate() {
            let g_metal = self.gamma[self.layout.ion(self.binding.metals[b.metal].slot)];
            let g_ligand = match b.ligand {
                Ligand::Hydroxide if b.count == 1.0 => self.gamma[OH],
                Ligand::Hydroxide => self.gamma[OH].powi(b.count as i32),
                Ligand::Form { slot, form } => self.gamma[self.layout.form_start[slot] + form],
            };
            let g_complex = self.gamma[self.layout.complex_start + c];
            self.k_cond[c] =
                self.constants.complexes[b.constant].k * g_metal * g_ligand / g_complex;
        }
    }

    /// Finds the root of the charge balance from `start` inside the searched pH range.
    ///
    /// With metals bound, Newton steps on pH and the free metals together come first; they
    /// usually converge in a few steps, each closing no balance on its own. If they leave the
    /// range or do not converge, the bracketed search (which closes the metals inside every
    /// evaluation, and always returns) takes over from the start.
    pub fn root(&mut self, start: f64) -> super::newton::Outcome {
        if !self.binding.is_empty() {
            let mut u0 = std::mem::take(&mut self.joint.2);
            u0.clear();
            u0.extend_from_slice(&self.u);
            let outcome = self.joint_root(start);
            if outcome.is_none() {
                self.u.copy_from_slice(&u0);
                self.state.forget_warm_start();
            }
            self.joint.2 = u0;
            if let Some(outcome) = outcome {
                return outcome;
            }
        }
        super::newton::solve_bracketed(|x| self.evaluate(x), start, super::PH_MIN, super::PH_MAX)
    }

    /// Joint Newton on (pH, ln free metals, ionic strength) under Davies: the ionic strength is
    /// one more unknown, with the equation I(state) − I = 0 and the Davies coefficients'
    /// derivative in the linearization, so it converges with the balances instead of in an
    /// outer loop around them. `None` (with the free metals as they were) unless all of them
    /// converge inside the range; the coefficients are then those of the returned state. A
    /// `cold` start (no guess) with ion pairs alone starts from the pH without complexes.
    pub fn root_with_ionic(
        &mut self,
        start_ph: f64,
        start_ionic: f64,
        cold: bool,
    ) -> Option<super::newton::Outcome> {
        if self.binding.is_empty() || self.lambda == 0.0 {
            return None;
        }
        self.set_ionic_strength(start_ionic);
        // Ion pairs of Na⁺ and K⁺ alone barely move the pH, so the pH without complexes is a
        // close start; chelated Ca²⁺ or Mg²⁺ can move it by units, so there it is no help.
        let pairs_only = self.binding.metals.iter().all(|m| m.z2 == 1.0);
        let start_ph = if cold && pairs_only {
            self.ph_without_complexes(start_ph)
        } else {
            start_ph
        };
        let mut u0 = std::mem::take(&mut self.joint.2);
        u0.clear();
        u0.extend_from_slice(&self.u);
        let outcome = self.joint_root_following(start_ph, true);
        if outcome.is_none() {
            self.u.copy_from_slice(&u0);
            self.state.forget_warm_start();
        }
        self.joint.2 = u0;
        outcome
    }

    /// Joint Newton on (pH, ln free metals): `None` unless it converges inside the range.
    fn joint_root(&mut self, start: f64) -> Option<super::newton::Outcome> {
        self.joint_root_following(start, false)
    }

    /// [`Self::joint_root`], with the ionic strength one more unknown when `follow` is set.
    fn joint_root_following(&mut self, start: f64, follow: bool) -> Option<super::newton::Outcome> {
        let k = self.binding.metals.len();
        let follow = follow && self.lambda > 0.0;
        let n = k + 1 + usize::from(follow);
        let (mut a, mut b) = (
            std::mem::take(&mut self.joint.0),
            std::mem::take(&mut self.joint.1),
        );
        a.resize(n * n, 0.0);
        b.resize(n, 0.0);
        let outcome = self.joint_steps(start, &mut a, &mut b, k, follow);
        self.joint.0 = a;
        self.joint.1 = b;
        outcome
    }

    /// The steps of [`Self::joint_root`] with its scratch lent. With `follow`, the unknowns are
    /// (pH, ln free metals, I) and the last equation is I(state) − I = 0; the coefficients
    /// follow I by the Davies equation, whose derivative the linearization carries (∂/∂φ).
    fn joint_steps(
        &mut self,
        start: f64,
        a: &mut [f64],
        b: &mut [f64],
        k: usize,
        follow: bool,
    ) -> Option<super::newton::Outcome> {
        const MAX_STEPS: u32 = 30;
        const REL_TOL: f64 = 1e-12;
        const METAL_TOL: f64 = 1e-12;
        const METAL_STEP: f64 = 8.0;
        let n = k + 1 + usize::from(follow);
        let mut ph = start.clamp(super::PH_MIN, super::PH_MAX);
        if !ph.is_finite() {
            return None;
        }
        for iteration in 1..=MAX_STEPS {
            let (inv_h, h_molal, oh_molal, sums) = self.water_terms(ph);
            self.distributions(inv_h);
            let inputs = self
                .dist
                .inputs(&self.k_cond, &self.totals, self.lambda, oh_molal, ph);
            self.binding.linearize(&inputs, &self.u, &mut self.state);
            let e = self.bound_evaluation(h_molal, oh_molal, sums);
            if !e.residual.is_finite() {
                return None;
            }
            let ionic_gap = if follow {
                e.ionic_strength - self.ionic
            } else {
                0.0
            };
            // Without `follow` the coefficients are held (under Pitzer `ionic` is NaN).
            if (!follow || ionic_gap.abs() <= super::IONIC_TOL * (1.0 + self.ionic))
                && e.residual.abs() <= REL_TOL * e.scale
                && self.state.metal_residual <= METAL_TOL
            {
                // Closing changes only the derivative's correction for the metals held closed.
                self.binding.close_at(ph, &mut self.state);
                let e = Evaluation {
                    derivative: self.bound_derivative(h_molal, oh_molal),
                    ..e
                };
                return Some(super::newton::Outcome {
                    x: ph,
                    iterations: iteration,
                    status: super::newton::Status::Converged,
                    ionic_strength: e.ionic_strength,
                    at_x: Some(e),
                });
            }
            let lin = self.binding.jacobian(&self.state);
            // Row 0: the charge balance; rows 1..=k: the metals; row k + 1 (with `follow`): the
            // ionic strength. Column 0: pH; 1..=k: ln m; k + 1: I.
            a[0] = -LN_10 * (h_molal + oh_molal) + lin.drdp;
            a[1..=k].copy_from_slice(lin.drdu);
            b[0] = -e.residual;
            for m in 0..k {
                let row = &mut a[(m + 1) * n..(m + 2) * n];
                row[0] = lin.dfdp[m];
                row[1..=k].copy_from_slice(&lin.dfdu[m * k..(m + 1) * k]);
                b[m + 1] = -lin.f[m];
            }
            if follow {
                // ∂/∂I = ∂/∂φ · dφ/dI; H⁺ and OH⁻ (z² = 1) have d ln m/dφ = λ.
                let slope = super::activity::davies_slope(self.ionic);
                let lambda = self.lambda;
                a[k + 1] = (lambda * (h_molal - oh_molal) + lin.drdphi) * slope;
                for m in 0..k {
                    a[(m + 1) * n + k + 1] = lin.dfdphi[m] * slope;
                }
                let row = &mut a[(k + 1) * n..(k + 2) * n];
                row[0] = 0.5 * (lin.dz2[0] + LN_10 * (oh_molal - h_molal));
                for m in 0..k {
                    row[1 + m] = 0.5 * lin.dz2[1 + m];
                }
                row[k + 1] = 0.5 * (lin.dz2[k + 1] + lambda * (h_molal + oh_molal)) * slope - 1.0;
                b[k + 1] = -ionic_gap;
            }
            if !super::binding::solve_linear(a, b, n) {
                return None;
            }
            // At most one pH unit, a factor e⁸ in any free metal and half the ionic strength
            // (or 10⁻³ mol/kg) per step.
            let mut scale = (b[0].abs() / 1.0)
                .max(b[1..=k].iter().fold(0.0f64, |x, s| x.max(s.abs())) / METAL_STEP)
                .max(1.0);
            if follow {
                scale = scale.max(b[k + 1].abs() / (0.5 * self.ionic).max(1e-3));
            }
            ph += b[0] / scale;
            if !(super::PH_MIN..=super::PH_MAX).contains(&ph) || !ph.is_finite() {
                return None;
            }
            for (m, metal) in self.binding.metals.iter().enumerate() {
                self.u[m] = (self.u[m] + b[m + 1] / scale).min(metal.total.ln());
            }
            if follow {
                let next = self.ionic + b[k + 1] / scale;
                if !next.is_finite() {
                    return None;
                }
                self.set_ionic_strength(next.max(0.0));
            }
        }
        None
    }

    /// The coefficients held.
    pub fn gammas(&self) -> &[f64] {
        &self.gamma
    }

    /// Whether this balance uses the Pitzer model.
    pub fn is_pitzer(&self) -> bool {
        self.pitzer.is_some()
    }

    /// The coefficients the activity model gives at the species of a pH (layout order).
    pub fn model_gammas(&mut self, ph: f64) -> Vec<f64> {
        let m = self.molalities(ph);
        layout::coefficients(
            self.constants,
            &self.layout,
            self.pitzer.as_ref(),
            self.model,
            &m,
        )
    }

    /// Starts the metal balances from these ln free molalities.
    pub fn set_free_metals(&mut self, u: &[f64]) {
        if u.len() == self.u.len() {
            self.u.copy_from_slice(u);
        }
    }

    /// The layout, binding and Pitzer model of this balance.
    pub fn parts(&self) -> (&Layout, &Binding, Option<&Model>) {
        (&self.layout, &self.binding, self.pitzer.as_ref())
    }

    /// Free-form distribution of every slot at 1/a(H⁺) into `q` (flat, by `q_start`), with
    /// each slot's ⟨j⟩ and Var(j).
    fn distributions(&mut self, inv_h: f64) {
        let d = &mut self.dist;
        let slots = self.composition.systems.len();
        // The forms of slot s are q[form_start[s] − form_start[0] ..], one more than its steps.
        let forms = self.layout.form_start[slots] - self.layout.form_start[0];
        if d.q.len() != forms || d.mean.len() != slots {
            d.q.resize(forms, 0.0);
            d.q_start.resize(slots, 0);
            d.mean.resize(slots, 0.0);
            d.variance.resize(slots, 0.0);
            d.charge_moments.resize(slots, [0.0; 3]);
        }
        let mut offset = 0;
        let mut start = 0;
        for (slot, &(system, _)) in self.composition.systems.iter().enumerate() {
            let ka_c = &self.ka_c[offset..offset + self.constants.ka(system).len()];
            let q = &mut d.q[start..=start + ka_c.len()];
            d.q_start[slot] = start;
            q[0] = 1.0;
            let mut t = 1.0;
            let mut sum = 1.0;
            for (x, k) in q[1..].iter_mut().zip(ka_c) {
                t *= k * inv_h;
                *x = t;
                sum += t;
            }
            offset += ka_c.len();
            start += ka_c.len() + 1;
            let inv = 1.0 / sum;
            let z0 = f64::from(self.constants.z0(system));
            let (mut m1, mut m2, mut z2, mut jz2, mut z4) = (0.0, 0.0, 0.0, 0.0, 0.0);
            for (j, x) in q.iter_mut().enumerate() {
                *x *= inv;
                let jf = j as f64;
                let zz = (z0 - jf) * (z0 - jf);
                m1 += jf * *x;
                m2 += jf * jf * *x;
                z2 += zz * *x;
                jz2 += jf * zz * *x;
                z4 += zz * zz * *x;
            }
            d.mean[slot] = m1;
            d.variance[slot] = (m2 - m1 * m1).max(0.0);
            d.charge_moments[slot] = [z2, jz2 - m1 * z2, (z4 - z2 * z2).max(0.0)];
        }
    }

    /// The bound state at a pH, solving the metal balances from the warm start.
    fn bound(&mut self, inv_h: f64, oh: f64) {
        self.distributions(inv_h);
        let inputs = self
            .dist
            .inputs(&self.k_cond, &self.totals, self.lambda, oh, inv_h.log10());
        self.binding
            .solve(&inputs, &mut self.u, &mut self.state, METAL_STEPS);
    }

    /// The residual, its derivative and the ionic strength at a pH.
    pub fn evaluate(&mut self, ph: f64) -> Evaluation {
        let (inv_h, h_molal, oh_molal, sums) = self.water_terms(ph);
        if !self.binding.is_empty() {
            return self.evaluate_bound(ph, inv_h, h_molal, oh_molal, sums);
        }
        self.evaluate_free(inv_h, h_molal, oh_molal, sums)
    }

    /// At a pH: 1/a(H⁺), m(H⁺), m(OH⁻), and the charge, |charge| and z² sums of the spectators
    /// with H⁺ and OH⁻ — where every evaluation starts.
    fn water_terms(&self, ph: f64) -> (f64, f64, f64, [f64; 3]) {
        let h = (-ph * LN_10).exp();
        let inv_h = 1.0 / h;
        let h_molal = h / self.gamma[H];
        let oh_molal = self.constants.kw * inv_h / self.gamma[OH];
        let c = self.composition;
        let sums = [
            c.spectator_charge + h_molal - oh_molal,
            c.spectator_abs_charge + h_molal + oh_molal,
            c.spectator_z2 + h_molal + oh_molal,
        ];
        (inv_h, h_molal, oh_molal, sums)
    }

    /// The pH of the charge balance with every complex left out, at the coefficients held: a
    /// cheap first estimate where complexes take part (each evaluation skips the metals).
    pub fn ph_without_complexes(&mut self, start: f64) -> f64 {
        let outcome = super::newton::solve_bracketed(
            |ph| {
                let (inv_h, h_molal, oh_molal, sums) = self.water_terms(ph);
                self.evaluate_free(inv_h, h_molal, oh_molal, sums)
            },
            start,
            super::PH_MIN,
            super::PH_MAX,
        );
        outcome.x
    }

    /// The evaluation of the free forms alone (no complex taking part).
    fn evaluate_free(
        &self,
        inv_h: f64,
        h_molal: f64,
        oh_molal: f64,
        [mut residual, mut scale, mut z2_sum]: [f64; 3],
    ) -> Evaluation {
        let c = self.composition;
        let mut var_sum = 0.0;
        let mut protons_removed = 0.0;
        let mut offset = 0;
        for &(system, total) in &c.systems {
            let n = self.constants.ka(system).len();
            let z0 = self.constants.z0(system);
            let m = species::moments(&self.ka_c[offset..offset + n], inv_h, z0);
            offset += n;
            let mean_z = f64::from(z0) - m.mean;
            residual += total * mean_z;
            scale += total * m.mean_abs_z;
            var_sum += total * m.variance;
            z2_sum += total * m.mean_z2;
            protons_removed += total * m.mean;
        }
        Evaluation {
            residual,
            derivative: -LN_10 * (h_molal + oh_molal + var_sum),
            scale,
            ionic_strength: 0.5 * z2_sum,
            h_molal,
            oh_molal,
            protons_removed,
            metal_residual: 0.0,
        }
    }

    /// [`Self::evaluate`] when complexes take part.
    fn evaluate_bound(
        &mut self,
        _ph: f64,
        inv_h: f64,
        h_molal: f64,
        oh_molal: f64,
        sums: [f64; 3],
    ) -> Evaluation {
        self.bound(inv_h, oh_molal);
        self.bound_evaluation(h_molal, oh_molal, sums)
    }

    /// dR/dpH with the metals bound, from the partials and correction the state holds.
    fn bound_derivative(&self, h_molal: f64, oh_molal: f64) -> f64 {
        -LN_10 * (h_molal + oh_molal) + self.state.partial_p + self.state.derivative_correction
    }

    /// The evaluation from the bound state as it stands (free metals as they are).
    fn bound_evaluation(
        &self,
        h_molal: f64,
        oh_molal: f64,
        [mut residual, mut scale, mut z2_sum]: [f64; 3],
    ) -> Evaluation {
        let state = &self.state;
        let c = self.composition;
        let mut protons_removed = 0.0;
        for (slot, &(system, total)) in c.systems.iter().enumerate() {
            let z0 = self.constants.z0(system);
            residual += total * f64::from(z0) - state.protons_removed[slot];
            protons_removed += state.protons_removed[slot];
            let s = state.free_total[slot];
            let start = self.dist.q_start[slot];
            let n = self.constants.ka(system).len();
            for (j, qj) in self.dist.q[start..=start + n].iter().enumerate() {
                let z = f64::from(z0 - j as i32);
                scale += s * qj * z.abs();
                z2_sum += s * qj * z * z;
            }
        }
        for (n, m) in self.binding.metals.iter().enumerate() {
            let z = f64::from(self.layout.charges[self.layout.ion(m.slot)]);
            let bound = m.total - state.free[n];
            scale -= z.abs() * bound;
            z2_sum -= z * z * bound;
        }
        for (k, b) in self.binding.complexes.iter().enumerate() {
            let z = f64::from(self.constants.complexes[b.constant].charge);
            let amount = state.complex[k];
            scale += z.abs() * amount;
            z2_sum += z * z * amount;
            if b.ligand == Ligand::Hydroxide {
                residual -= b.count * amount;
                protons_removed += b.count * amount;
            }
        }
        Evaluation {
            residual,
            derivative: self.bound_derivative(h_molal, oh_molal),
            scale,
            ionic_strength: 0.5 * z2_sum,
            h_molal,
            oh_molal,
            protons_removed,
            metal_residual: state.metal_residual,
        }
    }

    /// Molality of every layout position at a pH (free metals, free forms, complexes).
    pub fn molalities(&mut self, ph: f64) -> Vec<f64> {
        let h = (-ph * LN_10).exp();
        let inv_h = 1.0 / h;
        let mut m = vec![0.0; self.layout.len()];
        m[H] = h / self.gamma[H];
        m[OH] = self.constants.kw * inv_h / self.gamma[OH];
        for (slot, &(_, molal)) in self.composition.ions.iter().enumerate() {
            m[self.layout.ion(slot)] = molal;
        }
        if self.binding.is_empty() {
            self.distributions(inv_h);
        } else {
            self.bound(inv_h, m[OH]);
        }
        let bound = !self.binding.is_empty();
        for (n, metal) in self.binding.metals.iter().enumerate() {
            m[self.layout.ion(metal.slot)] = self.state.free[n];
        }
        for (slot, &(system, total)) in self.composition.systems.iter().enumerate() {
            let start = self.layout.form_start[slot];
            let q0 = self.dist.q_start[slot];
            let free = if bound {
                self.state.free_total[slot]
            } else {
                total
            };
            for j in 0..=self.constants.ka(system).len() {
                m[start + j] = free * self.dist.q[q0 + j];
            }
        }
        if bound {
            for (k, amount) in self.state.complex.iter().enumerate() {
                m[self.layout.complex_start + k] = *amount;
            }
        }
        m[self.layout.unattributed] = self.layout.unattributed_charge.abs();
        m
    }

    /// Builds the reported solution at a converged pH.
    pub fn finish(
        &mut self,
        ph: f64,
        evaluated: Option<Evaluation>,
        iterations: u32,
        outer: u32,
        status: SolveStatus,
    ) -> Solution {
        let e = match evaluated {
            Some(e) => e,
            None => self.evaluate(ph),
        };
        // Proton balance: [H⁺] − [OH⁻] − Σ C⟨j⟩ − bound OH⁻ equals the protons in excess of the reference.
        let proton_lhs = e.h_molal - e.oh_molal - e.protons_removed;
        // Its scale includes every charged species: the spectators' rounding bounds both balances.
        let proton_scale = (e.h_molal
            + e.oh_molal
            + e.protons_removed.abs()
            + self.composition.proton_excess.abs())
        .max(e.scale);
        Solution {
            ph,
            p_h_conc: -e.h_molal.log10(),
            ionic_strength: e.ionic_strength,
            buffer_capacity: -e.derivative,
            h_molal: e.h_molal,
            oh_molal: e.oh_molal,
            charge_residual: e.residual.abs() / e.scale.max(f64::MIN_POSITIVE),
            proton_residual: (proton_lhs - self.composition.proton_excess).abs()
                / proton_scale.max(f64::MIN_POSITIVE),
            metal_residual: e.metal_residual,
            iterations,
            outer_iterations: outer,
            status,
            activity: self.model,
            gamma: self.gamma.clone(),
            free_metals: self.u.clone(),
        }
    }
}
