//! Calcium and magnesium with chelants: conditional constants, the pH fall on complexation,
//! saturation indices and chelant capacity.

use saltwise_chem::curve::Doser;
use saltwise_chem::solver::{self, speciation};
use saltwise_chem::{ActivityModel, Conditions, Constants, Library, Recipe, evaluate};

fn lib() -> Library {
    Library::built_in().expect("built-in library")
}

fn davies() -> Conditions {
    Conditions {
        temp_c: 25.0,
        activity: ActivityModel::Davies,
    }
}

fn recipe(lines: &[(&str, f64)]) -> Recipe {
    Recipe::in_grams(lines)
}

/// log10 αY⁴⁻ of EDTA at 25 °C, I = 0.1 (Harris, Quantitative Chemical Analysis, EDTA chapter
/// table of αY⁴⁻, from Martell & Smith's constants; from memory).
const LOG_ALPHA_Y: &[(f64, f64)] = &[
    (5.0, -6.46),  // 3.5e-7
    (6.0, -4.66),  // 2.2e-5
    (7.0, -3.32),  // 4.8e-4
    (8.0, -2.27),  // 5.4e-3
    (9.0, -1.28),  // 5.2e-2
    (10.0, -0.46), // 0.35
    (11.0, -0.07), // 0.85
];

fn log_alpha_y(ph: f64) -> f64 {
    let i = LOG_ALPHA_Y
        .windows(2)
        .position(|w| ph >= w[0].0 && ph <= w[1].0)
        .expect("pH inside the table");
    let (a, b) = (LOG_ALPHA_Y[i], LOG_ALPHA_Y[i + 1]);
    a.1 + (b.1 - a.1) * (ph - a.0) / (b.0 - a.0)
}

#[test]
fn calcium_edta_conditional_constant_follows_the_published_alpha() {
    // K'f = Kf·αY⁴⁻ with log Kf(CaY²⁻) = 10.65 at I = 0.1 (Martell & Smith as printed in Harris,
    // from memory): [CaY²⁻] / ([Ca²⁺]·Σ free EDTA) from the solved speciation, in 0.1 mol/kg NaCl
    // with 1 mmol/kg each of Ca and EDTA, brought to pH 6, 7, 8 and 9 with sodium hydroxide.
    let lib = lib();
    let constants = Constants::new(&lib, davies());
    let r = recipe(&[
        ("water", 1000.0),
        ("sodium_chloride", 5.844),
        ("calcium_chloride_dihydrate", 0.1470),
        ("disodium_edta_dihydrate", 0.3722),
    ]);
    let batch = r.batch(&lib).expect("batch");
    let doser = Doser::new(&lib, &constants, &batch, "sodium_hydroxide").expect("adjuster");
    for target in [6.0, 7.0, 8.0, 9.0] {
        let dose = doser.to_target(target).expect("reachable");
        let c = doser.composition(dose.amount_g);
        let s = doser.solve(dose.amount_g, None);
        assert!(s.converged());
        let sp = speciation(&lib, &constants, &c, &s);
        let cay = sp
            .complexes
            .iter()
            .find(|x| x.id == "calcium_edta")
            .expect("CaY²⁻")
            .molality;
        let free_edta: f64 = sp
            .ions
            .iter()
            .filter(|i| i.id.starts_with("edta/"))
            .map(|i| i.molality)
            .sum();
        let log_k = (cay / (sp.free("calcium") * free_edta)).log10();
        // The constants are concentration constants: αY⁴⁻ goes with p[H], −log m(H⁺).
        let expected = 10.65 + log_alpha_y(s.p_h_conc);
        assert!(
            (log_k - expected).abs() < 0.15,
            "pH {:.2}: log K' {log_k:.3} against {expected:.3}",
            s.ph
        );
    }
}

