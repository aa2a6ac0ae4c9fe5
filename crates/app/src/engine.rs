//! Solved results cached on their inputs: a frame whose inputs did not change solves nothing.
//!
//! The results form a chain — library → constants → report (with the effect of each line) →
//! cautions, dose curve and species chart — and each stage is kept with the inputs it was made
//! from. When a stage is made again, everything that depends on it is dropped and made again
//! from it.

use std::cell::Cell;
use std::collections::BTreeMap;

use egui_plot::PlotPoint;
use saltwise_chem::library::LibraryData;
use saltwise_chem::project::{Project, Settings};
use saltwise_chem::report::{self, Report};
use saltwise_chem::solver::{Conditions, Constants};
use saltwise_chem::{Amount, Library, Recipe, Unit};
use saltwise_export::SpeciesChart;

use saltwise_chem::curve::Doser;
pub use saltwise_chem::curve::{CurvePoint, DoseResult, EquivalencePoint};
use saltwise_chem::design::{self, Design};
use saltwise_chem::distribution::{self, MetalDistribution};
use saltwise_chem::drift::{self, Drift};
use saltwise_chem::explain::{self, IngredientEffect};
use saltwise_chem::hazard::{self, Caution};
use saltwise_chem::precipitation::{self, Precipitation};
use saltwise_chem::qc::{self, Prediction, TitrantKind};
use saltwise_chem::sweep;
use saltwise_chem::variant::{self, Summary, Variant};

use crate::band_job::{self, BandJob, BandKey, BandState};

/// Points on the dose curve.
const CURVE_POINTS: usize = 161;
/// Points on the predicted QC titration curve.
const QC_POINTS: usize = 81;

/// The dose curve of one adjuster on the current recipe.
#[derive(Debug, Clone, PartialEq)]
pub struct CurveData {
    /// Adjuster ingredient id.
    pub adjuster: String,
    /// Adjuster display name.
    pub adjuster_name: String,
    /// The points, from no dose to the largest.
    pub points: Vec<CurvePoint>,
    /// (dose g, pH) of every point, for the chart.
    pub ph_points: Vec<PlotPoint>,
    /// (dose g, buffer capacity) of every point, for the chart.
    pub buffer_points: Vec<PlotPoint>,
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
    pub curves: Vec<Vec<PlotPoint>>,
    /// Ionic strength the fractions are computed at, mol/kg.
    pub ionic_strength: f64,
    /// Fraction of each form at the recipe's pH.
    pub fractions_now: Vec<f64>,
    /// Molality of each form at the recipe's pH, mol/kg.
    pub molalities: Vec<f64>,
    /// Index of the form with the largest fraction at the recipe's pH.
    pub dominant: usize,
    /// Index of the active form: the one chosen for this system, else the uncharged one, else
    /// the fully protonated one.
    pub active: usize,
}

/// Largest in-use dilution charted (1:1000).
pub const DILUTION_MAX: f64 = 1000.0;
/// Points on the dilution chart.
const DILUTION_POINTS: usize = 61;
/// Temperatures charted, °C.
pub const SWEEP_TEMP_C: (f64, f64) = (0.0, 80.0);
/// Points on the temperature chart (every degree).
const TEMPERATURE_POINTS: usize = 81;

/// pH of the product against in-use dilution (x = log10 of the dilution) and temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct Sweeps {
    /// (log10 dilution, pH), dilution from 1 to [`DILUTION_MAX`] with pure water.
    pub dilution: Vec<PlotPoint>,
    /// (temperature °C, pH) over [`SWEEP_TEMP_C`].
    pub temperature: Vec<PlotPoint>,
}

/// One variant's row of the comparison, with its dose curve for the overlay.
#[derive(Debug, Clone, PartialEq)]
pub struct VariantRow {
    /// The variant's figures, or why it could not be solved.
    pub summary: Result<Summary, String>,
    /// (dose g, pH) of the project's adjuster on this variant, or why there is none.
    pub curve: Result<Vec<PlotPoint>, String>,
}

/// The QC titration of the project's method, predicted for the current recipe.
#[derive(Debug, Clone, PartialEq)]
pub struct QcData {
    /// Library id of the titrant (the method's, or the automatic choice).
    pub titrant: String,
    /// Whether the titrant is an acid or a base.
    pub kind: TitrantKind,
    /// Its normality, mol/L.
    pub normality: f64,
    /// End points, curve and titration factor.
    pub prediction: Prediction,
}

