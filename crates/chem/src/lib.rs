//! Saltwise chemistry core: aqueous acid–base equilibria from a recipe weighed by mass.
//!
//! A [`Recipe`] of library [`Ingredient`]s resolves into a [`Batch`] (masses, water, molal
//! totals); [`solver::solve`] finds the pH from the charge balance with activities and
//! temperature; [`curve`] sweeps doses and finds the dose to a target; [`explain`] says what each
//! released ion does to pH; [`project`] is the file a workbench saves. Pure and deterministic:
//! the only I/O is reading and atomically writing project files.

#![deny(missing_docs)]

pub mod amount;
pub mod chelant;
pub mod curve;
pub mod design;
pub mod distribution;
pub mod drift;
pub mod error;
pub mod explain;
pub mod fit;
pub mod formula;
pub mod hazard;
pub mod library;
pub mod limits;
pub mod measured;
pub mod precipitation;
pub mod project;
pub mod qc;
pub mod recipe;
pub mod report;
pub mod reserve;
pub mod solver;
pub mod sweep;
pub mod text;
pub mod tolerance;
pub mod user_library;
pub mod variant;

pub use amount::{Amount, Unit};
pub use error::{DoseError, FormulaError, LibraryError, LimitError, ProjectError, RecipeError};
pub use library::{Hazard, Ingredient, Library};
pub use recipe::{Batch, Recipe, RecipeLine};
pub use report::{Report, evaluate};
pub use solver::{ActivityModel, Conditions, Constants, Solution, SolveStatus};
