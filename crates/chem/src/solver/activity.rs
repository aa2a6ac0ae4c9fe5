//! Activity coefficients by charge: the Davies equation with A(T), or ideal; the model choice.

use serde::{Deserialize, Serialize};

use super::water;

/// How activity coefficients are computed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default, Serialize, Deserialize)]
pub enum ActivityModel {
    /// Davies (1962): log γ = −A z² (√I/(1+√I) − 0.3 I).
    Davies,
    /// All activity coefficients 1.
    Ideal,
    /// The Pitzer equations with the library's parameters (concentrates, to 6 mol/kg).
    Pitzer,
    /// Davies where it holds for the ionic strength and charges present, Pitzer beyond.
    #[default]
    Auto,
}

impl ActivityModel {
    /// The model a single solve uses: `Auto` starts as Davies.
    pub fn fixed(self) -> Self {
        match self {
            Self::Auto => Self::Davies,
            m => m,
        }
    }

    /// Highest ionic strength (mol/kg) at which Davies holds for the largest charge present:
    /// 0.5 for ions of charge 1 and 2, 0.1 once ions of charge 3 or more carry a tenth of the
    /// ionic strength (common practice, no source).
    pub fn davies_limit(max_charge: i32) -> f64 {
        if max_charge >= 3 { 0.1 } else { 0.5 }
    }

    /// Highest ionic strength (mol/kg) at which the model is usually trusted (common practice, no source).
    pub fn max_ionic_strength(self) -> f64 {
        match self {
            Self::Davies => 0.5,
            Self::Ideal => 0.01,
            // Pitzer & Mayorga's and Harvie, Møller & Weare's fits reach 6 mol/kg (from memory).
            Self::Pitzer | Self::Auto => 6.0,
        }
    }

    /// Name for people: `Davies` or `ideal`.
    pub fn label(self) -> &'static str {
        match self {
            Self::Davies => "Davies",
            Self::Ideal => "ideal",
            Self::Pitzer => "Pitzer",
            Self::Auto => "automatic",
        }
    }

    /// Lower-case name as used on the command line.
    pub fn name(self) -> &'static str {
        match self {
            Self::Davies => "davies",
            Self::Ideal => "ideal",
            Self::Pitzer => "pitzer",
            Self::Auto => "auto",
        }
    }
}

/// Debye–Hückel A (log10, molal) at a temperature, from the density and dielectric constant of water.
pub fn debye_huckel_a(temp_c: f64) -> f64 {
    // A = 1.82483e6 ρ^½ (ε T)^−3/2 with ρ in g/cm³ (e.g. Robinson & Stokes, Electrolyte Solutions).
    let t_k = temp_c + super::KELVIN_OFFSET;
    let rho = water::density_kg_m3(temp_c) * 1e-3;
    let eps_t = water::dielectric_constant(temp_c) * t_k;
    1.824_83e6 * rho.sqrt() / (eps_t * eps_t.sqrt())
}

/// The ionic-strength function of the Davies equation, √I/(1+√I) − 0.3 I.
pub fn davies_function(ionic_strength: f64) -> f64 {
    let s = ionic_strength.max(0.0).sqrt();
    s / (1.0 + s) - 0.3 * ionic_strength.max(0.0)
}

/// dφ/dI of the Davies function φ, taken at I ≥ 10⁻¹² mol/kg (it grows without bound at 0).
pub fn davies_slope(ionic_strength: f64) -> f64 {
    let s = ionic_strength.max(1e-12).sqrt();
    0.5 / (s * (1.0 + s) * (1.0 + s)) - 0.3
}

/// log10 γ for charge z, given A and the Davies function value.
pub fn log_gamma(model: ActivityModel, a: f64, z: i32, davies_f: f64) -> f64 {
    match model {
        ActivityModel::Davies => -a * f64::from(z * z) * davies_f,
        ActivityModel::Ideal => 0.0,
        // By charge, the Pitzer model starts from Davies; its own coefficients are per species.
        ActivityModel::Pitzer | ActivityModel::Auto => -a * f64::from(z * z) * davies_f,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_at_25_c_is_in_the_published_range() {
        // A = 0.5085–0.5115 at 25 °C across dielectric data (Davies A with the dielectric data in use, from memory).
        let a = debye_huckel_a(25.0);
        assert!((0.5085..=0.5115).contains(&a), "{a}");
        // Rises with temperature: 0.4902 (0 °C) to 0.5324 (50 °C), same source, ±0.002.
        assert!((debye_huckel_a(0.0) - 0.4902).abs() < 0.002);
        assert!((debye_huckel_a(50.0) - 0.5324).abs() < 0.002);
    }
}
