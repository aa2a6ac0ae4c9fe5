//! The batch sheet's contents: one variant of a project scaled to a batch size, its predicted
//! pH and band, the dose to target, the QC titrations, the charts and the cautions — every number
//! computed by chem here, so the HTML ([`crate::html`]) only lays them out.

use saltwise_chem::curve::Doser;
use saltwise_chem::hazard::{self, Caution};
use saltwise_chem::limits;
use saltwise_chem::project::Project;
use saltwise_chem::qc::{self, EndPoint, Prediction, Request, Titrant, TitrantKind};
use saltwise_chem::recipe::Batch;
use saltwise_chem::report::evaluate_with;
use saltwise_chem::text::formula_display;
use saltwise_chem::tolerance::{self, Band, Tolerances};
use saltwise_chem::{Conditions, Constants, Library};

use crate::ExportError;
use crate::chart::{DoseChart, SpeciesChart, TargetBand, TitrationChart};

/// The unit the batch is weighed in on the sheet.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum MassUnit {
    /// Grams.
    Gram,
    /// Kilograms.
    Kilogram,
}

impl MassUnit {
    /// `g` or `kg`.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::Gram => "g",
            Self::Kilogram => "kg",
        }
    }

    /// Grams in one of this unit.
    pub fn grams(self) -> f64 {
        match self {
            Self::Gram => 1.0,
            Self::Kilogram => 1000.0,
        }
    }
}

/// The batch size the sheet is scaled to, and the unit its masses are shown in.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BatchSize {
    /// Mass of the whole batch, g.
    pub mass_g: f64,
    /// The unit masses are shown in.
    pub unit: MassUnit,
}

impl BatchSize {
    /// A batch of `mass_g` grams, shown in grams.
    pub fn grams(mass_g: f64) -> Self {
        Self {
            mass_g,
            unit: MassUnit::Gram,
        }
    }

    /// A batch of `mass_kg` kilograms, shown in kilograms.
    pub fn kilograms(mass_kg: f64) -> Self {
        Self {
            mass_g: mass_kg * 1000.0,
            unit: MassUnit::Kilogram,
        }
    }

    /// A mass in grams as shown on the sheet, with its unit (`187.5 kg`).
    pub fn show(&self, mass_g: f64) -> String {
        format!(
            "{} {}",
            sig(mass_g / self.unit.grams(), 4),
            self.unit.symbol()
        )
    }
}

/// Points on the sheet's titration curve.
pub const QC_POINTS: usize = 121;

/// The QC titration the sheet predicts.
#[derive(Debug, Clone, PartialEq)]
pub struct QcPlan {
    /// The titrant: library id, formula or id without grade (`hcl`, `naoh`); empty takes the
    /// project method's choice for the product's pH ([`qc::Method::titrant_id`]).
    pub titrant: String,
    /// Its normality, mol/L.
    pub normality: f64,
    /// Sample of product, g.
    pub sample_g: f64,
    /// End points, pH; empty means the titrant's defaults (8.3 and 4.3 for an acid, 8.3 for a base).
    pub end_points_ph: Vec<f64>,
}

impl QcPlan {
    /// The plan of a project's QC method for a product at `ph` (the method's own titrant, or
    /// its automatic choice: HCl at pH 7 or above, NaOH below).
    pub fn from_method(method: &qc::Method, ph: f64) -> Self {
        Self {
            titrant: method.titrant_id(ph).to_owned(),
            normality: method.normality,
            sample_g: method.sample_g,
            end_points_ph: method.end_points_ph.clone(),
        }
    }
}

/// What to put on a batch sheet.
#[derive(Debug, Clone)]
pub struct SheetRequest<'a> {
    /// The project (its settings: temperature, activity model, adjuster, target, tolerances).
    pub project: &'a Project,
    /// The library the project's recipe resolves in (custom ingredients included).
    pub library: &'a Library,
    /// Index of the variant.
    pub variant: usize,
    /// The batch size; `None` keeps the recipe's own batch, in grams.
    pub batch: Option<BatchSize>,
    /// The date printed on the sheet, as the caller writes it.
    pub date: String,
    /// The QC titration; `None` takes the project's method ([`QcPlan::from_method`]).
    pub qc: Option<QcPlan>,
}

/// One line to weigh, in the order of addition.
#[derive(Debug, Clone, PartialEq)]
pub struct WeighLine {
    /// Step number, from 1.
    pub step: usize,
    /// Display name of the ingredient.
    pub name: String,
    /// Library id.
    pub id: String,
    /// Mass to weigh for this batch, g (as supplied).
    pub mass_g: f64,
    /// Share of the batch, % w/w.
    pub percent: f64,
    /// The amount as the recipe gives it (`6g`, `2.5%`), for reference.
    pub as_written: String,
}