/// The solved recipe and what follows directly from it.
#[derive(Debug, Clone, PartialEq)]
struct Solved {
    result: Result<Report, String>,
    /// pH against in-use dilution and against temperature.
    sweeps: Option<Result<Sweeps, String>>,
    effects: Vec<Option<IngredientEffect>>,
    /// How the pH moves when acid, base or air gets in, or why it cannot be said.
    drift: Option<Result<Drift, String>>,
}

/// What the dose curve is made from, beyond the report.
#[derive(Debug, Clone, PartialEq)]
struct CurveKey {
    adjuster: String,
    dose_max_g: f64,
    target_ph: Option<f64>,
}

impl CurveKey {
    fn of(settings: &Settings) -> Self {
        Self {
            adjuster: settings.adjuster.clone(),
            dose_max_g: settings.dose_max_g,
            target_ph: settings.target_ph,
        }
    }
}

/// What the species chart is made from, beyond the report: the chosen system or metal, the
/// active forms, and whether solids settle out.
type SpeciesKey = (Option<String>, BTreeMap<String, usize>, bool);

fn species_key(settings: &Settings) -> SpeciesKey {
    (
        settings.species_system.clone(),
        settings.active_forms.clone(),
        settings.precipitate,
    )
}

/// The solved state of the open project, recomputed only when its inputs change.
#[derive(Debug)]
pub struct Engine {
    base: Result<Library, String>,
    library: Option<(LibraryData, Result<Library, String>)>,
    constants: Option<(Conditions, Result<Constants, String>)>,
    solved: Option<(Recipe, Solved)>,
    cautions: Option<(String, Vec<Caution>)>,
    curve: Option<(CurveKey, Result<CurveData, String>)>,
    species: Option<(SpeciesKey, Option<SpeciesData>)>,
    /// The chosen metal's distribution against pH, when a metal is chosen on the species chart.
    metal: Option<MetalDistribution>,
    /// The pH band under the project's tolerances, when any are set.
    band: Option<BandJob>,
    /// Each variant with the curve settings its row was made for; emptied with the constants.
    variants: Vec<(Variant, CurveKey, VariantRow)>,
    /// The state with supersaturated solids settled out, when the project asks for it.
    settled: Option<(bool, Option<Precipitation>)>,
    /// The QC titration, made only while a panel asks for it.
    qc: Option<(qc::Method, Result<QcData, String>)>,
    /// Whether a panel asked for the QC titration since the last refresh.
    qc_wanted: Cell<bool>,
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
        Self {
            base: Library::built_in().map_err(|e| format!("the built-in library: {e}")),
            library: None,
            constants: None,
            solved: None,
            cautions: None,
            curve: None,
            species: None,
            metal: None,
            band: None,
            variants: Vec::new(),
            settled: None,
            qc: None,
            qc_wanted: Cell::new(false),
            solves: 0,
        }
    }

    /// Puts the user's saved entries into the base library (built-in plus the user library);
    /// everything is solved again. On an error the base library is left as it was.
    pub fn set_user_library(
        &mut self,
        user: &saltwise_chem::user_library::UserLibrary,
    ) -> Result<(), String> {
        let built_in = Library::built_in().map_err(|e| format!("the built-in library: {e}"))?;
        let base = user
            .extend(&built_in)
            .map_err(|e| format!("the user library: {e}"))?;
        self.base = Ok(base);
        self.library = None;
        self.constants = None;
        self.solved = None;
        Ok(())
    }

    /// The built-in library, before any custom ingredients.
    pub fn base_library(&self) -> Result<&Library, &str> {
        self.base.as_ref().map_err(String::as_str)
    }

    /// The library the project is solved with (built-in plus its custom ingredients).
    pub fn library(&self) -> Result<&Library, &str> {
        match &self.library {
            Some((_, lib)) => lib.as_ref().map_err(String::as_str),
            None => self.base_library(),
        }
    }

    /// The report of the current recipe, or why there is none.
    pub fn report(&self) -> Option<&Result<Report, String>> {
        self.solved.as_ref().map(|(_, s)| &s.result)
    }

    /// The solved report, if the recipe solved.
    pub fn solved(&self) -> Option<&Report> {
        self.report().and_then(|r| r.as_ref().ok())
    }

    /// What the ingredient of each recipe line does to pH (`None` for an unknown ingredient).
    pub fn effects(&self) -> &[Option<IngredientEffect>] {
        self.solved.as_ref().map_or(&[], |(_, s)| &s.effects)
    }

    /// pH against in-use dilution and against temperature, for the charts.
    pub fn sweeps(&self) -> Option<&Result<Sweeps, String>> {
        self.solved.as_ref().and_then(|(_, s)| s.sweeps.as_ref())
    }

    /// The pH change when 1 mmol/kg of acid or base gets in, and the pH open to air.
    pub fn drift(&self) -> Option<&Result<Drift, String>> {
        self.solved.as_ref().and_then(|(_, s)| s.drift.as_ref())
    }

    /// Cautions for the batch, its pH and the chosen adjuster, the safety-data line last.
    pub fn cautions(&self) -> &[Caution] {
        self.cautions.as_ref().map_or(&[], |(_, c)| c)
    }

    /// The dose curve of the chosen adjuster, or why there is none.
    pub fn curve(&self) -> Option<&Result<CurveData, String>> {
        self.curve.as_ref().map(|(_, c)| c)
    }

    /// The species chart data of the chosen system.
    pub fn species(&self) -> Option<&SpeciesData> {
        self.species.as_ref().and_then(|(_, s)| s.as_ref())
    }

    /// The recipe with supersaturated solids settled out, when the project asks for it.
    pub fn settled(&self) -> Option<&Precipitation> {
        self.settled.as_ref().and_then(|(_, p)| p.as_ref())
    }

    /// The QC titration of the project's method, or why there is none; `None` until the next
    /// refresh has made it (asking is what makes the refreshes keep it up to date).
    pub fn qc(&self) -> Option<&Result<QcData, String>> {
        self.qc_wanted.set(true);
        self.qc.as_ref().map(|(_, q)| q)
    }

    /// The distribution against pH of the metal chosen on the species chart, if one is.
    pub fn metal(&self) -> Option<&MetalDistribution> {
        self.metal.as_ref()
    }

    /// The pH band under the project's tolerances: `None` when none are set.
    pub fn band(&self) -> Option<&BandState> {
        self.band.as_ref().map(|b| &b.state)
    }

    /// Whether work is still going on over several frames (the pH band being drawn).
    pub fn is_busy(&self) -> bool {
        self.band.as_ref().is_some_and(BandJob::is_drawing)
    }

    /// One row per variant of the project, in its order, for the comparison.
    pub fn variant_rows(&self) -> impl Iterator<Item = &VariantRow> {
        self.variants.iter().map(|(_, _, row)| row)
    }

    /// pKw at the project's conditions (14 until something is solved).
    pub fn pkw(&self) -> f64 {
        self.constants().map_or(14.0, Constants::pkw)
    }

    /// How many times anything has been recomputed (to check that idle frames solve nothing).
    pub fn solve_count(&self) -> u64 {
        self.solves
    }

    /// The constants at the project's conditions, once set up.
    pub fn constants(&self) -> Option<&Constants> {
        self.constants.as_ref().and_then(|(_, c)| c.as_ref().ok())
    }

    /// Whether the cached results are for this project.
    pub fn is_current(&self, project: &Project) -> bool {
        let s = &project.settings;
        self.library
            .as_ref()
            .is_some_and(|(k, _)| *k == project.custom)
            && self
                .constants
                .as_ref()
                .is_some_and(|(k, _)| *k == conditions(s))
            && self
                .solved
                .as_ref()
                .is_some_and(|(k, _)| k == project.recipe())
            && self
                .cautions
                .as_ref()
                .is_some_and(|(k, _)| *k == s.adjuster)
            && self
                .curve
                .as_ref()
                .is_some_and(|(k, _)| *k == CurveKey::of(s))
            && self
                .species
                .as_ref()
                .is_some_and(|(k, _)| *k == species_key(s))
            && self.band_current(project)
            && self.variants_current(project)
            && self
                .settled
                .as_ref()
                .is_some_and(|(k, _)| *k == s.precipitate)
            && (!self.qc_wanted.get()
                || self
                    .qc
                    .as_ref()
                    .is_some_and(|(k, _)| *k == project.settings.qc))
    }

    /// Whether the band (or its absence) is for the recipe and tolerances as they are now.
    fn band_current(&self, project: &Project) -> bool {
        let s = &project.settings;
        match &self.band {
            None => !band_job::any_set(&s.tolerances),
            Some(b) => b.key == BandKey::of(project.recipe(), s),
        }
    }

    /// Whether there is a row for every variant, made from it as it is now.
    fn variants_current(&self, project: &Project) -> bool {
        let key = CurveKey::of(&project.settings);
        self.variants.len() == project.variants().len()
            && self
                .variants
                .iter()
                .zip(project.variants())
                .all(|((v, k, _), p)| v == p && *k == key)
    }

    /// Recomputes whatever is stale for this project; returns whether anything was.
    pub fn refresh(&mut self, project: &Project) -> bool {
        let before = self.solves;
        let s = &project.settings;
        if self
            .library
            .as_ref()
            .is_none_or(|(k, _)| *k != project.custom)
        {
            let library = self.base.clone().and_then(|mut lib| {
                lib.extend(project.custom.clone())
                    .map_err(|e| format!("custom ingredients: {e}"))?;
                Ok(lib)
            });
            self.library = Some((project.custom.clone(), library));
            self.constants = None;
        }
        let Some((_, Ok(library))) = &self.library else {
            return self.refresh_without_library(project, before);
        };
        let conditions = conditions(s);
        if self
            .constants
            .as_ref()
            .is_none_or(|(k, _)| *k != conditions)
        {
            let constants = report::check_temperature(conditions.temp_c)
                .map(|()| Constants::new(library, conditions))
                .map_err(|e| e.to_string());
            self.constants = Some((conditions, constants));
            self.solved = None;
            self.band = None;
            self.variants.clear();
        }
        let Some((_, constants)) = &self.constants else {
            return self.solves != before;
        };
        if self
            .solved
            .as_ref()
            .is_none_or(|(k, _)| k != project.recipe())
        {
            self.solves += 1;
            let solved = match constants {
                Ok(constants) => {
                    let result = report::evaluate_with(library, constants, project.recipe())
                        .map_err(|e| e.to_string());
                    let drift = result.as_ref().ok().map(|r| {
                        drift::drift(library, constants, &r.batch, &r.composition, &r.solution)
                            .map_err(|e| e.to_string())
                    });
                    let sweeps = result.as_ref().ok().map(|r| sweeps(library, constants, r));
                    Solved {
                        result,
                        sweeps,
                        effects: effects(library, constants, project.recipe()),
                        drift,
                    }
                }
                Err(e) => Solved {
                    result: Err(e.clone()),
                    sweeps: None,
                    effects: Vec::new(),
                    drift: None,
                },
            };
            self.solved = Some((project.recipe().clone(), solved));
            self.cautions = None;
            self.curve = None;
            self.species = None;
            self.settled = None;
            self.qc = None;
        }
        let report = self.solved.as_ref().map(|(_, s)| &s.result);
        let constants = constants.as_ref().ok();
        if self.cautions.as_ref().is_none_or(|(k, _)| *k != s.adjuster) {
            let list = match (report, constants) {
                (Some(Ok(report)), Some(constants)) => {
                    cautions(library, constants, report, &s.adjuster)
                }
                _ => Vec::new(),
            };
            self.cautions = Some((s.adjuster.clone(), list));
        }
        let curve_key = CurveKey::of(s);
        if self.curve.as_ref().is_none_or(|(k, _)| *k != curve_key) {
            self.solves += 1;
            let data = match (report, constants) {
                (Some(Ok(report)), Some(constants)) => {
                    curve_data(library, constants, report, &curve_key)
                }
                (Some(Err(e)), _) => Err(e.clone()),
                _ => Err("the recipe has not been solved".into()),
            };
            self.curve = Some((curve_key, data));
        }
        let key = species_key(s);
        if self.species.as_ref().is_none_or(|(k, _)| *k != key) {
            self.solves += 1;
            let (data, metal) = match (report, constants) {
                (Some(Ok(report)), Some(constants)) => (
                    species_data(library, constants, report, s),
                    metal_data(library, constants, report, s),
                ),
                _ => (None, None),
            };
            self.species = Some((key, data));
            self.metal = metal;
        }
        if !band_job::any_set(&s.tolerances) {
            self.band = None;
        } else {
            let key = BandKey::of(project.recipe(), s);
            if self.band.as_ref().is_none_or(|b| b.key != key) {
                self.solves += 1;
                self.band = Some(match constants {
                    Some(_) => BandJob::start(key),
                    None => BandJob::failed(key, "the conditions could not be set up"),
                });
            }
            if let (Some(job), Some(constants)) = (&mut self.band, constants) {
                job.advance(library, constants);
            }
        }
        if self
            .settled
            .as_ref()
            .is_none_or(|(k, _)| *k != s.precipitate)
        {
            let settled = match (report, constants) {
                (Some(Ok(r)), Some(constants)) if s.precipitate => {
                    self.solves += 1;
                    Some(precipitation::precipitate(
                        library,
                        constants,
                        &r.composition,
                        &r.solution,
                    ))
                }
                _ => None,
            };
            self.settled = Some((s.precipitate, settled));
        }
        if self.qc_wanted.replace(false) && self.qc.as_ref().is_none_or(|(k, _)| *k != s.qc) {
            self.solves += 1;
            let data = match (report, constants) {
                (Some(Ok(report)), Some(constants)) => qc_data(library, constants, report, &s.qc),
                (Some(Err(e)), _) => Err(e.clone()),
                _ => Err("the recipe has not been solved".into()),
            };
            self.qc = Some((s.qc.clone(), data));
        }
        self.refresh_variants(project);
        self.solves != before
    }

    /// Solves the variants that changed since their rows were made; keeps the others.
    fn refresh_variants(&mut self, project: &Project) {
        if self.variants_current(project) {
            return;
        }
        let key = CurveKey::of(&project.settings);
        let (Some((_, Ok(library))), Some((_, constants))) = (&self.library, &self.constants)
        else {
            return;
        };
        let mut old = std::mem::take(&mut self.variants);
        for v in project.variants() {
            let kept = old.iter().position(|(ov, ok, _)| ov == v && *ok == key);
            let row = match kept {
                Some(i) => old.swap_remove(i).2,
                None => {
                    self.solves += 1;
                    match constants {
                        Ok(c) => variant_row(library, c, v, &key),
                        Err(e) => VariantRow {
                            summary: Err(e.clone()),
                            curve: Err(e.clone()),
                        },
                    }
                }
            };
            self.variants.push((v.clone(), key.clone(), row));
        }
    }

    /// Every result says why when the library itself could not be built.
    fn refresh_without_library(&mut self, project: &Project, before: u64) -> bool {
        if self
            .solved
            .as_ref()
            .is_some_and(|(k, _)| k == project.recipe())
        {
            return self.solves != before;
        }
        let why = self
            .library
            .as_ref()
            .and_then(|(_, l)| l.as_ref().err().cloned())
            .unwrap_or_default();
        self.solves += 1;
        let s = &project.settings;
        self.constants = Some((conditions(s), Err(why.clone())));
        self.solved = Some((
            project.recipe().clone(),
            Solved {
                result: Err(why.clone()),
                sweeps: None,
                effects: Vec::new(),
                drift: None,
            },
        ));
        self.cautions = Some((s.adjuster.clone(), Vec::new()));
        self.curve = Some((CurveKey::of(s), Err(why.clone())));
        self.species = Some((species_key(s), None));
        self.metal = None;
        self.settled = Some((s.precipitate, None));
        self.qc = Some((s.qc.clone(), Err(why.clone())));
        self.band = band_job::any_set(&s.tolerances)
            .then(|| BandJob::failed(BandKey::of(project.recipe(), s), &why));
        self.variants = project
            .variants()
            .iter()
            .map(|v| {
                let row = VariantRow {
                    summary: Err(why.clone()),
                    curve: Err(why.clone()),
                };
                (v.clone(), CurveKey::of(s), row)
            })
            .collect();
        true
    }

    /// The grams of `acid` and `base` that give `target_ph` and `capacity` in `recipe` with its
    /// lines of the two left out, or why not.
    pub fn design_buffer(
        &self,
        recipe: &Recipe,
        acid: &str,
        base: &str,
        target_ph: f64,
        capacity: f64,
    ) -> Result<Design, String> {
        let library = self.library().map_err(str::to_owned)?;
        let constants = self
            .constants()
            .ok_or("the conditions could not be set up")?;
        let rest = Recipe {
            lines: recipe
                .lines
                .iter()
                .filter(|l| l.ingredient != acid && l.ingredient != base)
                .cloned()
                .collect(),
            ..recipe.clone()
        };
        design::design(library, constants, &rest, acid, base, target_ph, capacity)
            .map_err(|e| e.to_string())
    }

    /// The amount of line `line` given in `unit`, for the same mass where it can be known.
    pub fn amount_in(&self, project: &Project, line: usize, unit: Unit) -> Option<Amount> {
        let l = project.recipe().lines.get(line)?;
        let entry = self.library().ok()?.entry(&l.ingredient)?;
        let batch_g = self.solved().map(|r| r.batch.total_mass_g);
        let value = saltwise_chem::amount::convert(
            l.amount,
            unit,
            entry.molar_mass_g_per_mol,
            entry.ingredient.assay,
            batch_g,
        )?;
        value.is_finite().then_some(Amount { value, unit })
    }
}

