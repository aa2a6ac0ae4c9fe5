//! A recipe calibrated against a measured titration: chosen unknowns fitted by nonlinear least
//! squares (Levenberg–Marquardt of the `levenberg-marquardt` crate), with standard errors, the
//! correlation of the parameters, residuals and plain warnings when the data cannot tell.
//!
//! The model of a reading is the QC titration prediction of [`crate::qc`]: the sample (the
//! product, `sample_g` g of it in proportion) with the titrant added, solved at the project's
//! conditions, plus a constant meter offset. The unknowns a user may choose:
//!
//! - `assay:ID`: the effective assay of every line of ingredient ID (one lot), as a factor on the
//!   substance its grams bring (the grams weighed stay; the rest is water). Reported as % w/w
//!   of the named substance.
//! - `unknown-acid:PKA`: the amount (mmol per kg of product) and the pKa of an unknown
//!   monoprotic acid HA in the product, PKA the starting pKa. A negative amount is its conjugate
//!   base B (a base whose acid BH⁺ has that pKa): with the charge balance, NaA and B are the same.
//!   `unknown-base:PKA` is the same unknown with the amount counted as base. Its mass is
//!   neglected (the unknown is small next to the sample).
//! - `meter-offset`: a constant added to every model pH (the meter reads `true + offset`).
//!
//! The fitted pKa is thermodynamic (I = 0) at the temperature of the fit; the activity model
//! carries it to the sample's ionic strength. Standard errors come from the Jacobian at the
//! optimum, covariance s²·(JᵀJ)⁻¹ with s² = SSR/(n − p); a parameter is called not determined
//! when a plausible change of it moves no reading by [`FLAT_PH`] (a Jacobian column near zero),
//! when JᵀJ is singular, or when it correlates with another by more than [`CORRELATION_LIMIT`].

use std::cell::Cell;

use levenberg_marquardt::{LeastSquaresProblem, LevenbergMarquardt, TerminationReason};
use nalgebra::storage::Owned;
use nalgebra::{DMatrix, DVector, Dyn};
use thiserror::Error;

use crate::error::{LibraryError, LimitError, RecipeError};
use crate::formula::WATER_MOLAR_MASS_G_PER_MOL;
use crate::library::{Library, LibraryData, System};
use crate::limits;
use crate::measured::MeasuredTitration;
use crate::qc::{QcError, Titrant, Titration, TitrationPoint};
use crate::recipe::{Batch, Recipe};
use crate::solver::{Conditions, Constants};

/// Id of the system the unknown acid is modelled with (HA, uncharged acid form).
pub const UNKNOWN_ACID_SYSTEM: &str = "fitted_unknown_acid";
/// Id of the system the unknown base is modelled with (BH⁺, cationic acid form).
pub const UNKNOWN_BASE_SYSTEM: &str = "fitted_unknown_base";
/// A change of a parameter that moves no reading by this much is flat sensitivity, pH (pH
/// meters show 0.01 or 0.001, common practice, no source).
pub const FLAT_PH: f64 = 1e-3;
/// Above this |correlation| two parameters are not told apart.
pub const CORRELATION_LIMIT: f64 = 0.99;
/// Relative size of the smallest to the largest singular value of the scaled JᵀJ below which it
/// is taken as singular.
pub const SINGULAR_RATIO: f64 = 1e-12;
/// Largest |amount| of an unknown acid or base, mmol per kg of product.
pub const MAX_UNKNOWN_MMOL_PER_KG: f64 = 1e5;
/// Points of the fitted curve returned for plotting.
pub const CURVE_POINTS: usize = 101;
/// Temperatures of the readings further than this from the fit's, °C, are warned about.
pub const TEMPERATURE_WARNING_C: f64 = 2.0;

/// Residual given to parameters the model cannot take (negative assay, pKa out of range), pH;
/// large, so the least-squares step that reached them is refused.
const PENALTY_PH: f64 = 100.0;

