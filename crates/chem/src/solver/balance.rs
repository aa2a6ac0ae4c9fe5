//! The charge balance in one unknown (pH) with its analytic derivative, at fixed activity coefficients.

use std::f64::consts::LN_10;

use super::species::{self, Gammas};
use super::{Composition, Constants, Solution, SolveStatus};

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
    /// Σ C·⟨j⟩: protons removed from the systems, mol/kg.
    pub protons_removed: f64,
}

/// The charge balance of one composition, with activity coefficients and conditional
/// constants held for one ionic strength at a time.
pub struct ChargeBalance<'a> {
    constants: &'a Constants,
    composition: &'a Composition,
    gamma1: f64,
    /// The ionic strength the coefficients are for (NaN before the first set).
    ionic: f64,
    /// Conditional Ka of every step of every system present, in composition order.
    ka_c: Vec<f64>,
}

impl<'a> ChargeBalance<'a> {
    /// The balance of a composition under some constants, at I = 0 until set.
    pub fn new(constants: &'a Constants, composition: &'a Composition) -> Self {
        let steps = composition
            .systems
            .iter()
            .map(|&(s, _)| constants.ka(s).len())
            .sum();
        let mut b = Self {
            constants,
            composition,
            gamma1: 1.0,
            ionic: f64::NAN,
            ka_c: Vec::with_capacity(steps),
        };
        b.set_ionic_strength(0.0);
        b
    }

    /// Recomputes activity coefficients and conditional constants at an ionic strength.
    pub fn set_ionic_strength(&mut self, ionic_strength: f64) {
        if ionic_strength.to_bits() == self.ionic.to_bits() {
            return;
        }
        self.ionic = ionic_strength;
        let gammas = Gammas::new(self.constants, ionic_strength);
        self.gamma1 = gammas.of(1);
        self.ka_c.clear();
        for &(system, _) in &self.composition.systems {
            species::conditional_ka(self.constants, system, &gammas, &mut self.ka_c);
        }
    }

    /// The residual, its derivative and the ionic strength at a pH.
    pub fn evaluate(&self, ph: f64) -> Evaluation {
        let h = (-ph * LN_10).exp();
        let inv_h = 1.0 / h;
        let h_molal = h / self.gamma1;
        let oh_molal = self.constants.kw * inv_h / self.gamma1;
        let c = self.composition;
        let mut residual = c.spectator_charge + h_molal - oh_molal;
        let mut scale = c.spectator_abs_charge + h_molal + oh_molal;
        let mut var_sum = 0.0;
        let mut z2_sum = c.spectator_z2 + h_molal + oh_molal;
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
        }
    }

    /// Builds the reported solution at a converged pH and ionic strength.
    pub fn finish(
        &mut self,
        ph: f64,
        ionic: f64,
        evaluated: Option<Evaluation>,
        iterations: u32,
        outer: u32,
        status: SolveStatus,
    ) -> Solution {
        let same = ionic.to_bits() == self.ionic.to_bits();
        self.set_ionic_strength(ionic);
        let e = match evaluated {
            Some(e) if same => e,
            _ => self.evaluate(ph),
        };
        // Proton balance: [H⁺] − [OH⁻] − Σ C⟨j⟩ equals the protons released in excess of the reference.
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
            iterations,
            outer_iterations: outer,
            status,
        }
    }
}