fn conditions(settings: &Settings) -> Conditions {
    Conditions {
        temp_c: settings.temp_c,
        activity: settings.activity,
    }
}

fn effects(
    library: &Library,
    constants: &Constants,
    recipe: &Recipe,
) -> Vec<Option<IngredientEffect>> {
    recipe
        .lines
        .iter()
        .map(|l| {
            library
                .entry_index(&l.ingredient)
                .map(|e| explain::explain_ingredient(library, constants, e))
        })
        .collect()
}

/// One variant solved once at the project's conditions: its row and its dose curve.
fn variant_row(
    library: &Library,
    constants: &Constants,
    v: &Variant,
    key: &CurveKey,
) -> VariantRow {
    let report = match report::evaluate_with(library, constants, &v.recipe) {
        Ok(r) => r,
        Err(e) => {
            return VariantRow {
                summary: Err(e.to_string()),
                curve: Err(e.to_string()),
            };
        }
    };
    let summary = Ok(variant::summary_of(
        library,
        constants,
        v,
        &report,
        Some(&key.adjuster),
    ));
    let curve = curve_data(
        library,
        constants,
        &report,
        &CurveKey {
            target_ph: None,
            ..key.clone()
        },
    )
    .map(|c| c.ph_points);
    VariantRow { summary, curve }
}