/// Why a fit cannot be made.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum FitError {
    /// No readings.
    #[error("the measured titration holds no readings; import pH-meter readings first")]
    NoReadings,
    /// No unknown to fit.
    #[error(
        "nothing to fit: choose at least one of assay:ID, unknown-acid:PKA, unknown-base:PKA, meter-offset"
    )]
    NoUnknowns,
    /// Fewer readings than parameters.
    #[error(
        "{points} readings cannot determine {parameters} parameters ({names}); take at least as many readings as parameters, better several times as many"
    )]
    TooFewPoints {
        /// Readings given.
        points: usize,
        /// Parameters asked for.
        parameters: usize,
        /// Their names.
        names: String,
    },
    /// An unknown written in a way that is not understood.
    #[error("--fit '{text}': {message}")]
    BadUnknown {
        /// As written.
        text: String,
        /// What is allowed.
        message: String,
    },
    /// The same unknown twice, or an unknown acid and an unknown base together.
    #[error(
        "{what} is asked for twice; each unknown is fitted once (one unknown acid or base per fit)"
    )]
    Twice {
        /// The unknown.
        what: String,
    },
    /// An assay of an ingredient that no enabled line of the recipe holds.
    #[error("assay:{id}: no enabled line of the recipe holds '{id}'; the recipe's ingredients are {}", .held.join(", "))]
    NotInRecipe {
        /// The ingredient id.
        id: String,
        /// The ingredients the recipe holds.
        held: Vec<String>,
    },
    /// A number outside its limits (sample, normality, starting pKa).
    #[error(transparent)]
    Limit(#[from] LimitError),
    /// The titrant or the sample cannot be titrated.
    #[error(transparent)]
    Qc(#[from] QcError),
    /// The recipe cannot be solved.
    #[error(transparent)]
    Recipe(#[from] RecipeError),
    /// The unknown's systems could not be added to the library.
    #[error(transparent)]
    Library(#[from] LibraryError),
    /// The starting values give no solution.
    #[error("the model cannot be solved at the starting values: {0}")]
    Start(String),
    /// A fitted ingredient asked of a fit that does not determine it.
    #[error("{0}")]
    NotSaved(String),
}

/// An unknown the user chooses to fit.
#[derive(Debug, Clone, PartialEq)]
pub enum Unknown {
    /// The effective assay of every line of an ingredient.
    Assay(String),
    /// An unknown monoprotic acid: amount and pKa, from a starting pKa.
    UnknownAcid {
        /// Starting pKa.
        pka_start: f64,
    },
    /// An unknown monoprotic base (pKa of its acid BH⁺): amount and pKa, from a starting pKa.
    UnknownBase {
        /// Starting pKa of BH⁺.
        pka_start: f64,
    },
    /// A constant pH offset of the meter.
    MeterOffset,
}

impl Unknown {
    /// Parses `assay:ID`, `unknown-acid:PKA`, `unknown-base:PKA` or `meter-offset`.
    pub fn parse(text: &str) -> Result<Self, FitError> {
        let t = text.trim();
        let bad = |message: &str| FitError::BadUnknown {
            text: text.to_owned(),
            message: message.to_owned(),
        };
        let (kind, arg) = match t.split_once(':') {
            Some((k, a)) => (k.trim().to_ascii_lowercase(), Some(a.trim())),
            None => (t.to_ascii_lowercase(), None),
        };
        let pka = |a: Option<&str>| -> Result<f64, FitError> {
            let a = a.filter(|a| !a.is_empty()).ok_or_else(|| {
                bad("give the starting pKa after the colon, e.g. unknown-acid:4.8")
            })?;
            let v = limits::parse_number(a).ok_or_else(|| {
                bad(&format!(
                    "'{a}' is not a number; give a starting pKa such as 4.8"
                ))
            })?;
            Ok(limits::PKA.check_as(v, "starting pKa")?)
        };
        match (kind.as_str(), arg) {
            ("assay", Some(id)) if !id.is_empty() => Ok(Self::Assay(id.to_owned())),
            ("assay", _) => Err(bad(
                "give the ingredient after the colon, e.g. assay:sodium_hydroxide_50",
            )),
            ("unknown-acid", a) => Ok(Self::UnknownAcid { pka_start: pka(a)? }),
            ("unknown-base", a) => Ok(Self::UnknownBase { pka_start: pka(a)? }),
            ("meter-offset", None) => Ok(Self::MeterOffset),
            ("meter-offset", Some(_)) => Err(bad("meter-offset takes no value")),
            _ => Err(bad(
                "the unknowns are assay:ID, unknown-acid:PKA, unknown-base:PKA and meter-offset",
            )),
        }
    }

    /// The names of the parameters it brings, as reported.
    pub fn parameter_names(&self) -> Vec<String> {
        match self {
            Self::Assay(id) => vec![format!("assay:{id}")],
            Self::UnknownAcid { .. } => {
                vec!["unknown-acid:amount".into(), "unknown-acid:pka".into()]
            }
            Self::UnknownBase { .. } => {
                vec!["unknown-base:amount".into(), "unknown-base:pka".into()]
            }
            Self::MeterOffset => vec!["meter-offset".into()],
        }
    }
}

/// One fitted parameter.
#[derive(Debug, Clone, PartialEq)]
pub struct FittedValue {
    /// Name: `assay:ID`, `unknown-acid:amount`, `unknown-acid:pka`, `meter-offset`, ….
    pub name: String,
    /// Fitted value, in `unit`.
    pub value: f64,
    /// Standard error, in `unit`; `None` when the data cannot determine it.
    pub std_error: Option<f64>,
    /// The value the fit started from.
    pub start: f64,
    /// Unit of the value: `% w/w`, `mmol/kg of product`, `pKa`, `pH`.
    pub unit: &'static str,
    /// Whether the data determine it (sensitivity, singularity, correlation).
    pub determined: bool,
}

/// One reading against the fitted model.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Residual {
    /// Titrant added as read (mL, or g when weighed).
    pub titrant: f64,
    /// Titrant added, mL.
    pub ml: f64,
    /// pH read.
    pub measured_ph: f64,
    /// pH of the model before the fit (the recipe as written, no offset).
    pub start_ph: f64,
    /// pH of the fitted model.
    pub fitted_ph: f64,
    /// Measured minus fitted, pH.
    pub residual: f64,
}

/// A fit of chosen unknowns to a measured titration.
#[derive(Debug, Clone, PartialEq)]
pub struct Fit {
    /// The unknowns, as asked.
    pub unknowns: Vec<Unknown>,
    /// Every fitted parameter, in the order asked.
    pub parameters: Vec<FittedValue>,
    /// Correlation of the parameters (row and column in the order of `parameters`); NaN where
    /// a parameter has no sensitivity at all.
    pub correlation: Vec<Vec<f64>>,
    /// Root mean square of the residuals, pH.
    pub rms_ph: f64,
    /// The same before the fit (the recipe as written), pH.
    pub start_rms_ph: f64,
    /// Sum of squared residuals, pH².
    pub ssr: f64,
    /// Readings minus parameters.
    pub degrees_of_freedom: usize,
    /// One per reading, in file order.
    pub residuals: Vec<Residual>,
    /// The fitted model from 0 mL to the last reading (for plotting with the readings).
    pub curve: Vec<TitrationPoint>,
    /// Plain warnings: parameters not determined, no convergence, temperatures.
    pub warnings: Vec<String>,
    /// Whether the minimiser reported convergence.
    pub converged: bool,
    /// Why the minimiser stopped, in words.
    pub termination: String,
    /// Model evaluations used (each solves every reading).
    pub evaluations: usize,
}

impl Fit {
    /// The fitted parameter called `name`.
    pub fn parameter(&self, name: &str) -> Option<&FittedValue> {
        self.parameters.iter().find(|p| p.name == name)
    }
}

/// What one internal parameter is.
#[derive(Debug, Clone, PartialEq)]
enum Slot {
    /// Factor on the substance of these batch lines; `nominal_percent` the labelled assay, %.
    Assay {
        lines: Vec<usize>,
        nominal_percent: f64,
    },
    /// Signed amount, mmol/kg of product (positive acid HA, negative base B).
    Amount { base: bool },
    /// pKa of the unknown.
    Pka,
    /// Meter offset, pH.
    Offset,
}

impl Slot {
    /// A plausible change, for the flat-sensitivity test, in internal units.
    fn plausible_change(&self, x: f64) -> f64 {
        match self {
            Self::Assay { .. } => 0.01,
            Self::Amount { .. } => (0.1 * x.abs()).max(0.1),
            Self::Pka => 0.1,
            Self::Offset => 0.01,
        }
    }

    /// The plausible change in words.
    fn plausible_words(&self) -> &'static str {
        match self {
            Self::Assay { .. } => "a 1 % change of its assay",
            Self::Amount { .. } => "a 10 % change of its amount (at least 0.1 mmol/kg)",
            Self::Pka => "a change of 0.1 in its pKa",
            Self::Offset => "an offset of 0.01",
        }
    }

    /// Central-difference step, internal units.
    fn step(&self, x: f64) -> f64 {
        match self {
            Self::Assay { .. } => 1e-5 * x.abs().max(1e-2),
            Self::Amount { .. } => (1e-5 * x.abs()).max(1e-5),
            Self::Pka => 1e-4,
            Self::Offset => 1e-4,
        }
    }

    /// Reported value of an internal one (and the factor on standard errors).
    fn reported(&self, x: f64) -> (f64, f64) {
        match self {
            Self::Assay {
                nominal_percent, ..
            } => (x * nominal_percent, *nominal_percent),
            Self::Amount { base: true } => (-x, 1.0),
            _ => (x, 1.0),
        }
    }

    fn unit(&self) -> &'static str {
        match self {
            Self::Assay { .. } => "% w/w",
            Self::Amount { .. } => "mmol/kg of product",
            Self::Pka => "pKa",
            Self::Offset => "pH",
        }
    }
}

