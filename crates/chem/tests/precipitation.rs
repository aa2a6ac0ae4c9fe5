//! Precipitation: supersaturated solids leave the solution until saturated, with every balance
//! kept.

use saltwise_chem::library::Species;
use saltwise_chem::precipitation::{SI_TOL, precipitate};
use saltwise_chem::report::evaluate;
use saltwise_chem::{ActivityModel, Conditions, Constants, Library, Recipe};

fn conditions(activity: ActivityModel) -> Conditions {
    Conditions {
        activity,
        ..Conditions::default()
    }
}

#[test]
fn slaked_lime_in_excess_leaves_a_saturated_solution_at_the_standard_ph() {
    let lib = Library::built_in().unwrap();
    // 5 g Ca(OH)₂ in 1 kg water: about three times what dissolves.
    let recipe = Recipe::in_grams(&[("water", 1000.0), ("calcium_hydroxide", 5.0)]);
    let c = conditions(ActivityModel::Davies);
    let report = evaluate(&lib, &recipe, c).unwrap();
    assert!(report.speciation.saturation_index("portlandite").unwrap() > 0.5);
    let constants = Constants::new(&lib, c);
    let p = precipitate(&lib, &constants, &report.composition, &report.solution);
    assert!(p.converged);
    assert_eq!(p.formed.len(), 1);
    assert_eq!(p.formed[0].solid, "portlandite");
    let si = p
        .saturation
        .iter()
        .find(|s| s.solid == "portlandite")
        .unwrap();
    assert!(si.saturation_index.abs() < 10.0 * SI_TOL);
    // Saturated Ca(OH)₂ at 25 °C is an IUPAC secondary pH standard at pH 12.454 (Buck et al.,
    // Pure Appl. Chem. 74 (2002) 2169, from memory); its solubility is about 0.020 mol/kg
    // (1.5 g/kg; CRC Handbook, from memory). Davies and the constants of this library land
    // within 0.05 pH (12.47) and 15 % (0.0205 mol/kg).
    assert!(
        (p.solution.ph - 12.454).abs() < 0.05,
        "pH {}",
        p.solution.ph
    );
    let calcium = lib.ion_index("calcium").unwrap();
    let dissolved = p
        .composition
        .ions
        .iter()
        .find(|(i, _)| *i == calcium)
        .unwrap()
        .1;
    assert!((dissolved - 0.020).abs() / 0.020 < 0.15, "{dissolved}");
    // Calcium is conserved: what is left plus what formed is what went in.
    let before = report
        .composition
        .ions
        .iter()
        .find(|(i, _)| *i == calcium)
        .unwrap()
        .1;
    let formed = p.formed[0].mol_per_kg_water;
    assert!((dissolved + formed - before).abs() < 1e-12 * before);
    // 74.09 g/mol from the IUPAC atomic weights (Ca 40.078, O 15.999, H 1.008).
    let g = p.formed[0].g_per_kg_water().unwrap();
    assert!((g - formed * 74.09).abs() < 0.01 * g);
    assert!(p.solution.charge_residual < 1e-10);
    assert!(p.solution.metal_residual < 1e-10);
}

#[test]
fn calcite_forms_from_hard_water_and_soda_ash_and_takes_carbonate_with_it() {
    let lib = Library::built_in().unwrap();
    let recipe = Recipe::in_grams(&[
        ("water", 1000.0),
        ("calcium_chloride_dihydrate", 1.47), // 10 mmol
        ("sodium_carbonate", 2.12),           // 20 mmol
    ]);
    for activity in [ActivityModel::Davies, ActivityModel::Pitzer] {
        let c = conditions(activity);
        let report = evaluate(&lib, &recipe, c).unwrap();
        let constants = Constants::new(&lib, c);
        let p = precipitate(&lib, &constants, &report.composition, &report.solution);
        assert!(p.converged, "{activity:?}");
        assert!(
            p.formed.iter().any(|f| f.solid == "calcite"),
            "{:?}",
            p.formed
        );
        // Nothing is left above saturation, and what formed is at it.
        for s in &p.saturation {
            assert!(s.saturation_index <= 10.0 * SI_TOL, "{s:?}");
        }
        for f in &p.formed {
            let si = p
                .saturation
                .iter()
                .find(|s| s.solid == f.solid)
                .unwrap()
                .saturation_index;
            assert!(si.abs() < 10.0 * SI_TOL, "{} {si}", f.solid);
        }
        // Carbonate and calcium leave one for one (calcite and aragonite are both CaCO₃).
        let carbonic = lib.system_index("carbonic").unwrap();
        let calcium = lib.ion_index("calcium").unwrap();
        let total = |comp: &saltwise_chem::solver::Composition| {
            (
                comp.systems
                    .iter()
                    .find(|(s, _)| *s == carbonic)
                    .map_or(0.0, |e| e.1),
                comp.ions
                    .iter()
                    .find(|(i, _)| *i == calcium)
                    .map_or(0.0, |e| e.1),
            )
        };
        let (c0, ca0) = total(&report.composition);
        let (c1, ca1) = total(&p.composition);
        assert!(((c0 - c1) - (ca0 - ca1)).abs() < 1e-12, "{activity:?}");
        // Most of the 10 mmol calcium goes: calcite's Ksp (10^−8.48) leaves micromolar Ca²⁺
        // beside 10 mmol/kg of carbonate left over (stoichiometry).
        assert!(ca1 < 1e-3, "{ca1}");
        // Taking CO₃²⁻ away lowers the pH.
        assert!(p.solution.ph < report.solution.ph);
        assert!(p.solution.charge_residual < 1e-10);
        assert!(p.solution.proton_residual < 1e-10);
    }
}

#[test]
fn an_undersaturated_recipe_forms_nothing() {
    let lib = Library::built_in().unwrap();
    let recipe = Recipe::in_grams(&[("water", 1000.0), ("calcium_chloride_dihydrate", 0.1)]);
    let c = conditions(ActivityModel::Davies);
    let report = evaluate(&lib, &recipe, c).unwrap();
    let constants = Constants::new(&lib, c);
    let p = precipitate(&lib, &constants, &report.composition, &report.solution);
    assert!(p.converged);
    assert!(p.formed.is_empty());
    assert!((p.solution.ph - report.solution.ph).abs() < 1e-9);
}

#[test]
fn every_built_in_solid_has_a_formula_whose_molar_mass_is_read() {
    let lib = Library::built_in().unwrap();
    for s in lib.solids() {
        let f = saltwise_chem::formula::Formula::parse(&s.data.formula)
            .unwrap_or_else(|e| panic!("{}: {e}", s.data.id));
        assert!(f.molar_mass_g_per_mol() > 0.0);
        // Every solid has a metal (an ion or a form of a metal's system) besides any OH⁻.
        assert!(
            s.components.iter().any(|(sp, _)| match sp {
                Species::Ion(i) => *i != lib.hydroxide(),
                Species::Form { .. } => true,
            }),
            "{}",
            s.data.id
        );
    }
    // Calcite 100.09 g/mol (IUPAC atomic weights: Ca 40.078, C 12.011, O 15.999).
    let calcite = lib
        .solids()
        .iter()
        .find(|s| s.data.id == "calcite")
        .unwrap();
    let m = saltwise_chem::formula::Formula::parse(&calcite.data.formula)
        .unwrap()
        .molar_mass_g_per_mol();
    assert!((m - 100.086).abs() < 0.01, "{m}");
}
