//! A metal's distribution against pH: free, bound to each ligand, settled.

use saltwise_chem::distribution::{FREE, SETTLED, bound_metals, metal_distribution};
use saltwise_chem::report::evaluate;
use saltwise_chem::{ActivityModel, Conditions, Constants, Library, Recipe};

fn share(d: &saltwise_chem::distribution::MetalDistribution, ph: f64, part: &str) -> f64 {
    let i = d.parts.iter().position(|p| p == part).expect("part");
    d.points
        .iter()
        .find(|(x, _)| (x - ph).abs() < 1e-9)
        .expect("pH")
        .1[i]
}

#[test]
fn calcium_moves_from_free_to_edta_as_the_ph_rises_and_the_shares_sum_to_one() {
    let lib = Library::built_in().unwrap();
    // 1 mmol/kg Ca²⁺ with 2 mmol/kg EDTA (as the 39 % tetrasodium solution, 380.2 g/mol).
    let recipe = Recipe::in_grams(&[
        ("water", 1000.0),
        ("calcium_chloride_dihydrate", 0.147),
        ("tetrasodium_edta_39", 1.95),
    ]);
    let c = Conditions {
        activity: ActivityModel::Davies,
        ..Conditions::default()
    };
    let report = evaluate(&lib, &recipe, c).unwrap();
    let constants = Constants::new(&lib, c);
    assert!(bound_metals(&lib, &report.composition).contains(&"calcium".to_owned()));
    let phs: Vec<f64> = (2..=12).map(f64::from).collect();
    let d = metal_distribution(
        &lib,
        &constants,
        &report.composition,
        &report.solution,
        "calcium",
        phs.iter().copied(),
        false,
    )
    .unwrap();
    assert_eq!(d.parts[0], FREE);
    assert!(d.parts.iter().any(|p| p == "edta"));
    for (ph, shares) in &d.points {
        let sum: f64 = shares.iter().sum();
        assert!((sum - 1.0).abs() < 1e-9, "pH {ph}: {sum}");
    }
    // log K(CaY²⁻) 10.65 at I = 0.1 (Martell & Smith, from memory) against αY⁴⁻ of 10⁻¹²
    // at pH 2 and 0.35 at pH 10 (Harris, Quantitative Chemical Analysis, table of αY⁴⁻,
    // from memory): free at pH 2, bound at pH 10.
    assert!(share(&d, 2.0, FREE) > 0.95);
    assert!(share(&d, 10.0, "edta") > 0.99);
}

#[test]
fn with_settling_calcium_carbonate_leaves_solution_only_where_carbonate_is_there() {
    let lib = Library::built_in().unwrap();
    let recipe = Recipe::in_grams(&[
        ("water", 1000.0),
        ("calcium_chloride_dihydrate", 1.47), // 10 mmol
        ("sodium_carbonate", 2.12),           // 20 mmol
    ]);
    let c = Conditions {
        activity: ActivityModel::Davies,
        ..Conditions::default()
    };
    let report = evaluate(&lib, &recipe, c).unwrap();
    let constants = Constants::new(&lib, c);
    let d = metal_distribution(
        &lib,
        &constants,
        &report.composition,
        &report.solution,
        "calcium",
        [5.0, 8.0, 11.0],
        true,
    )
    .unwrap();
    assert_eq!(d.parts.last().map(String::as_str), Some(SETTLED));
    // At pH 5 carbonate is CO₂ (pKa₁ 6.35, pKa₂ 10.33, Harned & Davis 1943; Harned & Scholes
    // 1941, from memory): nothing settles. At pH 11 nearly all the calcium is calcite.
    assert!(share(&d, 5.0, SETTLED) < 1e-12);
    assert!(share(&d, 11.0, SETTLED) > 0.99);
    assert!(share(&d, 8.0, SETTLED) < share(&d, 11.0, SETTLED));
    for (ph, shares) in &d.points {
        let sum: f64 = shares.iter().sum();
        assert!((sum - 1.0).abs() < 1e-9, "pH {ph}: {sum}");
    }
}

#[test]
fn a_sweep_holds_the_same_amounts_as_the_speciation_at_each_ph() {
    let lib = Library::built_in().unwrap();
    // An invented hard-water base: Ca and Mg with EDTA and citrate.
    let recipe = Recipe::in_grams(&[
        ("water", 990.0),
        ("calcium_chloride_dihydrate", 0.6),
        ("magnesium_sulfate_heptahydrate", 0.5),
        ("tetrasodium_edta_39", 4.0),
        ("trisodium_citrate_dihydrate", 5.0),
    ]);
    let c = Conditions {
        activity: ActivityModel::Davies,
        ..Conditions::default()
    };
    let report = evaluate(&lib, &recipe, c).unwrap();
    let constants = Constants::new(&lib, c);
    let phs: Vec<f64> = (0..=28).map(|i| f64::from(i) * 0.5).collect();
    let d = metal_distribution(
        &lib,
        &constants,
        &report.composition,
        &report.solution,
        "magnesium",
        phs.iter().copied(),
        false,
    )
    .unwrap();
    let ion = lib.ion_index("magnesium").unwrap();
    let total = report
        .composition
        .ions
        .iter()
        .find(|&&(i, _)| i == ion)
        .unwrap()
        .1;
    // The sweep closes the balances from one pH to the next; each point must be the state a
    // speciation at that pH alone finds (both closed to 1e-14, so within 1e-10 of the total).
    for (k, &ph) in phs.iter().enumerate() {
        let at = saltwise_chem::solver::Solution {
            ph,
            ..report.solution.clone()
        };
        let sp = saltwise_chem::solver::speciation(&lib, &constants, &report.composition, &at);
        assert!(
            (d.points[k].1[0] - sp.free("magnesium") / total).abs() < 1e-10,
            "pH {ph}"
        );
        let bound: f64 = sp
            .complexes
            .iter()
            .filter(|x| x.metal == "magnesium")
            .map(|x| x.molality)
            .sum();
        let swept: f64 = d.points[k].1[1..].iter().sum();
        assert!((swept - bound / total).abs() < 1e-10, "pH {ph}");
    }
}