/// The model: the product, what the unknowns do to it, and the readings.
struct Model<'a> {
    library: &'a Library,
    constants: Constants,
    product: Batch,
    titrant: Titrant,
    sample_g: f64,
    ml: Vec<f64>,
    measured: Vec<f64>,
    slots: Vec<Slot>,
    /// Indices of the unknown acid and base systems, when an unknown is fitted.
    unknown_systems: Option<(usize, usize)>,
    evaluations: Cell<usize>,
}

impl Model<'_> {
    /// Model pH at every reading, or `None` where the parameters are outside what the model takes.
    fn predict_at(&self, x: &[f64], ml: &[f64]) -> Option<Vec<f64>> {
        self.evaluations.set(self.evaluations.get() + 1);
        let mut batch = self.product.clone();
        let mut offset = 0.0;
        let mut amount = 0.0;
        let mut pka = None;
        for (slot, &v) in self.slots.iter().zip(x) {
            if !v.is_finite() {
                return None;
            }
            match slot {
                Slot::Assay { lines, .. } => {
                    if v <= 0.0 || v > 100.0 {
                        return None;
                    }
                    for &i in lines {
                        let line = batch.lines[i].clone();
                        let e = &self.library.entries()[line.entry];
                        let extra_mol = line.substance_mol * (v - 1.0);
                        batch
                            .totals
                            .add_releases(self.library, line.entry, extra_mol);
                        let water_g = -line.mass_g * e.ingredient.assay * (v - 1.0)
                            + extra_mol * e.water_mol_per_mol * WATER_MOLAR_MASS_G_PER_MOL;
                        batch.totals.water_kg += water_g * 1e-3;
                        batch.lines[i].substance_mol += extra_mol;
                        batch.lines[i].water_g += water_g;
                    }
                }
                Slot::Amount { .. } => {
                    if v.abs() > MAX_UNKNOWN_MMOL_PER_KG {
                        return None;
                    }
                    amount = v;
                }
                Slot::Pka => {
                    if !limits::PKA.allows(v) {
                        return None;
                    }
                    pka = Some(v);
                }
                Slot::Offset => offset = v,
            }
        }
        if batch.totals.water_kg <= 0.0 {
            return None;
        }
        let mut constants_owned;
        let mut constants = &self.constants;
        if let Some((acid, base)) = self.unknown_systems {
            let mol = amount.abs() * 1e-3 * batch.total_mass_g * 1e-3;
            if amount > 0.0 {
                batch.totals.system_mol[acid] += mol;
            } else if amount < 0.0 {
                // B is form 1 of BH⁺: one proton below the fully protonated level.
                batch.totals.system_mol[base] += mol;
                batch.totals.proton_excess_mol -= mol;
            }
            if let Some(p) = pka {
                constants_owned = self.constants.clone();
                constants_owned.set_pka(acid, 0, p);
                constants_owned.set_pka(base, 0, p);
                constants = &constants_owned;
            }
        }
        let t = Titration::new(
            self.library,
            constants,
            &batch,
            self.sample_g,
            &self.titrant,
        )
        .ok()?;
        let out: Vec<f64> = ml.iter().map(|&v| t.ph_at(v) + offset).collect();
        out.iter().all(|p| p.is_finite()).then_some(out)
    }

    fn residuals_at(&self, x: &[f64]) -> Option<Vec<f64>> {
        let p = self.predict_at(x, &self.ml)?;
        Some(p.iter().zip(&self.measured).map(|(m, y)| m - y).collect())
    }

    /// Residuals, with the penalty where the model cannot take the parameters.
    fn residuals_or_penalty(&self, x: &[f64]) -> Vec<f64> {
        self.residuals_at(x)
            .unwrap_or_else(|| vec![PENALTY_PH; self.measured.len()])
    }

    /// Jacobian of the residuals by central differences (one-sided at an edge); the offset's
    /// column is exactly 1.
    fn jacobian_at(&self, x: &[f64], r0: &[f64]) -> DMatrix<f64> {
        let n = self.measured.len();
        let mut j = DMatrix::zeros(n, x.len());
        for (k, slot) in self.slots.iter().enumerate() {
            if *slot == Slot::Offset {
                j.column_mut(k).fill(1.0);
                continue;
            }
            let h = slot.step(x[k]);
            let mut up = x.to_vec();
            up[k] += h;
            let mut down = x.to_vec();
            down[k] -= h;
            let column: Vec<f64> = match (self.residuals_at(&up), self.residuals_at(&down)) {
                (Some(a), Some(b)) => a.iter().zip(&b).map(|(a, b)| (a - b) / (2.0 * h)).collect(),
                (Some(a), None) => a.iter().zip(r0).map(|(a, b)| (a - b) / h).collect(),
                (None, Some(b)) => r0.iter().zip(&b).map(|(a, b)| (a - b) / h).collect(),
                (None, None) => vec![0.0; n],
            };
            for (i, v) in column.into_iter().enumerate() {
                j[(i, k)] = v;
            }
        }
        j
    }
}