fn sweeps(library: &Library, constants: &Constants, report: &Report) -> Result<Sweeps, String> {
    let dilution = sweep::dilution_sweep(
        library,
        constants,
        &report.batch,
        1.0,
        DILUTION_MAX,
        DILUTION_POINTS,
    )
    .map_err(|e| e.to_string())?;
    let temperature = sweep::temperature_sweep(
        library,
        constants.conditions,
        &report.batch,
        SWEEP_TEMP_C.0,
        SWEEP_TEMP_C.1,
        TEMPERATURE_POINTS,
    )
    .map_err(|e| e.to_string())?;
    Ok(Sweeps {
        dilution: dilution
            .iter()
            .map(|p| PlotPoint::new(p.x.log10(), p.ph))
            .collect(),
        temperature: temperature
            .iter()
            .map(|p| PlotPoint::new(p.x, p.ph))
            .collect(),
    })
}

/// The whole caution list, assembled by the core as for every front end.
fn cautions(
    library: &Library,
    constants: &Constants,
    report: &Report,
    adjuster: &str,
) -> Vec<Caution> {
    hazard::assemble(
        library,
        constants,
        &report.batch,
        Some(&report.solution),
        Some(adjuster),
    )
    .items
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
    let adjuster_name = library
        .entry(&key.adjuster)
        .map_or_else(|| key.adjuster.clone(), |e| e.ingredient.name.clone());
    let doser =
        Doser::new(library, constants, &report.batch, &key.adjuster).map_err(|e| e.to_string())?;
    let curve = doser.curve(key.dose_max_g, CURVE_POINTS);
    let to_target = key.target_ph.map(|t| {
        doser
            .to_target(t)
            .map_err(|e| e.to_string().replace(&key.adjuster, &adjuster_name))
    });
    Ok(CurveData {
        ph_points: curve
            .points
            .iter()
            .map(|p| PlotPoint::new(p.dose_g, p.ph))
            .collect(),
        buffer_points: curve
            .points
            .iter()
            .map(|p| PlotPoint::new(p.dose_g, p.buffer_capacity))
            .collect(),
        adjuster: curve.adjuster,
        adjuster_name,
        points: curve.points,
        equivalence: curve.equivalence,
        to_target,
    })
}

