//! Solved results cached on their inputs: a frame whose inputs did not change solves nothing.

use saltwise_chem::library::{LibraryData, form_names};
use saltwise_chem::project::Project;
use saltwise_chem::report::{self, Report};
use saltwise_chem::reserve;
use saltwise_chem::solver::{self, Conditions, Constants};
use saltwise_chem::{Library, Recipe};

use saltwise_chem::curve::Doser;
pub use saltwise_chem::curve::{CurvePoint, DoseResult, EquivalencePoint};
use saltwise_chem::explain::{self, IngredientEffect};
use saltwise_chem::hazard::{self, Caution};

/// Points on the dose curve.
const CURVE_POINTS: usize = 161;
/// pH step of the species chart.
const SPECIES_PH_STEP: f64 = 0.05;

/// The dose curve of one adjuster on the current recipe.
#[derive(Debug, Clone, PartialEq)]
pub struct CurveData {
    /// Adjuster ingredient id.
    pub adjuster: String,
    /// Adjuster display name.
    pub adjuster_name: String,
    /// The points, from no dose to the largest.
    pub points: Vec<CurvePoint>,
    /// Equivalence points found on the curve.
    pub equivalence: Vec<EquivalencePoint>,
    /// Dose to the target pH, or why there is none (when a target is set).
    pub to_target: Option<Result<DoseResult, String>>,
}

/// Fractions of every form of one system against pH, at the recipe's ionic strength.
#[derive(Debug, Clone, PartialEq)]
pub struct SpeciesData {
    /// Library index of the system.
    pub system: usize,
    /// System id.
    pub system_id: String,
    /// System display name.
    pub system_name: String,
    /// Names of the forms, fully protonated first.
    pub forms: Vec<String>,
    /// Per form: (pH, fraction) points over pH 0–14.
    pub curves: Vec<Vec<[f64; 2]>>,
    /// Ionic strength the fractions are computed at, mol/kg.
    pub ionic_strength: f64,
    /// Fraction of each form at the recipe's pH.
    pub fractions_now: Vec<f64>,
    /// Molality of each form at the recipe's pH, mol/kg.
    pub molalities: Vec<f64>,
    /// Index of the form with the largest fraction at the recipe's pH.
    pub dominant: usize,
}

#[derive(Debug, Clone, PartialEq)]
struct ReportKey {
    recipe: Recipe,
    conditions: Conditions,
    custom: LibraryData,
}

#[derive(Debug, Clone, PartialEq)]
struct CurveKey {
    report: ReportKey,
    adjuster: String,
    dose_max_g: f64,
    target_ph: Option<f64>,
}

#[derive(Debug, Clone, PartialEq)]
struct SpeciesKey {
    report: ReportKey,
    system: Option<String>,
}

/// The solved state of the open project, recomputed only when its inputs change.
#[derive(Debug)]
pub struct Engine {
    base: Result<Library, String>,
    library: Result<Library, String>,
    library_key: Option<LibraryData>,
    constants: Option<Constants>,
    report: Option<(ReportKey, Result<Report, String>)>,
    effects: Vec<Option<IngredientEffect>>,
    cautions: Vec<Caution>,
    curve: Option<(CurveKey, Result<CurveData, String>)>,
    species: Option<(SpeciesKey, Option<SpeciesData>)>,
    solves: u64,
}

impl Default for Engine {
    fn default() -> Self {
        Self::new()
    }
}

impl Engine {
    /// An engine over the built-in library, with nothing solved yet.
    pub fn new() -> Self {
        let base = Library::built_in().map_err(|e| format!("the built-in library: {e}"));
        Self {
            library: base.clone(),
            base,
            library_key: None,
            constants: None,
            report: None,
            effects: Vec::new(),
            cautions: Vec::new(),
            curve: None,
            species: None,
            solves: 0,
        }
    }

    /// The built-in library, before any custom ingredients.
    pub fn base_library(&self) -> Result<&Library, &str> {
        self.base.as_ref().map_err(String::as_str)
    }

    /// The library the project is solved with (built-in plus its custom ingredients).
    pub fn library(&self) -> Result<&Library, &str> {
        self.library.as_ref().map_err(String::as_str)
    }

    /// The report of the current recipe, or why there is none.
    pub fn report(&self) -> Option<&Result<Report, String>> {
        self.report.as_ref().map(|(_, r)| r)
    }