/// The least-squares problem handed to the minimiser.
struct Problem<'m, 'a> {
    model: &'m Model<'a>,
    x: DVector<f64>,
    residuals: Vec<f64>,
}

impl LeastSquaresProblem<f64, Dyn, Dyn> for Problem<'_, '_> {
    type ResidualStorage = Owned<f64, Dyn>;
    type JacobianStorage = Owned<f64, Dyn, Dyn>;
    type ParameterStorage = Owned<f64, Dyn>;

    fn set_params(&mut self, x: &DVector<f64>) {
        self.x.copy_from(x);
        self.residuals = self.model.residuals_or_penalty(x.as_slice());
    }

    fn params(&self) -> DVector<f64> {
        self.x.clone()
    }

    fn residuals(&self) -> Option<DVector<f64>> {
        Some(DVector::from_column_slice(&self.residuals))
    }

    fn jacobian(&self) -> Option<DMatrix<f64>> {
        Some(self.model.jacobian_at(self.x.as_slice(), &self.residuals))
    }
}

fn ssr(r: &[f64]) -> f64 {
    r.iter().map(|v| v * v).sum()
}

fn termination_words(t: &TerminationReason) -> String {
    match t {
        TerminationReason::Converged { .. } => "converged".into(),
        TerminationReason::ResidualsZero => "converged (residuals zero)".into(),
        TerminationReason::Orthogonal => "converged (gradient zero)".into(),
        TerminationReason::LostPatience => "stopped: too many evaluations".into(),
        TerminationReason::NoImprovementPossible(what) => {
            format!("stopped: no further improvement possible ({what} at machine precision)")
        }
        TerminationReason::Numerical(what) => format!("stopped: numerical problem in {what}"),
        TerminationReason::User(what) => format!("stopped: the model gave no {what}"),
        other => format!("stopped: {other:?}"),
    }
}

