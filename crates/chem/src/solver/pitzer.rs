//! The Pitzer equations for activity and osmotic coefficients of a mixed electrolyte.
//!
//! The form is that of Harvie, Møller & Weare, Geochim. Cosmochim. Acta 48 (1984) 723, after
//! Pitzer, Activity Coefficients in Electrolyte Solutions (2nd ed., CRC 1991), ch. 3: a
//! Debye–Hückel term with b = 1.2, binary β⁽⁰⁾, β⁽¹⁾, β⁽²⁾ and C^φ for every cation–anion pair,
//! θ and ψ for mixing. The unsymmetrical mixing terms ᴱθ are left out (they matter only for
//! mixtures of ions of different charge at high ionic strength, by a few per cent in γ), and
//! neutral species take γ = 1 (no λ parameters). Ions with no pair parameter use the
//! charge-based estimate [`fallback_ln_gamma`].

/// Debye–Hückel b of the Pitzer equations, kg^½/mol^½.
const B: f64 = 1.2;
/// α₁ of pairs where either ion has charge 1, kg^½/mol^½.
const ALPHA1: f64 = 2.0;
/// α₁ and α₂ of 2:2 pairs.
const ALPHA1_22: f64 = 1.4;
const ALPHA2_22: f64 = 12.0;

/// One cation–anion pair's parameters, by position in the species list.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Pair {
    /// Position of the cation.
    pub cation: usize,
    /// Position of the anion.
    pub anion: usize,
    /// β⁽⁰⁾.
    pub beta0: f64,
    /// β⁽¹⁾.
    pub beta1: f64,
    /// β⁽²⁾.
    pub beta2: f64,
    /// C^φ.
    pub c_phi: f64,
}

/// The parameters among one list of species, ready to evaluate.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Model {
    /// Charge of every species in the list.
    pub charges: Vec<i32>,
    /// Cation–anion pairs with parameters.
    pub pairs: Vec<Pair>,
    /// θ of two like-signed species.
    pub theta: Vec<(usize, usize, f64)>,
    /// ψ of two like-signed species and one of the other sign.
    pub psi: Vec<(usize, usize, usize, f64)>,
    /// Whether each species has at least one pair parameter; the others use the fallback.
    pub has_pair: Vec<bool>,
    /// NaCl's β⁽⁰⁾, β⁽¹⁾ and C^φ, the reference of the fallback.
    pub reference: [f64; 3],
}

/// The result of one evaluation.
#[derive(Debug, Clone, PartialEq)]
pub struct Coefficients {
    /// ln γ of every species (0 for neutral ones).
    pub ln_gamma: Vec<f64>,
    /// Osmotic coefficient φ of the solution.
    pub osmotic: f64,
    /// Ionic strength, mol/kg.
    pub ionic_strength: f64,
}

/// g(x) = 2[1 − (1 + x)e^−x]/x².
fn g(x: f64) -> f64 {
    if x < 1e-4 {
        1.0 - 2.0 * x / 3.0
    } else {
        2.0 * (1.0 - (1.0 + x) * (-x).exp()) / (x * x)
    }
}

/// g'(x) = −2[1 − (1 + x + x²/2)e^−x]/x².
fn g_prime(x: f64) -> f64 {
    if x < 1e-4 {
        -x / 3.0
    } else {
        -2.0 * (1.0 - (1.0 + x + 0.5 * x * x) * (-x).exp()) / (x * x)
    }
}

/// The Debye–Hückel term f^γ of ln γ (per z²) at an ionic strength.
fn f_gamma(a_phi: f64, ionic: f64) -> f64 {
    let s = ionic.max(0.0).sqrt();
    -a_phi * (s / (1.0 + B * s) + (2.0 / B) * (1.0 + B * s).ln())
}

/// α₁, α₂ of a pair by its charges.
fn alphas(z_cation: i32, z_anion: i32) -> (f64, f64) {
    if z_cation.abs() == 2 && z_anion.abs() == 2 {
        (ALPHA1_22, ALPHA2_22)
    } else {
        (ALPHA1, 0.0)
    }
}

/// ln γ± of NaCl alone at molality `m`, from its binary parameters.
pub fn ln_gamma_1_1(a_phi: f64, m: f64, [beta0, beta1, c_phi]: [f64; 3]) -> f64 {
    let x = ALPHA1 * m.max(0.0).sqrt();
    let b = beta0 + beta1 * g(x);
    let b_prime = if m > 0.0 { beta1 * g_prime(x) / m } else { 0.0 };
    f_gamma(a_phi, m) + m * m * b_prime + 2.0 * m * b + 1.5 * m * m * c_phi
}