/// What to do to bring the batch to its target pH.
#[derive(Debug, Clone, PartialEq)]
pub enum DoseInstruction {
    /// The project sets no target pH.
    NoTarget,
    /// Add this much of the adjuster.
    Add {
        /// Display name of the adjuster.
        adjuster_name: String,
        /// Adjuster id.
        adjuster: String,
        /// Mass to add to this batch, g (on top of the batch as weighed).
        amount_g: f64,
        /// The dose as a percentage of the batch as weighed.
        percent_of_batch: f64,
        /// The pH it brings the batch to.
        ph_reached: f64,
    },
    /// The adjuster cannot reach the target; why.
    Unreachable(String),
}

/// One QC titration predicted (or why it could not be).
#[derive(Debug, Clone, PartialEq)]
pub struct QcResult {
    /// What it is of: `as weighed` or `after the pH adjustment`.
    pub of: &'static str,
    /// The prediction, or the reason there is none.
    pub prediction: Result<Prediction, String>,
}

/// The QC section: the plan and its predictions.
#[derive(Debug, Clone, PartialEq)]
pub struct QcSection {
    /// The plan as carried out.
    pub plan: QcPlan,
    /// The titrant as shown (`0.1 N HCl`), or as given when not found.
    pub titrant_label: String,
    /// Strong acid or base, when the titrant was found.
    pub kind: Option<TitrantKind>,
    /// The product as weighed, then (when a dose applies) after the pH adjustment.
    pub results: Vec<QcResult>,
}

/// Everything a batch sheet shows.
#[derive(Debug, Clone, PartialEq)]
pub struct BatchSheet {
    /// Project name.
    pub project_name: String,
    /// Variant name.
    pub variant_name: String,
    /// The date, as the caller gave it.
    pub date: String,
    /// The batch size.
    pub batch: BatchSize,
    /// The recipe's own batch mass, g.
    pub recipe_batch_g: f64,
    /// Temperature solved at, °C.
    pub temp_c: f64,
    /// The activity model used.
    pub activity: String,
    /// The lines to weigh, in order (lines switched off are left out).
    pub lines: Vec<WeighLine>,
    /// Names of lines switched off in the recipe.
    pub left_out: Vec<String>,
    /// Water to add last, q.s. to the batch mass, g (when the recipe fills with water).
    pub qs_water_g: Option<f64>,
    /// Predicted pH of the batch as weighed.
    pub ph: f64,
    /// The pH band under the project's tolerances, when any are set.
    pub band: Option<Band>,
    /// Why the band could not be computed, when tolerances are set but failed.
    pub band_problem: Option<String>,
    /// The target band, when set.
    pub target: Option<TargetBand>,
    /// The pH adjustment.
    pub dose: DoseInstruction,
    /// The QC titrations.
    pub qc: QcSection,
    /// The dose curve of the adjuster on this batch, or why there is none.
    pub dose_chart: Result<DoseChart, String>,
    /// The species chart (none without an acid–base system).
    pub species_chart: Option<SpeciesChart>,
    /// The titration chart of the last QC prediction made.
    pub titration_chart: Option<TitrationChart>,
    /// Every caution, the deferral to safety data sheets and local rules last.
    pub cautions: Vec<Caution>,
    /// Validity warnings of the model.
    pub warnings: Vec<String>,
}

/// Whether a project sets any weighing tolerance or assay range (the window's rule).
pub fn tolerances_set(t: &Tolerances) -> bool {
    t.all_percent > 0.0 || t.per_ingredient.iter().any(|(_, p)| *p > 0.0) || !t.assay.is_empty()
}

/// A number to `figures` significant figures in plain notation (`187.5`, `0.3125`, `5000`).
pub fn sig(x: f64, figures: usize) -> String {
    if !x.is_finite() {
        return x.to_string();
    }
    if x == 0.0 {
        return "0".into();
    }
    let magnitude = x.abs().log10().floor() as i64;
    let decimals = (figures as i64 - 1 - magnitude).clamp(0, 12) as usize;
    format!("{x:.decimals$}")
}

/// A number to `figures` significant figures with trailing zeros dropped.
pub fn plain(x: f64, figures: usize) -> String {
    let s = sig(x, figures);
    let s = if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_owned()
    } else {
        s
    };
    if s == "-0" { "0".into() } else { s }
}