/// Everything a fit or a simulation needs, prepared once.
struct Prepared {
    library: Library,
    constants: Constants,
    product: Batch,
    titrant: Titrant,
    slots: Vec<Slot>,
    names: Vec<String>,
    starts: Vec<f64>,
    unknown_systems: Option<(usize, usize)>,
}

fn unknown_system(id: &str, charge: i32, pka: f64) -> System {
    System {
        id: id.into(),
        name: if charge == 0 {
            "unknown acid (fitted)".into()
        } else {
            "unknown base (fitted)".into()
        },
        charge_of_fully_protonated: charge,
        forms: Vec::new(),
        pka: vec![pka],
        dh_kj_mol: vec![0.0],
        dcp_j_mol_k: Vec::new(),
        pka_ionic_strength: 0.0,
        pka_ionic_strengths: Vec::new(),
        source: "fitted to a measured titration".into(),
    }
}

fn prepare(
    library: &Library,
    conditions: Conditions,
    recipe: &Recipe,
    titration: &MeasuredTitration,
    unknowns: &[Unknown],
) -> Result<Prepared, FitError> {
    if unknowns.is_empty() {
        return Err(FitError::NoUnknowns);
    }
    limits::SAMPLE_G.check(titration.sample_g)?;
    let titrant = Titrant::find(library, &titration.titrant, titration.normality)?;
    let mut seen: Vec<&str> = Vec::new();
    let mut unknown_pka = None;
    for u in unknowns {
        let key = match u {
            Unknown::Assay(id) => id.as_str(),
            Unknown::UnknownAcid { pka_start } | Unknown::UnknownBase { pka_start } => {
                unknown_pka = Some(*pka_start);
                "an unknown acid or base"
            }
            Unknown::MeterOffset => "meter-offset",
        };
        if seen.contains(&key) {
            return Err(FitError::Twice {
                what: match u {
                    Unknown::Assay(id) => format!("assay:{id}"),
                    _ => key.to_owned(),
                },
            });
        }
        seen.push(key);
    }
    let mut lib = library.clone();
    let unknown_systems = match unknown_pka {
        Some(p) => {
            lib.extend(LibraryData {
                systems: vec![
                    unknown_system(UNKNOWN_ACID_SYSTEM, 0, p),
                    unknown_system(UNKNOWN_BASE_SYSTEM, 1, p),
                ],
                ..LibraryData::default()
            })?;
            match (
                lib.system_index(UNKNOWN_ACID_SYSTEM),
                lib.system_index(UNKNOWN_BASE_SYSTEM),
            ) {
                (Some(a), Some(b)) => Some((a, b)),
                _ => None,
            }
        }
        None => None,
    };
    let product = recipe.batch(&lib)?;
    let constants = Constants::new(&lib, conditions);
    let mut slots = Vec::new();
    let mut names = Vec::new();
    let mut starts = Vec::new();
    for u in unknowns {
        names.extend(u.parameter_names());
        match u {
            Unknown::Assay(id) => {
                let lines: Vec<usize> = product
                    .lines
                    .iter()
                    .enumerate()
                    .filter(|(_, l)| {
                        l.enabled && l.mass_g > 0.0 && lib.entries()[l.entry].ingredient.id == *id
                    })
                    .map(|(i, _)| i)
                    .collect();
                let Some(&first) = lines.first() else {
                    let mut held: Vec<String> = product
                        .lines
                        .iter()
                        .filter(|l| l.enabled)
                        .map(|l| lib.entries()[l.entry].ingredient.id.clone())
                        .collect();
                    held.dedup();
                    return Err(FitError::NotInRecipe {
                        id: id.clone(),
                        held,
                    });
                };
                let nominal_percent =
                    lib.entries()[product.lines[first].entry].ingredient.assay * 100.0;
                slots.push(Slot::Assay {
                    lines,
                    nominal_percent,
                });
                starts.push(1.0);
            }
            Unknown::UnknownAcid { pka_start } | Unknown::UnknownBase { pka_start } => {
                slots.push(Slot::Amount {
                    base: matches!(u, Unknown::UnknownBase { .. }),
                });
                starts.push(0.0);
                slots.push(Slot::Pka);
                starts.push(*pka_start);
            }
            Unknown::MeterOffset => {
                slots.push(Slot::Offset);
                starts.push(0.0);
            }
        }
    }
    Ok(Prepared {
        library: lib,
        constants,
        product,
        titrant,
        slots,
        names,
        starts,
        unknown_systems,
    })
}

