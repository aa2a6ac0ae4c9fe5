//! Property tests over random recipes: every solve returns, balances close, pH rises with base.

use proptest::prelude::*;
use saltwise_chem::curve::Doser;
use saltwise_chem::{
    ActivityModel, Conditions, Constants, Recipe, RecipeLine, report::evaluate_with,
};
use saltwise_reference_tests::library;

fn recipe_strategy() -> impl Strategy<Value = (Vec<(usize, f64)>, f64)> {
    let n = library().entries().len();
    (
        prop::collection::vec((1..n, 1e-4f64..30.0), 1..12),
        100.0f64..2000.0,
    )
}

fn build(items: &[(usize, f64)], water_g: f64) -> Recipe {
    let lib = library();
    let mut lines = vec![RecipeLine::grams("water", water_g)];
    for &(i, g) in items {
        lines.push(RecipeLine::grams(&lib.entries()[i].ingredient.id, g));
    }
    Recipe {
        lines,
        qs_to_g: None,
        water_hardness: None,
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 300, ..ProptestConfig::default() })]

    #[test]
    fn charge_and_proton_balances_close((items, water_g) in recipe_strategy(), temp_c in 0.0f64..95.0, model in 0usize..4) {
        let lib = library();
        let activity = [ActivityModel::Ideal, ActivityModel::Davies, ActivityModel::Pitzer, ActivityModel::Auto][model];
        let constants = Constants::new(&lib, Conditions { temp_c, activity });
        let report = evaluate_with(&lib, &constants, &build(&items, water_g)).expect("valid recipe");
        let s = &report.solution;
        prop_assert!(s.ph.is_finite());
        if s.converged() {
            // Spec: mass and charge balance closed to 1e-10 relative.
            prop_assert!(s.charge_residual < 1e-10, "charge residual {}", s.charge_residual);
            prop_assert!(s.proton_residual < 1e-10, "proton residual {}", s.proton_residual);
            // Every metal's mass balance closed too (free plus complexed equals the total).
            prop_assert!(s.metal_residual < 1e-10, "metal residual {}", s.metal_residual);
            let sp = &report.speciation;
            for &(ion, total) in &report.composition.ions {
                let id = &lib.ions()[ion].id;
                let bound: f64 = sp.complexes.iter().filter(|c| &c.metal == id).map(|c| c.molality).sum();
                let closed = (sp.free(id) + bound - total).abs() / total;
                prop_assert!(closed < 1e-10, "{id}: free {} + bound {bound} against {total}", sp.free(id));
            }
            for &(system, total) in &report.composition.systems {
                let prefix = format!("{}/", lib.systems()[system].id);
                let free: f64 = sp.ions.iter().filter(|i| i.id.starts_with(&prefix)).map(|i| i.molality).sum();
                let bound: f64 = sp.complexes.iter().filter(|c| c.ligand.starts_with(&prefix)).map(|c| c.molality).sum();
                prop_assert!((free + bound - total).abs() / total < 1e-10, "{prefix}: {free} + {bound} against {total}");
            }
        } else {
            prop_assert!(!report.warnings.is_empty(), "a non-converged solve must say so");
        }
    }

    #[test]
    fn ph_rises_monotonically_with_strong_base((items, water_g) in recipe_strategy()) {
        let lib = library();
        let constants = Constants::new(&lib, Conditions::default());
        let batch = build(&items, water_g).batch(&lib).expect("valid recipe");
        let doser = Doser::new(&lib, &constants, &batch, "sodium_hydroxide").expect("adjuster");
        let max_g = 0.05 * batch.total_mass_g;
        let mut last: Option<f64> = None;
        for i in 0..64 {
            let s = doser.solve(max_g * f64::from(i) / 63.0, None);
            // Only inside the activity model's range: beyond I = 0.5 Davies has no physical meaning.
            if !s.converged() || s.ionic_strength > ActivityModel::Davies.max_ionic_strength() {
                last = None;
                continue;
            }
            if let Some(prev) = last {
                prop_assert!(s.ph >= prev - 1e-9, "pH fell from {prev} to {} at point {i}", s.ph);
            }
            last = Some(s.ph);
        }
    }
}

/// Random compositions straight into the solver: up to 20 systems, 1e-9 to 10 mol/kg each,
/// strong acid or base excess to push pH near 0 and 14.
fn extreme_strategy() -> impl Strategy<Value = (Vec<(usize, f64)>, f64)> {
    let systems = library().systems().len();
    (
        prop::collection::vec((0..systems, -9.0f64..1.0), 1..=20),
        -3.0f64..1.0,
    )
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 1000, ..ProptestConfig::default() })]

    #[test]
    fn extreme_recipes_always_return_and_say_when_outside_the_model(
        (systems, log_excess) in extreme_strategy(),
        base in any::<bool>(),
        temp_c in 0.0f64..95.0,
    ) {
        use saltwise_chem::solver::{self, Composition};
        let lib = library();
        let constants = Constants::new(&lib, Conditions { temp_c, activity: ActivityModel::Davies });
        // Systems at their fully protonated form, plus Na+ or Cl- and the matching H+/OH- excess.
        let excess = 10f64.powf(log_excess);
        let mut c = Composition::default();
        let mut seen = std::collections::BTreeMap::new();
        for (s, log_m) in systems {
            *seen.entry(s).or_insert(0.0) += 10f64.powf(log_m);
        }
        c.systems = seen.into_iter().collect();
        for &(s, m) in &c.systems {
            // The counter-ion of a charged fully protonated form is a spectator of opposite charge.
            let z = f64::from(lib.systems()[s].charge_of_fully_protonated);
            c.spectator_charge -= z * m;
            c.spectator_z2 += z * z * m;
            c.spectator_abs_charge += z.abs() * m;
        }
        let sign = if base { 1.0 } else { -1.0 };
        c.spectator_charge += sign * excess;
        c.spectator_z2 += excess;
        c.spectator_abs_charge += excess;
        c.proton_excess -= sign * excess;
        let s = solver::solve(&constants, &c, None);
        prop_assert!(s.ph.is_finite() && s.ionic_strength.is_finite());
        let sp = solver::speciation(&lib, &constants, &c, &s);
        let warnings = saltwise_chem::report::warnings(&constants, &c, &s, &sp);
        if s.converged() {
            prop_assert!(s.charge_residual < 1e-10, "charge residual {}", s.charge_residual);
            prop_assert!(s.proton_residual < 1e-10, "proton residual {}", s.proton_residual);
            if s.ionic_strength > 0.5 || !(-1.0..=15.0).contains(&s.ph) {
                prop_assert!(!warnings.is_empty(), "outside the model without a warning: {s:?}");
            }
        } else {
            prop_assert!(!warnings.is_empty());
        }
    }
}