    /// The solved report, if the recipe solved.
    pub fn solved(&self) -> Option<&Report> {
        self.report().and_then(|r| r.as_ref().ok())
    }

    /// What the ingredient of each recipe line does to pH (`None` for an unknown ingredient).
    pub fn effects(&self) -> &[Option<IngredientEffect>] {
        &self.effects
    }

    /// Cautions for the batch and its pH.
    pub fn cautions(&self) -> &[Caution] {
        &self.cautions
    }

    /// The dose curve of the chosen adjuster, or why there is none.
    pub fn curve(&self) -> Option<&Result<CurveData, String>> {
        self.curve.as_ref().map(|(_, c)| c)
    }

    /// The species chart data of the chosen system.
    pub fn species(&self) -> Option<&SpeciesData> {
        self.species.as_ref().and_then(|(_, s)| s.as_ref())
    }

    /// pKw at the project's conditions (14 until something is solved).
    pub fn pkw(&self) -> f64 {
        self.constants.as_ref().map_or(14.0, Constants::pkw)
    }

    /// How many times anything has been recomputed (to check that idle frames solve nothing).
    pub fn solve_count(&self) -> u64 {
        self.solves
    }

    /// Whether the cached results are for this project.
    pub fn is_current(&self, project: &Project) -> bool {
        let key = report_key(project);
        let Some((rk, _)) = &self.report else {
            return false;
        };
        if *rk != key {
            return false;
        }
        let curve_ok = self
            .curve
            .as_ref()
            .is_some_and(|(ck, _)| *ck == curve_key(&key, project));
        let species_ok = self.species.as_ref().is_some_and(|(sk, _)| {
            *sk == SpeciesKey {
                report: key.clone(),
                system: project.settings.species_system.clone(),
            }
        });
        curve_ok && species_ok
    }

    /// Recomputes whatever is stale for this project; returns whether anything was.
    pub fn refresh(&mut self, project: &Project) -> bool {
        let key = report_key(project);
        let mut changed = false;
        if self.library_key.as_ref() != Some(&project.custom) {
            self.library = self.base.clone().and_then(|mut lib| {
                lib.extend(project.custom.clone())
                    .map_err(|e| format!("custom ingredients: {e}"))?;
                Ok(lib)
            });
            self.library_key = Some(project.custom.clone());
            self.constants = None;
            self.report = None;
            changed = true;
        }
        let Ok(library) = self.library.as_ref() else {
            if self.report.is_none() {
                let why = self.library.clone().err().unwrap_or_default();
                self.report = Some((key.clone(), Err(why.clone())));
                self.curve = Some((curve_key(&key, project), Err(why)));
                self.species = Some((
                    SpeciesKey {
                        report: key,
                        system: project.settings.species_system.clone(),
                    },
                    None,
                ));
            }
            return changed;
        };
        if self.report.as_ref().is_none_or(|(k, _)| *k != key) {
            self.solves += 1;
            changed = true;
            let result = match report::check_temperature(key.conditions.temp_c) {
                Err(e) => Err(e.to_string()),
                Ok(()) => {
                    if self
                        .constants
                        .as_ref()
                        .is_none_or(|c| c.conditions != key.conditions)
                    {
                        self.constants = Some(Constants::new(library, key.conditions));
                    }
                    match self.constants.as_ref() {
                        Some(constants) => report::evaluate_with(library, constants, &key.recipe)
                            .map_err(|e| e.to_string()),
                        None => Err("no constants".into()),
                    }
                }
            };
            self.effects.clear();
            self.cautions.clear();
            if let Some(constants) = self.constants.as_ref() {
                self.effects = key
                    .recipe
                    .lines
                    .iter()
                    .map(|l| {
                        library
                            .entry_index(&l.ingredient)
                            .map(|e| explain::explain_ingredient(library, constants, e))
                    })
                    .collect();
            }
            if let Ok(report) = &result {
                self.cautions = hazard::cautions(library, &report.batch, Some(&report.solution));
                // Below pH 4 or above pH 10, the reserve says how strongly the product resists
                // neutralising; it goes before the closing safety-data line.
                let reserve = self.constants.as_ref().and_then(|constants| {
                    reserve::reserve(library, constants, &report.batch, report.solution.ph)
                        .ok()
                        .flatten()
                });
                if let Some(r) = reserve {
                    if self.cautions.is_empty() {
                        self.cautions.push(reserve::caution(&r));
                        self.cautions.push(Caution {
                            title: "Safety data".into(),
                            text: hazard::DEFER.into(),
                        });
                    } else {
                        let at = self.cautions.len() - 1;
                        self.cautions.insert(at, reserve::caution(&r));
                    }
                }
            }
            self.report = Some((key.clone(), result));
        }
        let ck = curve_key(&key, project);
        if self.curve.as_ref().is_none_or(|(k, _)| *k != ck) {
            self.solves += 1;
            changed = true;
            let data = match (self.report(), self.constants.as_ref()) {
                (Some(Ok(report)), Some(constants)) => curve_data(library, constants, report, &ck),
                (Some(Err(e)), _) => Err(e.clone()),
                _ => Err("the recipe has not been solved".into()),
            };
            self.curve = Some((ck, data));
        }
        let sk = SpeciesKey {
            report: key,
            system: project.settings.species_system.clone(),
        };
        if self.species.as_ref().is_none_or(|(k, _)| *k != sk) {
            self.solves += 1;
            changed = true;
            let data = match (self.solved(), self.constants.as_ref()) {
                (Some(report), Some(constants)) => {
                    species_data(library, constants, report, sk.system.as_deref())
                }
                _ => None,
            };
            self.species = Some((sk, data));
        }
        changed
    }
}

