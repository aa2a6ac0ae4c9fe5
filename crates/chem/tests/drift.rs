//! Drift figures: strong acid and base getting into a product, the pH open to air, active forms.

use saltwise_chem::drift::{self, DRIFT_MMOL_PER_KG};
use saltwise_chem::report::evaluate_with;
use saltwise_chem::solver::SystemState;
use saltwise_chem::{ActivityModel, Conditions, Constants, Library, Recipe, RecipeLine};

fn lib() -> Library {
    Library::built_in().expect("built-in library")
}

fn constants(lib: &Library, activity: ActivityModel, temp_c: f64) -> Constants {
    Constants::new(lib, Conditions { temp_c, activity })
}

#[test]
fn henry_constant_of_co2_is_the_published_one() {
    // Sander, Atmos. Chem. Phys. 15 (2015) 4399, compilation: K_H(CO2) ≈ 3.3e-4 mol/(m³·Pa) at
    // 25 °C, i.e. 0.0334 mol/(kg·atm) (from memory); the Plummer & Busenberg (1982) fit used here
    // must agree within 3 %.
    let k = drift::henry_co2(25.0);
    assert!((k / 0.0334 - 1.0).abs() < 0.03, "K_H(25 °C) = {k}");
    // Gases are less soluble in warm water (common practice, no source).
    assert!(drift::henry_co2(5.0) > k && k > drift::henry_co2(60.0));
}

#[test]
fn pure_water_open_to_air_is_about_ph_5_6() {
    // 5.6, common textbook value for rain in equilibrium with atmospheric CO2 (from memory);
    // K_H(T) of CO2 from Plummer & Busenberg, Geochim. Cosmochim. Acta 46 (1982) 1011 (from memory).
    let lib = lib();
    for activity in [ActivityModel::Ideal, ActivityModel::Davies] {
        let k = constants(&lib, activity, 25.0);
        let report = evaluate_with(&lib, &k, &Recipe::in_grams(&[("water", 1000.0)])).unwrap();
        let d = drift::drift(
            &lib,
            &k,
            &report.batch,
            &report.composition,
            &report.solution,
        )
        .unwrap();
        assert!((d.open_to_air_ph - 5.6).abs() < 0.05, "{activity:?}: {d:?}");
    }
}

#[test]
fn air_equilibrium_leaves_dissolved_co2_at_henrys_law() {
    // Definition of the equilibrium: m(CO2) = K_H·p(CO2) for a neutral form in any activity model;
    // checked for a soda solution, which takes up CO2 from air and drops in pH (common practice, no source).
    let lib = lib();
    let k = constants(&lib, ActivityModel::Davies, 25.0);
    let report = evaluate_with(
        &lib,
        &k,
        &Recipe::in_grams(&[("water", 1000.0), ("sodium_carbonate", 1.0)]),
    )
    .unwrap();
    let air = drift::open_to_air(&lib, &k, &report.composition).unwrap();
    assert!(
        air.ph < report.solution.ph - 1.0,
        "{} → {}",
        report.solution.ph,
        air.ph
    );
    let carbonic = lib.system_index(drift::CARBONIC_ID).unwrap();
    // With ideal activities and no ion pairs, check the equilibrated pH against the carbonate
    // system in closed form.
    let mut data = Library::built_in_data().expect("built-in data");
    data.complexes.clear();
    let lib = Library::from_data(data).expect("library without complexes");
    let ideal = constants(&lib, ActivityModel::Ideal, 25.0);
    let air_ideal = drift::open_to_air(&lib, &ideal, &report.composition).unwrap();
    let ka = ideal.ka(carbonic);
    let h = 10f64.powf(-air_ideal.ph);
    // Alkalinity (from the recipe: 2 mol Na⁺ per mol Na2CO3) = m(HCO3⁻) + 2 m(CO3²⁻) + m(OH⁻) − m(H⁺);
    // with m(CO2) = K_H p it fixes the pH (closed form of the carbonate system, from memory).
    let co2 = drift::henry_co2(25.0) * drift::CO2_AIR_ATM;
    let hco3 = co2 * ka[0] / h;
    let co3 = hco3 * ka[1] / h;
    let alk = hco3 + 2.0 * co3 + ideal.kw / h - h;
    let na = report.composition.spectator_charge;
    assert!(
        (alk / na - 1.0).abs() < 1e-6,
        "alkalinity {alk} against Na+ {na}"
    );
}

