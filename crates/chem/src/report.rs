//! One evaluation of a recipe: the batch, the solved state, its species and the warnings.

use crate::error::RecipeError;
use crate::library::Library;
use crate::recipe::{Batch, Recipe};
use crate::solver::{
    self, ActivityModel, Composition, Conditions, Constants, Solution, SolveStatus, Speciation,
    SystemState,
};

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
    /// Every ion with its activity coefficient, the complexes and the saturation indices.
    pub speciation: Speciation,
    /// The hardness the recipe's ligands hold at its pH (none without calcium in the library).
    pub capacity: Option<crate::chelant::Capacity>,
    /// Validity warnings in plain words (model range, pH range, convergence).
    pub warnings: Vec<String>,
}

impl Report {
    /// The system a species view shows: `system_id` if the recipe holds it, else the recipe's
    /// first system; `None` when the recipe has no acid–base system.
    pub fn shown_system(&self, library: &Library, system_id: Option<&str>) -> Option<&SystemState> {
        let present = |id: &str| {
            self.systems.iter().find(|s| {
                library
                    .systems()
                    .get(s.system)
                    .is_some_and(|sys| sys.id == id)
            })
        };
        system_id.and_then(present).or_else(|| self.systems.first())
    }
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
    let speciation = solver::speciation(library, constants, &composition, &solution);
    let warnings = warnings(constants, &composition, &solution, &speciation);
    let capacity = crate::chelant::capacity(
        library,
        constants,
        &batch,
        &composition,
        &solution,
        &systems,
    );
    Ok(Report {
        capacity,
        conditions: constants.conditions,
        batch,
        composition,
        solution,
        systems,
        speciation,
        warnings,
    })
}

/// Plain-words warnings about where a solved state stands against the model's validity: the
/// ionic strength against the limit of the model used for the charges present, ions whose
/// activity came from the fallback estimate, and the temperature of the Pitzer parameters.
pub fn warnings(
    constants: &Constants,
    composition: &Composition,
    solution: &Solution,
    speciation: &Speciation,
) -> Vec<String> {
    let mut w = Vec::new();
    let model = solution.activity;
    let ionic = solution.ionic_strength;
    match model {
        ActivityModel::Davies => {
            let z = solver::largest_significant_charge(constants, composition, solution);
            let limit = ActivityModel::davies_limit(z);
            if ionic > limit {
                w.push(format!(
                    "ionic strength {ionic:.3} mol/kg water is above {limit} mol/kg water, where the Davies model holds with ions of charge {z} present: treat the pH as indicative, or choose the Pitzer model"
                ));
            }
        }
        _ => {
            let limit = model.max_ionic_strength();
            if ionic > limit {
                w.push(format!(
                    "ionic strength {ionic:.3} mol/kg water is above {limit} mol/kg water, the usual limit of the {} activity model: treat the pH as indicative",
                    model.label()
                ));
            }
        }
    }
    if model == ActivityModel::Pitzer {
        let share: f64 = speciation
            .ions
            .iter()
            .filter(|i| i.fallback)
            .map(|i| 0.5 * f64::from(i.charge * i.charge) * i.molality)
            .sum::<f64>()
            / ionic.max(f64::MIN_POSITIVE);
        let ids = speciation.fallback_ions();
        if !ids.is_empty() && share > 0.1 && ionic > 0.1 {
            w.push(format!(
                "no published Pitzer parameters for {}: their activity is a charge-based estimate (they carry {:.0} % of the ionic strength), so treat the pH as indicative",
                ids.join(", "),
                share * 100.0
            ));
        }
        if (constants.conditions.temp_c - 25.0).abs() > 10.0 {
            w.push(format!(
                "the Pitzer parameters are for 25 °C; at {:.0} °C only their Debye–Hückel term follows the temperature",
                constants.conditions.temp_c
            ));
        }
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
