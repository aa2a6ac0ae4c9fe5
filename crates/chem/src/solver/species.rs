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
        let f = super::activity::davies_function(ionic_strength);
        // log γ is proportional to z², so γ(z) = γ(1)^(z²).
        let g1 = 10f64.powf(super::activity::log_gamma(
            constants.conditions.activity,
            constants.davies_a,
            1,
            f,
        ));
        let mut gamma = [1.0; (2 * MAX_CHARGE + 1) as usize];
        for (i, g) in gamma.iter_mut().enumerate() {
            let z = i as i32 - MAX_CHARGE;
            *g = g1.powi(z * z);
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
    /// Fraction of each form, fully protonated first.
    pub fractions: Vec<f64>,
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

/// Moments of one system's distribution: ⟨j⟩, Var(j), ⟨z²⟩ (j = protons removed).
#[derive(Debug, Clone, Copy, Default)]
pub struct Moments {
    /// Mean protons removed.
    pub mean: f64,
    /// Variance of protons removed.
    pub variance: f64,
    /// Mean squared charge.
    pub mean_z2: f64,
}

/// Moments from conditional constants K'_k = [S_k][H]·…: `ka_c[k] / h_conc_activity` ratios.
///
/// `ka_c[k]` is the concentration ratio [S_k+1]/[S_k] times a(H⁺); `h` is a(H⁺).
#[inline]
pub fn moments(ka_c: &[f64], h: f64, z0: i32) -> Moments {
    let mut t = [0.0f64; 16];
    let n = ka_c.len().min(15);
    t[0] = 1.0;
    let mut sum = 1.0;
    let mut m1 = 0.0;
    for k in 0..n {
        t[k + 1] = t[k] * ka_c[k] / h;
        sum += t[k + 1];
        m1 += (k + 1) as f64 * t[k + 1];
    }
    let mean = m1 / sum;
    let mut var = 0.0;
    let mut mz2 = 0.0;
    for (j, &tj) in t.iter().enumerate().take(n + 1) {
        let d = j as f64 - mean;
        var += d * d * tj;
        let z = f64::from(z0) - j as f64;
        mz2 += z * z * tj;
    }
    Moments {
        mean,
        variance: var / sum,
        mean_z2: mz2 / sum,
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
        charges: (0..t.len()).map(|j| z0 - j as i32).collect(),
    }
}
