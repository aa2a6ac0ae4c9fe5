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

/// Activity coefficients and conditional constants at one ionic strength.
pub struct Conditional {
    gammas: Gammas,
    ka_c: Vec<f64>,
}

/// The charge balance of one composition.
pub struct ChargeBalance<'a> {
    constants: &'a Constants,
    composition: &'a Composition,
}

impl<'a> ChargeBalance<'a> {
    /// The balance of a composition under some constants.
    pub fn new(constants: &'a Constants, composition: &'a Composition) -> Self {
        Self {
            constants,
            composition,
        }
    }

    /// Activity coefficients and conditional constants at an ionic strength.
    pub fn gammas(&self, ionic_strength: f64) -> Conditional {
        let gammas = Gammas::new(self.constants, ionic_strength);
        let mut ka_c = Vec::with_capacity(self.composition.systems.len() * 3);
        for &(system, _) in &self.composition.systems {
            species::conditional_ka(self.constants, system, &gammas, &mut ka_c);
        }
        Conditional { gammas, ka_c }
    }

    /// The residual, its derivative and the ionic strength at a pH.
    pub fn evaluate(&self, ph: f64, cond: &Conditional) -> Evaluation {
        let h = 10f64.powf(-ph);
        let g1 = cond.gammas.of(1);
        let h_molal = h / g1;
        let oh_molal = self.constants.kw / h / g1;
        let mut residual = self.composition.spectator_charge + h_molal - oh_molal;
        let mut scale = self.composition.spectator_abs_charge + h_molal + oh_molal;
        let mut var_sum = 0.0;
        let mut z2_sum = self.composition.spectator_z2 + h_molal + oh_molal;
        let mut protons_removed = 0.0;
        let mut offset = 0;
        for &(system, total) in &self.composition.systems {
            let n = self.constants.ka(system).len();
            let z0 = self.constants.z0(system);
            let m = species::moments(&cond.ka_c[offset..offset + n], h, z0);
            offset += n;
            let mean_z = f64::from(z0) - m.mean;
            residual += total * mean_z;
            scale += total * mean_z.abs().max(m.mean_z2.sqrt());
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
        &self,
        ph: f64,
        ionic: f64,
        iterations: u32,
        outer: u32,
        status: SolveStatus,
    ) -> Solution {
        let cond = self.gammas(ionic);
        let e = self.evaluate(ph, &cond);
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
