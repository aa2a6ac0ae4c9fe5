//! Acidity constants against temperature: van 't Hoff with ΔH° and a constant ΔCp°.

/// Gas constant, J/(mol·K) (CODATA 2018).
pub const GAS_CONSTANT: f64 = 8.314_462_618;

/// Reference temperature of the library's constants, K.
pub const T_REF_K: f64 = 298.15;

/// pKa at `temp_k` from pKa at 298.15 K, ΔH° (kJ/mol) and ΔCp° (J/(mol·K)).
pub fn pka_at(pka_25: f64, dh_kj_mol: f64, dcp_j_mol_k: f64, temp_k: f64) -> f64 {
    // ln K(T) = ln K(T0) − ΔH°/R (1/T − 1/T0) + ΔCp°/R (ln(T/T0) + T0/T − 1)
    let t0 = T_REF_K;
    let dh = dh_kj_mol * 1e3;
    let ln_k = -pka_25 * std::f64::consts::LN_10 - dh / GAS_CONSTANT * (1.0 / temp_k - 1.0 / t0)
        + dcp_j_mol_k / GAS_CONSTANT * ((temp_k / t0).ln() + t0 / temp_k - 1.0);
    -ln_k / std::f64::consts::LN_10
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn endothermic_steps_weaken_on_cooling() {
        // Ammonium, ΔH° = 52.2 kJ/mol (Goldberg 2002): pKa rises about 0.3 per 10 K near 25 °C.
        let p15 = pka_at(9.245, 52.2, 0.0, 288.15);
        assert!((p15 - 9.245 - 0.3184).abs() < 0.01, "{p15}");
        assert!((pka_at(4.0, 10.0, 50.0, T_REF_K) - 4.0).abs() < 1e-12);
    }
}