/// The system shown: the chosen one if present in the recipe, else the first present.
fn qc_data(
    library: &Library,
    constants: &Constants,
    report: &Report,
    method: &qc::Method,
) -> Result<QcData, String> {
    let (titrant, prediction) = method
        .predict(
            library,
            constants,
            &report.batch,
            report.solution.ph,
            QC_POINTS,
        )
        .map_err(|e| e.to_string())?;
    Ok(QcData {
        titrant: titrant.id().to_owned(),
        kind: titrant.kind(),
        normality: titrant.normality(),
        prediction,
    })
}

/// pH step of the metal distribution chart.
const METAL_PH_STEP: f64 = 0.1;

fn metal_data(
    library: &Library,
    constants: &Constants,
    report: &Report,
    settings: &Settings,
) -> Option<MetalDistribution> {
    let chosen = settings.species_system.as_deref()?;
    if !distribution::bound_metals(library, &report.composition)
        .iter()
        .any(|m| m == chosen)
    {
        return None;
    }
    let steps = (14.0 / METAL_PH_STEP).round() as usize;
    distribution::metal_distribution(
        library,
        constants,
        &report.composition,
        &report.solution,
        chosen,
        (0..=steps).map(|i| i as f64 * METAL_PH_STEP),
        settings.precipitate,
    )
}

