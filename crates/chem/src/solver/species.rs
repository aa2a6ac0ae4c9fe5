//! Species of a system at a given activity of H⁺: fractions, mean protons lost, and their spread.

use super::{Constants, MAX_CHARGE};

/// Activity coefficients for every charge from −12 to +12 at one ionic strength.
#[derive(Debug, Clone)]
pub struct Gammas {
    gamma: [f64; (2 * MAX_CHARGE + 1) as usize],
}

impl Gammas {
    /// Coefficients at an ionic strength, with the constants' activity model.
    pub fn new(constants: &Constants, ionic_strength: f64) -> Self {
        Self::with_model(constants, ionic_strength, constants.conditions.activity)
    }

    /// Coefficients at an ionic strength under a given model.
    pub fn with_model(
        constants: &Constants,
        ionic_strength: f64,
        model: super::ActivityModel,
    ) -> Self {
        let f = super::activity::davies_function(ionic_strength);
        // log γ is proportional to z², so γ(z) = γ(1)^(z²).
        let g1 = 10f64.powf(super::activity::log_gamma(model, constants.davies_a, 1, f));
        let mut gamma = [1.0; (2 * MAX_CHARGE + 1) as usize];
        // γ(z) = γ(1)^(z²), with z² = (z − 1)² + (2z − 1): two products per charge.
        let (mut power, mut odd, g2) = (1.0, g1, g1 * g1);
        for z in 1..=MAX_CHARGE {
            power *= odd;
            odd *= g2;
            gamma[(MAX_CHARGE + z) as usize] = power;
            gamma[(MAX_CHARGE - z) as usize] = power;
        }
        Self { gamma }
    }

    /// γ of charge z (clamped to the supported range).
    pub fn of(&self, z: i32) -> f64 {
        self.gamma[(z.clamp(-MAX_CHARGE, MAX_CHARGE) + MAX_CHARGE) as usize]
    }
}

/// Every form of one system at a solved state.
#[derive(Debug, Clone, PartialEq)]
pub struct SystemState {
    /// Library index of the system.
    pub system: usize,
    /// Total molality of the system.
    pub total: f64,
    /// Fraction of each free form, fully protonated first (they sum to 1 less the bound fraction).
    pub fractions: Vec<f64>,
    /// Fraction bound in complexes with metal ions.
    pub bound: f64,
    /// Charge of each form.
    pub charges: Vec<i32>,
}

impl SystemState {
    /// Molality of form j.
    pub fn molality(&self, form: usize) -> f64 {
        self.total * self.fractions.get(form).copied().unwrap_or(0.0)
    }

    /// Index of the form with the largest fraction.
    pub fn dominant_form(&self) -> usize {
        self.fractions
            .iter()
            .enumerate()
            .fold(
                (0, f64::MIN),
                |best, (j, &a)| if a > best.1 { (j, a) } else { best },
            )
            .0
    }
}

/// Moments of one system's distribution: ⟨j⟩, Var(j), ⟨z²⟩, ⟨|z|⟩ (j = protons removed).
#[derive(Debug, Clone, Copy, Default)]
pub struct Moments {
    /// Mean protons removed.
    pub mean: f64,
    /// Variance of protons removed.
    pub variance: f64,
    /// Mean squared charge.
    pub mean_z2: f64,
    /// Mean charge magnitude.
    pub mean_abs_z: f64,
}

/// Moments from conditional constants `ka_c` (ratios [S_k+1]/[S_k] times a(H⁺)) and 1/a(H⁺).
#[inline]
pub fn moments(ka_c: &[f64], inv_h: f64, z0: i32) -> Moments {
    let mut t = 1.0;
    let mut sum = 1.0;
    let mut m1 = 0.0;
    let mut m2 = 0.0;
    let mut abs_z = f64::from(z0.abs());
    for (k, &ka) in ka_c.iter().enumerate() {
        t *= ka * inv_h;
        let j = (k + 1) as f64;
        sum += t;
        m1 += j * t;
        m2 += j * j * t;
        abs_z += f64::from((z0 - k as i32 - 1).abs()) * t;
    }
    let inv = 1.0 / sum;
    let mean = m1 * inv;
    // Var(j) = ⟨j²⟩ − ⟨j⟩², clamped at 0 against rounding when one form dominates.
    let variance = (m2 * inv - mean * mean).max(0.0);
    let z0 = f64::from(z0);
    Moments {
        mean,
        variance,
        mean_z2: z0 * z0 - 2.0 * z0 * mean + m2 * inv,
        mean_abs_z: abs_z * inv,
    }
}

/// Conditional constants of a system: Ka·γ(acid form)/γ(base form) for each step.
pub fn conditional_ka(constants: &Constants, system: usize, gammas: &Gammas, out: &mut Vec<f64>) {
    let z0 = constants.z0(system);
    for (k, &ka) in constants.ka(system).iter().enumerate() {
        let z_acid = z0 - k as i32;
        out.push(ka * gammas.of(z_acid) / gammas.of(z_acid - 1));
    }
}

/// The full state of one system at a pH and ionic strength.
pub fn state(
    constants: &Constants,
    system: usize,
    total: f64,
    ph: f64,
    gammas: &Gammas,
) -> SystemState {
    let mut ka_c = Vec::new();
    conditional_ka(constants, system, gammas, &mut ka_c);
    let h = 10f64.powf(-ph);
    let z0 = constants.z0(system);
    let mut t = vec![1.0f64; ka_c.len() + 1];
    for k in 0..ka_c.len() {
        t[k + 1] = t[k] * ka_c[k] / h;
    }
    let sum: f64 = t.iter().sum();
    SystemState {
        system,
        total,
        fractions: t.iter().map(|x| x / sum).collect(),
        bound: 0.0,
        charges: (0..t.len()).map(|j| z0 - j as i32).collect(),
    }
}