/// Model pH at every reading of a titration with the unknowns at the given values (as reported:
/// assay in % w/w, amount in mmol/kg of product with its sign as named, pKa, offset in pH), in
/// the order of [`Unknown::parameter_names`]. Makes synthetic titrations and overlays.
pub fn simulate(
    library: &Library,
    conditions: Conditions,
    recipe: &Recipe,
    titration: &MeasuredTitration,
    unknowns: &[Unknown],
    values: &[f64],
) -> Result<Vec<f64>, FitError> {
    let p = prepare(library, conditions, recipe, titration, unknowns)?;
    if values.len() != p.slots.len() {
        return Err(FitError::BadUnknown {
            text: p.names.join(", "),
            message: format!(
                "{} values given for {} parameters",
                values.len(),
                p.slots.len()
            ),
        });
    }
    let x: Vec<f64> = p
        .slots
        .iter()
        .zip(values)
        .map(|(s, v)| {
            let (_, scale) = s.reported(1.0);
            match s {
                Slot::Amount { base: true } => -v,
                _ => v / scale,
            }
        })
        .collect();
    let model = Model {
        library: &p.library,
        constants: p.constants.clone(),
        product: p.product.clone(),
        titrant: p.titrant.clone(),
        sample_g: titration.sample_g,
        ml: titration.titrant_ml(),
        measured: titration.points.iter().map(|q| q.ph).collect(),
        slots: p.slots.clone(),
        unknown_systems: p.unknown_systems,
        evaluations: Cell::new(0),
    };
    model
        .predict_at(&x, &model.ml)
        .ok_or_else(|| FitError::Start("the values given are outside what the model takes".into()))
}

