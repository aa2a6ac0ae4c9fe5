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
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 300, ..ProptestConfig::default() })]

    #[test]
    fn charge_and_proton_balances_close((items, water_g) in recipe_strategy(), temp_c in 0.0f64..95.0, ideal in any::<bool>()) {
        let lib = library();
        let activity = if ideal { ActivityModel::Ideal } else { ActivityModel::Davies };
        let constants = Constants::new(&lib, Conditions { temp_c, activity });
        let report = evaluate_with(&lib, &constants, &build(&items, water_g)).expect("valid recipe");
        let s = &report.solution;
        prop_assert!(s.ph.is_finite());
        if s.converged() {
            // Spec: mass and charge balance closed to 1e-10 relative.
            prop_assert!(s.charge_residual < 1e-10, "charge residual {}", s.charge_residual);
            prop_assert!(s.proton_residual < 1e-10, "proton residual {}", s.proton_residual);
            for st in &report.systems {
                let sum: f64 = st.fractions.iter().sum();
                prop_assert!((sum - 1.0).abs() < 1e-12, "fractions sum {sum}");
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
        let curve = doser.curve(0.05 * batch.total_mass_g, 64);
        for w in curve.points.windows(2) {
            prop_assert!(w[1].ph >= w[0].ph - 1e-9, "pH fell from {} to {} at {} g", w[0].ph, w[1].ph, w[1].dose_g);
        }
    }
}