/// The charge-based estimate for an ion without parameters: ln γ = z² · ln γ±(NaCl at I).
///
/// It keeps the Debye–Hückel limit, stays bounded at high ionic strength, and treats the ion as
/// its charge's multiple of a 1:1 ion in sodium chloride at the same ionic strength (the
/// z²-scaling of the Debye–Hückel and Davies equations).
pub fn fallback_ln_gamma(a_phi: f64, z: i32, ionic: f64, reference: [f64; 3]) -> f64 {
    f64::from(z * z) * ln_gamma_1_1(a_phi, ionic, reference)
}

impl Model {
    /// ln γ of every species and the osmotic coefficient, at the given molalities.
    pub fn evaluate(&self, a_phi: f64, molality: &[f64]) -> Coefficients {
        let n = self.charges.len();
        let mut ionic = 0.0;
        let mut z_sum = 0.0;
        let mut m_sum = 0.0;
        for (&z, &m) in self.charges.iter().zip(molality) {
            let z = f64::from(z);
            ionic += 0.5 * z * z * m;
            z_sum += z.abs() * m;
            m_sum += m;
        }
        let s = ionic.sqrt();
        let mut f = f_gamma(a_phi, ionic);
        let mut c_sum = 0.0;
        let mut phi_sum = -a_phi * ionic * s / (1.0 + B * s);
        let mut ln_gamma = vec![0.0; n];
        for p in &self.pairs {
            let (zc, za) = (self.charges[p.cation], self.charges[p.anion]);
            let (a1, a2) = alphas(zc, za);
            let (x1, x2) = (a1 * s, a2 * s);
            let (b2g, b2gp, b2phi) = if p.beta2 != 0.0 {
                (
                    p.beta2 * g(x2),
                    p.beta2 * g_prime(x2),
                    p.beta2 * (-x2).exp(),
                )
            } else {
                (0.0, 0.0, 0.0)
            };
            let b = p.beta0 + p.beta1 * g(x1) + b2g;
            let b_prime = if ionic > 0.0 {
                (p.beta1 * g_prime(x1) + b2gp) / ionic
            } else {
                0.0
            };
            let b_phi = p.beta0 + p.beta1 * (-x1).exp() + b2phi;
            let c = p.c_phi / (2.0 * f64::from((zc * za).abs()).sqrt());
            let (mc, ma) = (molality[p.cation], molality[p.anion]);
            f += mc * ma * b_prime;
            c_sum += mc * ma * c;
            ln_gamma[p.cation] += ma * (2.0 * b + z_sum * c);
            ln_gamma[p.anion] += mc * (2.0 * b + z_sum * c);
            phi_sum += mc * ma * (b_phi + z_sum * c);
        }
        for &(i, j, theta) in &self.theta {
            ln_gamma[i] += 2.0 * molality[j] * theta;
            ln_gamma[j] += 2.0 * molality[i] * theta;
            phi_sum += molality[i] * molality[j] * theta;
        }
        for &(i, j, k, psi) in &self.psi {
            let (mi, mj, mk) = (molality[i], molality[j], molality[k]);
            ln_gamma[i] += mj * mk * psi;
            ln_gamma[j] += mi * mk * psi;
            ln_gamma[k] += mi * mj * psi;
            phi_sum += mi * mj * mk * psi;
        }
        for (i, lg) in ln_gamma.iter_mut().enumerate() {
            let z = self.charges[i];
            if z == 0 {
                *lg = 0.0;
            } else if self.has_pair[i] {
                *lg += f64::from(z * z) * f + f64::from(z.abs()) * c_sum;
            } else {
                *lg = fallback_ln_gamma(a_phi, z, ionic, self.reference);
            }
        }
        let osmotic = if m_sum > 0.0 {
            1.0 + 2.0 * phi_sum / m_sum
        } else {
            1.0
        };
        Coefficients {
            ln_gamma,
            osmotic,
            ionic_strength: ionic,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_single_pair_matches_the_closed_form_for_a_1_1_salt() {
        // NaCl of Pitzer & Mayorga, J. Phys. Chem. 77 (1973) 268 (from memory); A^φ 0.391.
        let p = [0.0765, 0.2664, 0.00127];
        let model = Model {
            charges: vec![1, -1],
            pairs: vec![Pair {
                cation: 0,
                anion: 1,
                beta0: p[0],
                beta1: p[1],
                beta2: 0.0,
                c_phi: p[2],
            }],
            has_pair: vec![true, true],
            reference: p,
            ..Model::default()
        };
        for m in [0.01, 0.5, 3.0, 6.0] {
            let c = model.evaluate(0.391, &[m, m]);
            let mean = 0.5 * (c.ln_gamma[0] + c.ln_gamma[1]);
            assert!((mean - ln_gamma_1_1(0.391, m, p)).abs() < 1e-12, "{m}");
        }
    }

    #[test]
    fn g_is_continuous_at_the_series_switch() {
        assert!((g(1e-4) - g(1.0001e-4)).abs() < 1e-7);
        assert!((g_prime(1e-4) - g_prime(1.0001e-4)).abs() < 1e-7);
    }
}