/// Fits the chosen unknowns of a recipe to a measured titration.
pub fn fit(
    library: &Library,
    conditions: Conditions,
    recipe: &Recipe,
    titration: &MeasuredTitration,
    unknowns: &[Unknown],
) -> Result<Fit, FitError> {
    if titration.points.is_empty() {
        return Err(FitError::NoReadings);
    }
    let p = prepare(library, conditions, recipe, titration, unknowns)?;
    let n = titration.points.len();
    let k = p.slots.len();
    if n < k {
        return Err(FitError::TooFewPoints {
            points: n,
            parameters: k,
            names: p.names.join(", "),
        });
    }
    let model = Model {
        library: &p.library,
        constants: p.constants.clone(),
        product: p.product.clone(),
        titrant: p.titrant.clone(),
        sample_g: titration.sample_g,
        ml: titration.titrant_ml(),
        measured: titration.points.iter().map(|q| q.ph).collect(),
        slots: p.slots.clone(),
        unknown_systems: p.unknown_systems,
        evaluations: Cell::new(0),
    };
    let mut x0 = p.starts.clone();
    let Some(r_start) = model.residuals_at(&x0) else {
        return Err(FitError::Start(
            "the sample with the titrant cannot be solved; check the recipe, sample and titrant"
                .into(),
        ));
    };
    let start_rms_ph = (ssr(&r_start) / n as f64).sqrt();
    // The amount of an unknown starts where a coarse scan of both signs fits best.
    if let Some(a) = p
        .slots
        .iter()
        .position(|s| matches!(s, Slot::Amount { .. }))
    {
        let mut best = (ssr(&r_start), 0.0);
        for mag in [0.1, 0.3, 1.0, 3.0, 10.0, 30.0, 100.0, 300.0, 1000.0, 3000.0] {
            for sign in [1.0, -1.0] {
                let mut x = x0.clone();
                x[a] = sign * mag;
                if let Some(r) = model.residuals_at(&x) {
                    let s = ssr(&r);
                    if s < best.0 {
                        best = (s, sign * mag);
                    }
                }
            }
        }
        x0[a] = best.1;
    }
    let start_reported: Vec<f64> = p
        .slots
        .iter()
        .zip(&p.starts)
        .map(|(s, &v)| s.reported(v).0)
        .collect();
    let problem = Problem {
        model: &model,
        x: DVector::from_column_slice(&x0),
        residuals: model.residuals_or_penalty(&x0),
    };
    let (solved, report) = LevenbergMarquardt::new()
        .with_ftol(1e-12)
        .with_xtol(1e-10)
        .with_gtol(1e-12)
        .with_patience(200)
        .minimize(problem);
    let converged = report.termination.was_successful()
        || matches!(
            report.termination,
            TerminationReason::NoImprovementPossible(_)
        );
    let termination = termination_words(&report.termination);
    let x: Vec<f64> = solved.x.iter().copied().collect();
    let r = model.residuals_or_penalty(&x);
    let j = model.jacobian_at(&x, &r);
    let ssr_fit = ssr(&r);
    let dof = n - k;
    let s2 = if dof > 0 {
        ssr_fit / dof as f64
    } else {
        f64::NAN
    };

    // Column scales: JᵀJ is inverted scaled to unit columns, so units do not matter.
    let norms: Vec<f64> = (0..k).map(|c| j.column(c).norm()).collect();
    let mut warnings = Vec::new();
    let mut determined = vec![true; k];
    for (c, slot) in p.slots.iter().enumerate() {
        let most = j.column(c).amax() * slot.plausible_change(x[c]);
        if !most.is_finite() || most < FLAT_PH {
            determined[c] = false;
            warnings.push(format!(
                "{} is not determined by these readings: {} moves no reading by {FLAT_PH} pH or more (flat sensitivity); leave it out of the fit or take readings where it matters",
                p.names[c],
                slot.plausible_words()
            ));
        }
    }
    let mut scaled = j.clone();
    for (c, &nrm) in norms.iter().enumerate() {
        let d = if nrm > 0.0 { nrm } else { 1.0 };
        scaled.column_mut(c).unscale_mut(d);
    }
    let a = scaled.transpose() * &scaled;
    let svd = a.clone().svd(true, true);
    let smax = svd.singular_values.max();
    let smin = svd.singular_values.min();
    let singular = !smin.is_finite() || smin <= SINGULAR_RATIO * smax;
    let inverse = svd
        .pseudo_inverse(SINGULAR_RATIO * smax.max(f64::MIN_POSITIVE))
        .unwrap_or_else(|_| DMatrix::from_element(k, k, f64::NAN));
    let mut correlation = vec![vec![f64::NAN; k]; k];
    for i in 0..k {
        for m in 0..k {
            if norms[i] > 0.0 && norms[m] > 0.0 {
                let d = (inverse[(i, i)] * inverse[(m, m)]).sqrt();
                correlation[i][m] = if i == m { 1.0 } else { inverse[(i, m)] / d };
            }
        }
    }
    if singular {
        warnings.push(format!(
            "the readings cannot separate the parameters ({}): the least-squares matrix is singular, so no standard errors are given; fit fewer unknowns",
            p.names.join(", ")
        ));
        determined.iter_mut().for_each(|d| *d = false);
    }
    for i in 0..k {
        for m in (i + 1)..k {
            let c = correlation[i][m];
            if c.abs() > CORRELATION_LIMIT {
                determined[i] = false;
                determined[m] = false;
                warnings.push(format!(
                    "{} and {} are correlated (r = {c:.4}): the readings cannot tell them apart; fit only one of them",
                    p.names[i], p.names[m]
                ));
            }
        }
    }
    if dof == 0 {
        warnings.push(format!(
            "{n} readings for {k} parameters leave no degrees of freedom, so no standard errors are given; take more readings"
        ));
    }
    if !converged {
        warnings.push(format!(
            "the fit did not converge ({termination}); the values are where it stopped"
        ));
    }
    let temps: Vec<f64> = titration.points.iter().filter_map(|q| q.temp_c).collect();
    if let Some(far) = temps
        .iter()
        .copied()
        .max_by(|a, b| {
            (a - conditions.temp_c)
                .abs()
                .total_cmp(&(b - conditions.temp_c).abs())
        })
        .filter(|t| (t - conditions.temp_c).abs() > TEMPERATURE_WARNING_C)
    {
        warnings.push(format!(
            "readings were taken at up to {far} °C but the model is solved at {} °C; set the temperature to that of the titration",
            conditions.temp_c
        ));
    }
    let parameters = p
        .slots
        .iter()
        .enumerate()
        .map(|(c, slot)| {
            let (value, scale) = slot.reported(x[c]);
            let se = if singular || dof == 0 || norms[c] <= 0.0 {
                None
            } else {
                let var = s2 * inverse[(c, c)] / (norms[c] * norms[c]);
                (var.is_finite() && var >= 0.0).then(|| var.sqrt() * scale.abs())
            };
            FittedValue {
                name: p.names[c].clone(),
                value,
                std_error: se,
                start: start_reported[c],
                unit: slot.unit(),
                determined: determined[c] && se.is_some(),
            }
        })
        .collect();
    let fitted_ph = model
        .predict_at(&x, &model.ml)
        .unwrap_or_else(|| vec![f64::NAN; n]);
    let start_ph: Vec<f64> = r_start
        .iter()
        .zip(&model.measured)
        .map(|(r, y)| r + y)
        .collect();
    let residuals = titration
        .points
        .iter()
        .zip(&model.ml)
        .enumerate()
        .map(|(i, (q, &ml))| Residual {
            titrant: q.titrant,
            ml,
            measured_ph: q.ph,
            start_ph: start_ph[i],
            fitted_ph: fitted_ph[i],
            residual: q.ph - fitted_ph[i],
        })
        .collect();
    let last_ml = model.ml.iter().copied().fold(0.0, f64::max);
    let grid: Vec<f64> = (0..CURVE_POINTS)
        .map(|i| last_ml * i as f64 / (CURVE_POINTS - 1) as f64)
        .collect();
    let curve = model
        .predict_at(&x, &grid)
        .map(|ph| {
            grid.iter()
                .zip(ph)
                .map(|(&ml, ph)| TitrationPoint { ml, ph })
                .collect()
        })
        .unwrap_or_default();
    Ok(Fit {
        unknowns: unknowns.to_vec(),
        parameters,
        correlation,
        rms_ph: (ssr_fit / n as f64).sqrt(),
        start_rms_ph,
        ssr: ssr_fit,
        degrees_of_freedom: dof,
        residuals,
        curve,
        warnings,
        converged,
        termination,
        evaluations: model.evaluations.get(),
    })
}