#[test]
fn calcium_chloride_lowers_the_ph_of_disodium_edta() {
    // Ca²⁺ + H₂Y²⁻ ⇌ CaY²⁻ + 2 H⁺ releases two protons per calcium bound. By hand (ideal,
    // concentrations, constants of Martell & Smith at I = 0.1 as printed in Harris, from memory):
    // K = 10^(10.65 − 6.13 − 10.37) = 10^−5.85; with 0.01 mol/kg of each and [H⁺] = 2x,
    // 4x³ = 10^−5.85 (0.01 − x)² gives x ≈ 3.2e-4 and pH ≈ 3.2. CaHY⁻ and H₃Y⁻ buffer it
    // upward a little, and the disodium salt alone sits near (pKa4 + pKa5)/2 = 4.41 in
    // concentrations at I = 0.1, some 0.3 higher at its own ionic strength (0.03 mol/kg) as a
    // meter reads it (amphiprotic-salt rule; common practice, no source).
    let lib = lib();
    let alone = evaluate(
        &lib,
        &recipe(&[("water", 1000.0), ("disodium_edta_dihydrate", 3.722)]),
        davies(),
    )
    .expect("solves");
    let with_calcium = evaluate(
        &lib,
        &recipe(&[
            ("water", 1000.0),
            ("disodium_edta_dihydrate", 3.722),
            ("calcium_chloride_dihydrate", 1.470),
        ]),
        davies(),
    )
    .expect("solves");
    assert!(
        (4.3..5.0).contains(&alone.solution.ph),
        "{}",
        alone.solution.ph
    );
    let fall = alone.solution.ph - with_calcium.solution.ph;
    assert!(
        with_calcium.solution.ph > 3.1 && with_calcium.solution.ph < 3.8 && fall > 0.6,
        "{} → {}",
        alone.solution.ph,
        with_calcium.solution.ph
    );
}

#[test]
fn calcite_saturation_matches_a_hand_computation() {
    // 1 mmol/kg CaCl₂ and 1 mmol/kg Na₂CO₃, ideal, without complexes: SI = log(m(Ca²⁺)·m(CO₃²⁻))
    // − log Ksp with m(CO₃²⁻) from the solved pH and pKa 6.351 / 10.329 (Goldberg 2002, from
    // memory) and log Ksp(calcite) = −8.48 (Plummer & Busenberg 1982, from memory).
    let mut data = Library::built_in_data().expect("data");
    data.complexes.clear();
    let lib = Library::from_data(data).expect("library");
    let r = evaluate(
        &lib,
        &recipe(&[
            ("water", 1000.0),
            ("calcium_chloride_dihydrate", 0.14701),
            ("sodium_carbonate", 0.10599),
        ]),
        Conditions {
            temp_c: 25.0,
            activity: ActivityModel::Ideal,
        },
    )
    .expect("solves");
    let h = 10f64.powf(-r.solution.ph);
    let (k1, k2) = (10f64.powf(-6.351), 10f64.powf(-10.329));
    let total = r.composition.systems[0].1;
    let co3 = total * k1 * k2 / (h * h + h * k1 + k1 * k2);
    let ca = 1e-3 * 1000.0 / (r.batch.totals.water_kg * 1000.0);
    let by_hand = (ca * co3).log10() + 8.48;
    let si = r.speciation.saturation_index("calcite").expect("calcite");
    assert!((si - by_hand).abs() < 0.01, "{si} against {by_hand}");
    assert!(si > 0.0, "1 mmol/kg each is supersaturated in calcite");
}

