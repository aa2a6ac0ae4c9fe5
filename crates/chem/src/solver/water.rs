//! Properties of liquid water against temperature: density, dielectric constant, ion product.

/// Density of air-saturated liquid water at 0.1 MPa, kg/m³ (Kell 1975, J. Chem. Eng. Data 20, 97; 0–150 °C).
pub fn density_kg_m3(temp_c: f64) -> f64 {
    let t = temp_c;
    (999.839_52 + 16.945_176 * t - 7.987_040_1e-3 * t * t - 46.170_461e-6 * t.powi(3)
        + 105.563_02e-9 * t.powi(4)
        - 280.542_53e-12 * t.powi(5))
        / (1.0 + 16.879_850e-3 * t)
}

/// Relative permittivity of water (Malmberg & Maryott 1956, J. Res. NBS 56, 1; 0–100 °C).
pub fn dielectric_constant(temp_c: f64) -> f64 {
    let t = temp_c;
    87.740 - 0.400_08 * t + 9.398e-4 * t * t - 1.410e-6 * t.powi(3)
}

/// pKw (molal) from temperature (K) and density (kg/m³): IAPWS R11-07, Bandura & Lvov (2006).
pub fn pkw_iapws(temp_k: f64, density_kg_m3: f64) -> f64 {
    // Coefficients of IAPWS R11-07, equations (1)–(3).
    const N: f64 = 6.0;
    const ALPHA: [f64; 3] = [-0.864_671, 8_659.19, -22_786.2];
    const BETA: [f64; 3] = [0.642_044, -56.853_4, -0.375_754];
    const GAMMA: [f64; 4] = [6.141_500e-1, 4.825_133e4, -6.770_793e4, 1.010_210e7];
    const WATER_KG_PER_MOL: f64 = 18.015_268e-3;
    let rho = density_kg_m3 * 1e-3; // g/cm³
    let t = temp_k;
    let pkw_gas = GAMMA[0] + GAMMA[1] / t + GAMMA[2] / (t * t) + GAMMA[3] / (t * t * t);
    let q = rho * (ALPHA[0] + ALPHA[1] / t + ALPHA[2] / (t * t) * rho.powf(2.0 / 3.0)).exp();
    -2.0 * N * ((1.0 + q).log10() - q / (q + 1.0) * rho * (BETA[0] + BETA[1] / t + BETA[2] * rho))
        + pkw_gas
        + 2.0 * WATER_KG_PER_MOL.log10()
}

/// pKw of liquid water at 0.1 MPa and the given temperature in °C.
pub fn pkw(temp_c: f64) -> f64 {
    pkw_iapws(temp_c + super::KELVIN_OFFSET, density_kg_m3(temp_c))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn iapws_release_check_points() {
        // IAPWS R11-07 (2019), table of check values (from memory, reproduced with Python
        // `thermo.electrochem.Kweq_IAPWS` to 1e-6).
        for (t, rho, expected) in [
            (300.0, 1000.0, 13.906_565),
            (600.0, 70.0, 21.048_874),
            (600.0, 700.0, 11.203_153),
            (800.0, 200.0, 15.089_765),
            (800.0, 1200.0, 6.438_330),
        ] {
            let got = pkw_iapws(t, rho);
            assert!(
                (got - expected).abs() < 2e-6,
                "T={t} ρ={rho}: {got} vs {expected}"
            );
        }
    }

    #[test]
    fn pkw_at_atmospheric_pressure_matches_the_reference_table() {
        // pKw at 0.1 MPa from Python `thermo` (Kweq_IAPWS with IAPWS-95 density; 100 °C at
        // saturation, IAPWS R11-07 with IAPWS-95 density); tolerance 0.005 (common practice, no source).
        for (t, expected) in [
            (0.0, 14.946),
            (10.0, 14.534),
            (15.0, 14.344),
            (20.0, 14.165),
            (25.0, 13.995),
            (30.0, 13.833),
            (37.0, 13.621),
            (40.0, 13.534),
            (50.0, 13.264),
            (60.0, 13.020),
            (80.0, 12.598),
            (100.0, 12.252),
        ] {
            let got = pkw(t);
            assert!(
                (got - expected).abs() < 0.005,
                "{t} °C: {got} vs {expected}"
            );
        }
    }

    #[test]
    fn kell_density_near_iapws95() {
        // IAPWS-95 liquid density at 0.1 MPa via Python `chemicals.iapws.iapws95_rho`.
        for (t, rho) in [
            (0.0, 999.843),
            (25.0, 997.048),
            (60.0, 983.196),
            (95.0, 961.888),
        ] {
            assert!((density_kg_m3(t) - rho).abs() < 0.05, "{t} °C");
        }
    }
}