/// Computes the contents of a batch sheet.
pub fn batch_sheet(req: &SheetRequest<'_>) -> Result<BatchSheet, ExportError> {
    let project = req.project;
    let library = req.library;
    let variant = project
        .variants()
        .get(req.variant)
        .ok_or(ExportError::NoVariant {
            index: req.variant,
            count: project.variants().len(),
        })?;
    let settings = &project.settings;
    let constants = Constants::new(
        library,
        Conditions {
            temp_c: settings.temp_c,
            activity: settings.activity,
        },
    );
    saltwise_chem::report::check_temperature(settings.temp_c)?;
    let report = evaluate_with(library, &constants, &variant.recipe)?;
    let recipe_batch_g = report.batch.total_mass_g;
    let batch = req.batch.unwrap_or(BatchSize::grams(recipe_batch_g));
    limits::BATCH_G
        .check_as(batch.mass_g, "batch size")
        .map_err(ExportError::BatchSize)?;
    let scaled = report.batch.scaled_to(batch.mass_g);

    let mut lines = Vec::new();
    let mut left_out = Vec::new();
    for (line, mass) in variant.recipe.lines.iter().zip(&scaled.lines) {
        let name = library
            .entries()
            .get(mass.entry)
            .map_or_else(|| line.ingredient.clone(), |e| e.ingredient.name.clone());
        if !(line.enabled && mass.enabled) {
            left_out.push(name);
            continue;
        }
        lines.push(WeighLine {
            step: lines.len() + 1,
            name,
            id: line.ingredient.clone(),
            mass_g: mass.mass_g,
            percent: 100.0 * mass.mass_g / batch.mass_g,
            as_written: line.amount.to_string(),
        });
    }
    let qs_water_g = variant.recipe.qs_to_g.map(|_| scaled.qs_water_g);

    let ph = report.solution.ph;
    let (band, band_problem) = if tolerances_set(&settings.tolerances) {
        match tolerance::band(
            library,
            &constants,
            &variant.recipe,
            &settings.tolerances,
            settings.band_samples,
            settings.band_seed,
        ) {
            Ok(b) => (Some(b), None),
            Err(e) => (None, Some(e.to_string())),
        }
    } else {
        (None, None)
    };
    let target = settings.target_ph.map(|ph| TargetBand {
        ph,
        tolerance: settings.target_tolerance,
    });
    let adjuster = settings.adjuster.as_str();
    let adjuster_name = library
        .entry(adjuster)
        .map_or_else(|| adjuster.to_owned(), |e| e.ingredient.name.clone());

    // The dose, found on the batch as scaled: doses go on top of the batch as weighed.
    let doser = Doser::new(library, &constants, &scaled, adjuster);
    let dose = match (target, &doser) {
        (None, _) => DoseInstruction::NoTarget,
        (Some(_), Err(e)) => DoseInstruction::Unreachable(e.to_string()),
        (Some(t), Ok(d)) => match d.to_target(t.ph) {
            Ok(r) => DoseInstruction::Add {
                adjuster_name: adjuster_name.clone(),
                adjuster: adjuster.to_owned(),
                amount_g: r.amount_g,
                percent_of_batch: r.percent_of_batch,
                ph_reached: r.ph_reached,
            },
            Err(e) => DoseInstruction::Unreachable(e.to_string().replace(adjuster, &adjuster_name)),
        },
    };

    // The dose curve over the project's largest dose scaled to this batch, reaching past the
    // dose to target when that lies beyond.
    let factor = batch.mass_g / recipe_batch_g.max(f64::MIN_POSITIVE);
    let mut max_g = settings.dose_max_g * factor;
    if let DoseInstruction::Add { amount_g, .. } = dose
        && amount_g > 0.9 * max_g
    {
        max_g = 1.25 * amount_g;
    }
    let dose_chart = DoseChart::compute(library, &constants, &scaled, adjuster, max_g, target)
        .map(|mut c| {
            c.adjuster_name = adjuster_name.clone();
            c.band = band.as_ref().map(|b| (b.p05, b.p95));
            c
        })
        .map_err(|e| e.to_string());
    let species_chart = SpeciesChart::compute(
        library,
        &constants,
        &report,
        settings.species_system.as_deref(),
    );

    let mut plan = req
        .qc
        .clone()
        .unwrap_or_else(|| QcPlan::from_method(&settings.qc, ph));
    if plan.titrant.trim().is_empty() {
        plan.titrant = settings.qc.titrant_id(ph).to_owned();
    }
    let adjusted = match &dose {
        DoseInstruction::Add { amount_g, .. } if *amount_g > 0.0 => {
            library.entry_index(adjuster).map(|entry| {
                let mut b = scaled.clone();
                b.totals.add(library, entry, *amount_g);
                b.total_mass_g += amount_g;
                b
            })
        }
        _ => None,
    };
    let (qc, titration_chart) = qc_section(library, &constants, &scaled, adjusted.as_ref(), plan);

    let found = hazard::assemble(
        library,
        &constants,
        &report.batch,
        Some(&report.solution),
        Some(adjuster),
    );
    let mut cautions = found.items;
    if cautions.is_empty() {
        // The sheet always defers to the safety data sheets and local rules.
        cautions.push(hazard::deferral());
    }

    Ok(BatchSheet {
        project_name: project.name.clone(),
        variant_name: variant.name.clone(),
        date: req.date.clone(),
        batch,
        recipe_batch_g,
        temp_c: settings.temp_c,
        activity: report.solution.activity.label().to_owned(),
        lines,
        left_out,
        qs_water_g,
        ph,
        band,
        band_problem,
        target,
        dose,
        qc,
        dose_chart,
        species_chart,
        titration_chart,
        cautions,
        warnings: report.warnings.clone(),
    })
}

