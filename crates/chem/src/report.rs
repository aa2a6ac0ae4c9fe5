//! One evaluation of a recipe: the batch, the solved state, its species and the warnings.

use crate::error::RecipeError;
use crate::library::Library;
use crate::recipe::{Batch, Recipe};
use crate::solver::{self, Composition, Conditions, Constants, Solution, SolveStatus, SystemState};

/// Everything known about a recipe at some conditions.
#[derive(Debug, Clone, PartialEq)]
pub struct Report {
    /// The conditions solved at.
    pub conditions: Conditions,
    /// The resolved batch.
    pub batch: Batch,
    /// The molal totals.
    pub composition: Composition,
    /// The solved state.
    pub solution: Solution,
    /// Every form of every system present.
    pub systems: Vec<SystemState>,
    /// Validity warnings in plain words (model range, pH range, convergence).
    pub warnings: Vec<String>,
}

/// Checks that a temperature is inside the model's range.
pub fn check_temperature(temp_c: f64) -> Result<(), RecipeError> {
    if crate::limits::TEMPERATURE_C.allows(temp_c) {
        Ok(())
    } else {
        Err(RecipeError::Temperature { temp_c })
    }
}

/// Resolves and solves a recipe.
pub fn evaluate(
    library: &Library,
    recipe: &Recipe,
    conditions: Conditions,
) -> Result<Report, RecipeError> {
    check_temperature(conditions.temp_c)?;
    let constants = Constants::new(library, conditions);
    evaluate_with(library, &constants, recipe)
}

/// Resolves and solves a recipe with constants already computed for the conditions.
pub fn evaluate_with(
    library: &Library,
    constants: &Constants,
    recipe: &Recipe,
) -> Result<Report, RecipeError> {
    let batch = recipe.batch(library)?;
    let composition = batch.composition(library)?;
    let solution = solver::solve(constants, &composition, None);
    let systems = solver::system_states(constants, &composition, &solution);
    let warnings = warnings(constants, &solution);
    Ok(Report {
        conditions: constants.conditions,
        batch,
        composition,
        solution,
        systems,
        warnings,
    })
}

/// Plain-words warnings about where a solved state stands against the model's validity.
pub fn warnings(constants: &Constants, solution: &Solution) -> Vec<String> {
    let mut w = Vec::new();
    let model = constants.conditions.activity;
    let limit = model.max_ionic_strength();
    if solution.ionic_strength > limit {
        w.push(format!(
            "ionic strength {:.3} mol/kg water is above {limit} mol/kg water, the usual limit of the {} activity model: treat the pH as indicative",
            solution.ionic_strength,
            model.label()
        ));
    }
    match solution.status {
        SolveStatus::Converged => {}
        SolveStatus::BelowRange => w.push(format!(
            "the solution is more acidic than pH {}: outside the model",
            solver::PH_MIN
        )),
        SolveStatus::AboveRange => w.push(format!(
            "the solution is more alkaline than pH {}: outside the model",
            solver::PH_MAX
        )),
        SolveStatus::NotConverged => {
            w.push("the solver did not converge: the values shown are its last estimate".into())
        }
    }
    if solution.converged() && !(-1.0..=15.0).contains(&solution.ph) {
        w.push(format!(
            "pH {:.2} is outside −1…15, where activity models are not reliable",
            solution.ph
        ));
    }
    w
}
