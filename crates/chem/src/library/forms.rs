//! Display names of the forms of a system, from the library or generated from their charges.

use super::System;

/// Names of the forms of a system: the library's, or its display name with each form's charge.
pub fn form_names(system: &System) -> Vec<String> {
    if system.forms.len() == system.pka.len() + 1 {
        return system.forms.clone();
    }
    (0..=system.pka.len())
        .map(|j| {
            let z = i64::from(system.charge_of_fully_protonated) - j as i64;
            format!("{} form {j} ({})", system.name, charge_label(z))
        })
        .collect()
}

/// A charge for display, as written after an ion: `0`, `⁺`, `²⁻` (ASCII via [`crate::text::ascii`]).
pub fn charge_label(z: i64) -> String {
    crate::text::charge_superscript(z)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn unnamed_forms_are_labelled_by_charge() {
        // Phosphoric acid: H3PO4 is neutral and loses three protons (its charges 0, −1, −2, −3 are
        // those of H3PO4, H2PO4⁻, HPO4²⁻, PO4³⁻ by definition of the formulas).
        let s = System {
            id: "phosphoric".into(),
            name: "phosphoric acid".into(),
            charge_of_fully_protonated: 0,
            forms: Vec::new(),
            pka: vec![2.148, 7.198, 12.35],
            dh_kj_mol: vec![0.0; 3],
            dcp_j_mol_k: Vec::new(),
            pka_ionic_strength: 0.0,
            pka_ionic_strengths: Vec::new(),
            source: "test".into(),
        };
        assert_eq!(
            form_names(&s),
            [
                "phosphoric acid form 0 (0)",
                "phosphoric acid form 1 (⁻)",
                "phosphoric acid form 2 (²⁻)",
                "phosphoric acid form 3 (³⁻)"
            ]
        );
        assert_eq!(charge_label(1), "⁺");
    }
}