fn curve_data(
    library: &Library,
    constants: &Constants,
    report: &Report,
    key: &CurveKey,
) -> Result<CurveData, String> {
    if !(key.dose_max_g.is_finite() && key.dose_max_g > 0.0) {
        return Err(format!("largest dose {} g must be above 0", key.dose_max_g));
    }
    let doser =
        Doser::new(library, constants, &report.batch, &key.adjuster).map_err(|e| e.to_string())?;
    let curve = doser.curve(key.dose_max_g, CURVE_POINTS);
    let to_target = key
        .target_ph
        .map(|t| doser.to_target(t).map_err(|e| e.to_string()));
    let adjuster_name = library
        .entry(&key.adjuster)
        .map_or_else(|| key.adjuster.clone(), |e| e.ingredient.name.clone());
    Ok(CurveData {
        adjuster: curve.adjuster,
        adjuster_name,
        points: curve.points,
        equivalence: curve.equivalence,
        to_target,
    })
}

fn report_key(project: &Project) -> ReportKey {
    ReportKey {
        recipe: project.recipe.clone(),
        conditions: Conditions {
            temp_c: project.settings.temp_c,
            activity: project.settings.activity,
        },
        custom: project.custom.clone(),
    }
}

fn curve_key(report: &ReportKey, project: &Project) -> CurveKey {
    CurveKey {
        report: report.clone(),
        adjuster: project.settings.adjuster.clone(),
        dose_max_g: project.settings.dose_max_g,
        target_ph: project.settings.target_ph,
    }
}

/// The system shown: the chosen one if present in the recipe, else the first present.
fn species_data(
    library: &Library,
    constants: &Constants,
    report: &Report,
    chosen: Option<&str>,
) -> Option<SpeciesData> {
    let present = |id: &str| {
        report.systems.iter().find(|s| {
            library
                .systems()
                .get(s.system)
                .is_some_and(|sys| sys.id == id)
        })
    };
    let state = chosen
        .and_then(present)
        .or_else(|| report.systems.first())?;
    let system = library.systems().get(state.system)?;
    let ionic_strength = report.solution.ionic_strength;
    let steps = (14.0 / SPECIES_PH_STEP).round() as usize;
    let table = solver::fractions_against_ph(
        constants,
        state.system,
        ionic_strength,
        (0..=steps).map(|i| i as f64 * SPECIES_PH_STEP),
    );
    let forms = form_names(system);
    let curves = (0..forms.len())
        .map(|j| {
            table
                .iter()
                .map(|(ph, f)| [*ph, f.get(j).copied().unwrap_or(0.0)])
                .collect()
        })
        .collect();
    Some(SpeciesData {
        system: state.system,
        system_id: system.id.clone(),
        system_name: system.name.clone(),
        forms,
        curves,
        ionic_strength,
        fractions_now: state.fractions.clone(),
        molalities: (0..state.fractions.len())
            .map(|j| state.molality(j))
            .collect(),
        dominant: state.dominant_form(),
    })
}
