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
    fn ammonium_follows_bates_and_pinching() {
        // Bates & Pinching, J. Res. Natl. Bur. Stand. 42 (1949) 419 (from memory):
        // pKa(NH4+) = 2835.76/T − 0.6322 + 0.001225·T, i.e. 10.084 at 0 °C and 8.539 at 50 °C.
        // Fed pKa 9.245 and ΔH° 52.2 kJ/mol at 25 °C (Goldberg, Kishore & Lennen, J. Phys. Chem.
        // Ref. Data 31 (2002) 231, from memory), van 't Hoff must land within 0.005.
        for (temp_c, published) in [(0.0, 10.084), (50.0, 8.539)] {
            let got = pka_at(9.245, 52.2, 0.0, temp_c + 273.15);
            assert!((got - published).abs() < 0.005, "{temp_c} °C: {got}");
        }
    }

    #[test]
    fn acetic_acid_needs_its_heat_capacity_term() {
        // Harned & Ehlers, J. Am. Chem. Soc. 55 (1933) 652 (from memory): Ka = 1.657e-5 at 0 °C
        // and 1.633e-5 at 50 °C, pKa 4.781 and 4.787, a minimum near 25 °C that ΔH° alone
        // (−0.41 kJ/mol) cannot give; with ΔCp° = −142 J/(mol·K) (Goldberg 2002, from memory) it
        // must land within 0.005, and without it miss by more than 0.02.
        for (temp_c, published) in [(0.0, 4.781), (50.0, 4.787)] {
            let t = temp_c + 273.15;
            let got = pka_at(4.756, -0.41, -142.0, t);
            assert!((got - published).abs() < 0.005, "{temp_c} °C: {got}");
            assert!((pka_at(4.756, -0.41, 0.0, t) - published).abs() > 0.02);
        }
        // At the reference temperature the constant is the one given (definition of T_REF_K).
        assert!((pka_at(4.756, -0.41, -142.0, T_REF_K) - 4.756).abs() < 1e-12);
    }
}