/// The QC predictions of the product as weighed and, when a dose applies, after it.
fn qc_section(
    library: &Library,
    constants: &Constants,
    as_weighed: &Batch,
    adjusted: Option<&Batch>,
    plan: QcPlan,
) -> (QcSection, Option<TitrationChart>) {
    let titrant = match Titrant::find(library, &plan.titrant, plan.normality) {
        Ok(t) => t,
        Err(e) => {
            let label = format!("{} N {}", plain(plan.normality, 3), plan.titrant);
            let section = QcSection {
                plan,
                titrant_label: label,
                kind: None,
                results: vec![QcResult {
                    of: "as weighed",
                    prediction: Err(e.to_string()),
                }],
            };
            return (section, None);
        }
    };
    let formula = library.entry(titrant.id()).map_or_else(
        || titrant.id().to_owned(),
        |e| formula_display(&e.ingredient.formula),
    );
    let label = format!("{} N {formula}", plain(plan.normality, 3));
    let request = Request {
        sample_g: plan.sample_g,
        end_points_ph: plan.end_points_ph.clone(),
        points: QC_POINTS,
        in_use_sample_ml: None,
        carbonated_percent: None,
    };
    let mut results = Vec::new();
    let mut chart = None;
    let products = std::iter::once(("as weighed", as_weighed))
        .chain(adjusted.map(|b| ("after the pH adjustment", b)));
    for (of, product) in products {
        let prediction =
            qc::predict(library, constants, product, &titrant, &request).map_err(|e| e.to_string());
        if let Ok(p) = &prediction {
            chart = Some(TitrationChart::from_prediction(&label, plan.sample_g, p));
        }
        results.push(QcResult { of, prediction });
    }
    let section = QcSection {
        plan,
        titrant_label: label,
        kind: Some(titrant.kind()),
        results,
    };
    (section, chart)
}

/// The name of an end point for people: P or M alkalinity, acidity, or just its pH.
pub fn end_point_name(kind: Option<TitrantKind>, e: &EndPoint) -> String {
    let close = |a: f64| (e.ph - a).abs() < 1e-9;
    match kind {
        Some(TitrantKind::Acid) if close(qc::P_END_POINT_PH) => {
            "P alkalinity (phenolphthalein)".into()
        }
        Some(TitrantKind::Acid) if close(qc::M_END_POINT_PH) => "M, total alkalinity".into(),
        Some(TitrantKind::Base) if close(qc::ACIDITY_END_POINT_PH) => {
            "Acidity (phenolphthalein)".into()
        }
        Some(TitrantKind::Base) if close(qc::NEUTRAL_ACIDITY_PH) => "Acidity to neutral".into(),
        _ => "End point".into(),
    }
}

/// The UTC date of a Unix time as YYYY-MM-DD (the proleptic Gregorian calendar, by era
/// arithmetic over 400-year cycles of 146 097 days).
pub fn iso_date(unix_secs: u64) -> String {
    let days = (unix_secs / 86_400) as i64;
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02}")
}

#[cfg(test)]
mod date_tests {
    use super::iso_date;

    #[test]
    fn unix_times_become_dates() {
        // 1970-01-01 is day 0; 2000-03-01 is day 11 017; 2024-02-29 is day 19 782 (counted by
        // hand from 365-day years and the Gregorian leap rule).
        assert_eq!(iso_date(0), "1970-01-01");
        assert_eq!(iso_date(11_017 * 86_400 + 3600), "2000-03-01");
        assert_eq!(iso_date(19_782 * 86_400), "2024-02-29");
        assert_eq!(iso_date(19_782 * 86_400 - 1), "2024-02-28");
    }
}