fn species_data(
    library: &Library,
    constants: &Constants,
    report: &Report,
    settings: &Settings,
) -> Option<SpeciesData> {
    let state = report.shown_system(library, settings.species_system.as_deref())?;
    let system = library.systems().get(state.system)?;
    let chart = SpeciesChart::compute(library, constants, report, Some(&system.id))?;
    let curves = chart
        .fractions
        .iter()
        .map(|f| {
            chart
                .ph
                .iter()
                .zip(f)
                .map(|(&ph, &x)| PlotPoint::new(ph, x))
                .collect()
        })
        .collect();
    let (forms, ionic_strength) = (chart.forms, chart.ionic_strength);
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
        active: settings
            .active_forms
            .get(&system.id)
            .copied()
            .filter(|&f| f < state.fractions.len())
            .unwrap_or_else(|| drift::default_active_form(state)),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn variant_rows_follow_the_variants_and_only_a_changed_one_is_solved_again() {
        let mut project = Project::demo();
        project.copy_current();
        project.recipe_mut().lines[1].amount.value = 2.0;
        let mut engine = Engine::new();
        engine.refresh(&project);
        let ph = |e: &Engine| -> Vec<f64> {
            e.variant_rows()
                .map(|r| r.summary.as_ref().map_or(f64::NAN, |s| s.ph))
                .collect()
        };
        let first = ph(&engine);
        assert_eq!(first.len(), 2);
        // More sodium lactate in the copy: a higher pH (the lactate buffer's salt form).
        assert!(first[1] > first[0], "{first:?}");
        // The current variant's row is the same solve as the readout.
        let readout = engine.solved().map(|r| r.solution.ph);
        assert_eq!(readout, Some(first[1]));
        assert!(
            engine
                .variant_rows()
                .all(|r| r.curve.as_ref().is_ok_and(|c| !c.is_empty()))
        );
        // Editing the current variant solves again that one row (and the readout), not the other.
        let before = engine.solve_count();
        project.recipe_mut().lines[1].amount.value = 1.5;
        engine.refresh(&project);
        assert!(engine.is_current(&project));
        let after = ph(&engine);
        assert_eq!(after[0], first[0]);
        assert!(after[1] < first[1]);
        // The readout, the dose curve, the species chart and the one changed variant.
        assert_eq!(engine.solve_count() - before, 4);
    }
}