#[test]
fn strong_acid_moves_unbuffered_water_a_lot() {
    // Closed form, ideal: 1e-3 mol/kg of strong acid in water gives [H+] = c/2 + sqrt(c²/4 + Kw)
    // (charge balance, from memory), about pH 3 from 7.
    let lib = lib();
    let k = constants(&lib, ActivityModel::Ideal, 25.0);
    let report = evaluate_with(&lib, &k, &Recipe::in_grams(&[("water", 1000.0)])).unwrap();
    let d = drift::drift(
        &lib,
        &k,
        &report.batch,
        &report.composition,
        &report.solution,
    )
    .unwrap();
    let c = 1e-3;
    let h = c / 2.0 + (c * c / 4.0 + k.kw).sqrt();
    let expected = -h.log10() - report.solution.ph;
    assert!((d.acid_1mmol_per_kg - expected).abs() < 1e-3, "{d:?}");
    assert!(
        d.acid_1mmol_per_kg < -3.5 && d.base_1mmol_per_kg > 3.5,
        "{d:?}"
    );
}

#[test]
fn strong_acid_into_an_acetate_buffer_moves_ph_by_dose_over_capacity() {
    // 0.1 mol/kg acetate buffer at its pKa (equal acid and salt), ideal activities. Van Slyke's
    // buffer capacity of a monoprotic buffer, β = 2.303·(C·Ka·[H]/(Ka + [H])² + [H] + [OH])
    // (D. D. Van Slyke, J. Biol. Chem. 52 (1922) 525, from memory), and ΔpH ≈ −Δm/β for a small
    // dose; the solver's own buffer capacity must agree too (consistency check).
    let lib = lib();
    let k = constants(&lib, ActivityModel::Ideal, 25.0);
    let recipe = Recipe {
        lines: vec![
            RecipeLine::grams("water", 1000.0),
            RecipeLine::moles("acetic_acid", 0.05),
            RecipeLine::moles("sodium_acetate_trihydrate", 0.05),
        ],
        qs_to_g: None,
        water_hardness: None,
    };
    let report = evaluate_with(&lib, &k, &recipe).unwrap();
    let s = &report.solution;
    let d = drift::drift(&lib, &k, &report.batch, &report.composition, s).unwrap();
    let acetic = lib.system_index("acetic").unwrap();
    let (_, total) = report.composition.systems[0];
    assert_eq!(report.composition.systems[0].0, acetic);
    let ka = k.ka(acetic)[0];
    let h = 10f64.powf(-s.ph);
    let beta = std::f64::consts::LN_10 * (total * ka * h / (ka + h).powi(2) + h + k.kw / h);
    // 1 mmol per kg of product, over the water of the product (see drift.rs).
    let dm =
        DRIFT_MMOL_PER_KG * 1e-3 * report.batch.total_mass_g * 1e-3 / report.batch.totals.water_kg;
    let expected = -dm / beta;
    assert!(
        (d.acid_1mmol_per_kg / expected - 1.0).abs() < 0.01,
        "{d:?} against {expected}"
    );
    assert!(
        (d.base_1mmol_per_kg / -expected - 1.0).abs() < 0.01,
        "{d:?}"
    );
    assert!(
        (s.buffer_capacity / beta - 1.0).abs() < 1e-3,
        "{} vs {beta}",
        s.buffer_capacity
    );
    // At its pKa, ideal: pH = pKa 4.756 (Goldberg 2002, from memory).
    assert!((s.ph - 4.756).abs() < 0.005, "{}", s.ph);
}

#[test]
fn active_form_is_the_uncharged_one_or_else_the_fully_protonated() {
    // Benzoate preservative: undissociated fraction 1/(1 + 10^(pH − pKa)) with pKa 4.20 (CRC, from
    // memory), ideal activities.
    let lib = lib();
    let k = constants(&lib, ActivityModel::Ideal, 25.0);
    let recipe = Recipe::in_grams(&[
        ("water", 1000.0),
        ("sodium_benzoate", 4.0),
        ("lactic_acid_88", 8.0),
    ]);
    let report = evaluate_with(&lib, &k, &recipe).unwrap();
    let active = drift::active_forms(&report.systems);
    let benzoic = lib.system_index("benzoic").unwrap();
    let a = active.iter().find(|a| a.system == benzoic).unwrap();
    assert_eq!(a.form, 0);
    let expected = 1.0 / (1.0 + 10f64.powf(report.solution.ph - 4.20));
    assert!((a.fraction - expected).abs() < 1e-3, "{a:?} vs {expected}");
    // Ammonium: the uncharged form is NH3, form 1 (definition of the rule).
    let k = constants(&lib, ActivityModel::Davies, 25.0);
    let report = evaluate_with(
        &lib,
        &k,
        &Recipe::in_grams(&[("water", 1000.0), ("ammonium_chloride", 1.0)]),
    )
    .unwrap();
    let a = drift::active_forms(&report.systems);
    assert_eq!(a.len(), 1);
    assert_eq!(a[0].form, 1);
    assert!(a[0].fraction < 0.01);
    // No uncharged form: the fully protonated one (definition of the rule).
    let st = SystemState {
        system: 0,
        total: 1.0,
        fractions: vec![0.25, 0.75],
        charges: vec![-1, -2],
        bound: 0.0,
    };
    assert_eq!(drift::default_active_form(&st), 0);
}
