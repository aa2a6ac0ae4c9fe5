//! Where every species of one composition sits in the activity vectors, and their coefficients.
//!
//! Order: H⁺, OH⁻, the composition's ions, every form of every system present, every complex
//! taking part, and last one pseudo-ion for charge not attributed to a listed ion (compositions
//! built by hand, or strong acid added as a bare charge).

use super::binding::Binding;
use super::pitzer::{Model, Pair};
use super::species::Gammas;
use super::{ActivityModel, Composition, Constants};
use crate::library::Species;

/// Position of H⁺.
pub const H: usize = 0;
/// Position of OH⁻.
pub const OH: usize = 1;
/// Position of the first ion.
const IONS: usize = 2;

/// The species of one composition in a fixed order.
#[derive(Debug, Clone)]
pub struct Layout {
    /// Library index of each of the composition's ions.
    pub ions: Vec<usize>,
    /// Start of each system's forms in the vectors (one more entry than systems).
    pub form_start: Vec<usize>,
    /// Start of the complexes.
    pub complex_start: usize,
    /// Position of the unattributed-charge pseudo-ion.
    pub unattributed: usize,
    /// Charge of every position.
    pub charges: Vec<i32>,
    /// Signed charge (mol/kg) not carried by the listed ions.
    pub unattributed_charge: f64,
}

impl Layout {
    /// The layout of a composition with the complexes that take part.
    pub fn new(constants: &Constants, composition: &Composition, binding: &Binding) -> Self {
        let mut charges = vec![1, -1];
        let ions: Vec<usize> = composition.ions.iter().map(|&(i, _)| i).collect();
        let mut attributed = 0.0;
        for &(i, m) in &composition.ions {
            let z = constants.ion_charges[i];
            charges.push(z);
            attributed += f64::from(z) * m;
        }
        let mut form_start = Vec::with_capacity(composition.systems.len() + 1);
        for &(s, _) in &composition.systems {
            form_start.push(charges.len());
            let z0 = constants.z0(s);
            for j in 0..=constants.ka(s).len() {
                charges.push(z0 - j as i32);
            }
        }
        form_start.push(charges.len());
        let complex_start = charges.len();
        for b in &binding.complexes {
            charges.push(constants.complexes[b.constant].charge);
        }
        let unattributed_charge = composition.spectator_charge - attributed;
        let unattributed = charges.len();
        charges.push(if unattributed_charge < 0.0 { -1 } else { 1 });
        Self {
            ions,
            form_start,
            complex_start,
            unattributed,
            charges,
            unattributed_charge,
        }
    }

    /// Number of positions.
    pub fn len(&self) -> usize {
        self.charges.len()
    }

    /// Position of a library species in this composition, if present.
    pub fn position(
        &self,
        constants: &Constants,
        composition: &Composition,
        species: Species,
    ) -> Option<usize> {
        match species {
            Species::Ion(i) if i == constants.hydron => Some(H),
            Species::Ion(i) if i == constants.hydroxide => Some(OH),
            Species::Ion(i) => self.ions.iter().position(|&k| k == i).map(|p| IONS + p),
            Species::Form { system, form } => {
                let slot = composition.systems.iter().position(|&(s, _)| s == system)?;
                let p = self.form_start[slot] + form;
                (p < self.form_start[slot + 1]).then_some(p)
            }
        }
    }

    /// Position of the composition's ion in slot `slot`.
    pub fn ion(&self, slot: usize) -> usize {
        IONS + slot
    }

    /// Activity coefficients of every position from the charge alone (Davies or ideal).
    pub fn by_charge(
        &self,
        constants: &Constants,
        ionic_strength: f64,
        model: ActivityModel,
    ) -> Vec<f64> {
        let g = Gammas::with_model(constants, ionic_strength, model);
        self.charges.iter().map(|&z| g.of(z)).collect()
    }

    /// The Pitzer model among these positions.
    pub fn pitzer_model(&self, constants: &Constants, composition: &Composition) -> Model {
        let pos = |s: Species| self.position(constants, composition, s);
        let mut model = Model {
            charges: self.charges.clone(),
            has_pair: vec![false; self.len()],
            reference: constants.pitzer_reference,
            ..Model::default()
        };
        for (c, a, p) in &constants.pitzer.pairs {
            if let (Some(c), Some(a)) = (pos(*c), pos(*a)) {
                model.has_pair[c] = true;
                model.has_pair[a] = true;
                model.pairs.push(Pair {
                    cation: c,
                    anion: a,
                    beta0: p[0],
                    beta1: p[1],
                    beta2: p[2],
                    c_phi: p[3],
                });
            }
        }
        for &(a, b, theta) in &constants.pitzer.mixing {
            if let (Some(a), Some(b)) = (pos(a), pos(b)) {
                model.theta.push((a, b, theta));
            }
        }
        for &(a, b, c, psi) in &constants.pitzer.triples {
            if let (Some(a), Some(b), Some(c)) = (pos(a), pos(b), pos(c)) {
                model.psi.push((a, b, c, psi));
            }
        }
        model
    }
}

/// Activity coefficients of every position, at given molalities: Pitzer when its model is
/// given, otherwise by charge under `by_charge`.
pub fn coefficients(
    constants: &Constants,
    layout: &Layout,
    model: Option<&Model>,
    by_charge: ActivityModel,
    molality: &[f64],
) -> Vec<f64> {
    let ionic: f64 = 0.5
        * layout
            .charges
            .iter()
            .zip(molality)
            .map(|(&z, &m)| f64::from(z * z) * m)
            .sum::<f64>();
    match model {
        Some(model) => {
            let a_phi = a_phi(constants);
            model
                .evaluate(a_phi, molality)
                .ln_gamma
                .iter()
                .map(|lg| lg.exp())
                .collect()
        }
        None => layout.by_charge(constants, ionic, by_charge),
    }
}

/// Debye–Hückel A^φ (natural log, osmotic) from the constants' A (log10): A^φ = A·ln 10 / 3.
pub fn a_phi(constants: &Constants) -> f64 {
    constants.davies_a * std::f64::consts::LN_10 / 3.0
}

/// Whether a position's activity came from the Pitzer fallback.
pub fn is_fallback(model: &Model, position: usize) -> bool {
    model.charges[position] != 0 && !model.has_pair[position]
}
