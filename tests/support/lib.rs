//! Shared helpers for the reference tests: recipes by molality, solving, and tolerances.

use saltwise_chem::report::Report;
use saltwise_chem::{
    ActivityModel, Amount, Conditions, Library, Recipe, RecipeLine, Unit, evaluate,
};

/// The built-in library (panics with the loader's message if it is broken).
pub fn library() -> Library {
    match Library::built_in() {
        Ok(l) => l,
        Err(e) => panic!("built-in library: {e}"),
    }
}

/// A recipe holding the given molalities (mol of substance per kg of water, all water counted).
pub fn molal_recipe(library: &Library, items: &[(&str, f64)]) -> Recipe {
    let mut water_g = 1000.0;
    let mut lines = Vec::new();
    for &(id, molality) in items {
        let Some(e) = library.entry(id) else {
            panic!("no ingredient {id}")
        };
        let mass_g = molality * e.molar_mass_g_per_mol / e.ingredient.assay;
        let brought_g = mass_g * (1.0 - e.ingredient.assay)
            + molality * e.water_mol_per_mol * saltwise_chem::formula::WATER_MOLAR_MASS_G_PER_MOL;
        water_g -= brought_g;
        lines.push(RecipeLine {
            ingredient: id.into(),
            amount: Amount {
                value: molality,
                unit: Unit::Mole,
            },
            enabled: true,
        });
    }
    lines.insert(0, RecipeLine::grams("water", water_g));
    Recipe {
        lines,
        qs_to_g: None,
        water_hardness: None,
    }
}

/// Solves molal items at a temperature with an activity model.
pub fn solve(items: &[(&str, f64)], temp_c: f64, activity: ActivityModel) -> Report {
    let lib = library();
    let recipe = molal_recipe(&lib, items);
    match evaluate(&lib, &recipe, Conditions { temp_c, activity }) {
        Ok(r) => {
            assert!(r.solution.converged(), "{items:?}: {:?}", r.solution.status);
            r
        }
        Err(e) => panic!("{items:?}: {e}"),
    }
}

/// pH of molal items.
pub fn ph(items: &[(&str, f64)], temp_c: f64, activity: ActivityModel) -> f64 {
    solve(items, temp_c, activity).solution.ph
}

/// Asserts |got − expected| ≤ tol with a readable message.
#[track_caller]
pub fn assert_close(what: &str, got: f64, expected: f64, tol: f64) {
    assert!(
        (got - expected).abs() <= tol,
        "{what}: got {got:.4}, expected {expected} ± {tol}"
    );
}