#[test]
fn complexes_lower_calcite_saturation_and_edta_removes_it() {
    // The CaCO₃⁰ and CaHCO₃⁺ pairs and activity coefficients lower the SI from the bare value;
    // a 2 mmol/kg excess of EDTA over calcium takes it far below 0 (CaY²⁻ log K 10.65 against
    // calcite's 8.48: Martell & Smith; Plummer & Busenberg 1982; from memory).
    let lib = lib();
    let base = [
        ("water", 1000.0),
        ("calcium_chloride_dihydrate", 0.14701),
        ("sodium_carbonate", 0.10599),
    ];
    let plain = evaluate(&lib, &recipe(&base), davies()).expect("solves");
    let si = plain
        .speciation
        .saturation_index("calcite")
        .expect("calcite");
    let mut with_edta = base.to_vec();
    with_edta.push(("tetrasodium_edta_39", 0.003 * 380.17 / 0.39));
    let chelated = evaluate(&lib, &recipe(&with_edta), davies()).expect("solves");
    let si_chelated = chelated
        .speciation
        .saturation_index("calcite")
        .expect("calcite");
    assert!(si_chelated < si - 2.0, "{si} → {si_chelated}");
    assert!(chelated.speciation.free("calcium") < 1e-6);
    // Every solve closes its metal balances.
    assert!(chelated.solution.metal_residual < 1e-10);
    let _ = solver::PH_MAX;
}

#[test]
fn hard_water_brings_its_calcium_and_magnesium() {
    // 300 ppm as CaCO₃ = 300 mg/kg ÷ 100.086 g/mol = 2.997 mmol/kg of Ca + Mg (definition of the
    // unit; CaCO₃ molar mass from the IUPAC 2021 atomic weights, from memory), 70 % of it calcium.
    let lib = lib();
    let mut r = recipe(&[("water", 1000.0)]);
    r.water_hardness = Some(saltwise_chem::recipe::Hardness::ppm(300.0));
    let report = evaluate(&lib, &r, davies()).expect("solves");
    let total = |id: &str| {
        let i = lib.ion_index(id).expect("ion");
        report
            .composition
            .ions
            .iter()
            .find(|(k, _)| *k == i)
            .map_or(0.0, |(_, m)| *m)
    };
    assert!((total("calcium") - 0.7 * 2.997e-3).abs() < 1e-6);
    assert!((total("magnesium") - 0.3 * 2.997e-3).abs() < 1e-6);
    // As hydrogen carbonate, natural hard water sits near pH 8 (common practice, no source).
    assert!(
        (7.6..8.6).contains(&report.solution.ph),
        "{}",
        report.solution.ph
    );
    // Refused outside its range, naming the field.
    r.water_hardness = Some(saltwise_chem::recipe::Hardness::ppm(-5.0));
    let err = evaluate(&lib, &r, davies()).expect_err("refused");
    assert!(err.to_string().contains("water hardness"), "{err}");
}

#[test]
fn tetrasodium_edta_holds_its_stoichiometric_hardness_when_alkaline() {
    // Na₄EDTA (380.17 g/mol) binds calcium 1:1, so 1 % in a product holds
    // 10 g/kg ÷ 380.17 × 100.086 = 2.633 g CaCO₃ per kg = 2633 ppm (stoichiometry; molar masses
    // from the IUPAC 2021 atomic weights, from memory) once the pH is well above pKa6 = 10.37.
    let lib = lib();
    let constants = Constants::new(&lib, davies());
    let r = recipe(&[
        ("water", 1000.0 - 10.0 / 0.39),
        ("tetrasodium_edta_39", 10.0 / 0.39),
    ]);
    let report = saltwise_chem::report::evaluate_with(&lib, &constants, &r).expect("solves");
    assert!(report.solution.ph > 10.5, "{}", report.solution.ph);
    let cap = saltwise_chem::chelant::capacity(
        &lib,
        &constants,
        &report.batch,
        &report.composition,
        &report.solution,
        &report.systems,
    )
    .expect("capacity");
    let edta = cap
        .chelants
        .iter()
        .find(|c| c.system == "edta")
        .expect("edta");
    assert!(
        (edta.capacity_ppm - 2633.0).abs() / 2633.0 < 0.03,
        "{}",
        edta.capacity_ppm
    );
    // Nothing is bound yet in purified water (only Na⁺ pairs).
    assert!(edta.bound_fraction < 0.9);
}
