//! The data of each chart the window shows (dose curve, buffer capacity, species fractions, QC
//! titration), built from chem's results, and the palette they are drawn in.

use saltwise_chem::curve::{CurvePoint, DoseCurve, Doser, EquivalencePoint};
use saltwise_chem::library::form_names;
use saltwise_chem::qc::{EndPoint, Prediction, TitrationPoint};
use saltwise_chem::recipe::Batch;
use saltwise_chem::solver;
use saltwise_chem::{Constants, Library, Report};

use crate::ExportError;

/// An sRGB colour, 8 bits a channel.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Rgb(pub u8, pub u8, pub u8);

impl Rgb {
    /// `#rrggbb`, as CSS writes it.
    pub fn hex(self) -> String {
        format!("#{:02x}{:02x}{:02x}", self.0, self.1, self.2)
    }
}

// One colour, one meaning: the same Okabe–Ito colours as the window's charts (crates/app/src/ui/
// mod.rs), so a printed chart reads like the one on screen. The current recipe, drawn in the
// theme's strongest text colour on screen, is near-black on the white page.

/// The target band and everything about reaching it (bluish green).
pub const TARGET: Rgb = Rgb(0x00, 0x9e, 0x73);
/// The pH on the dose curve and the titration curve (blue).
pub const PH_LINE: Rgb = Rgb(0x00, 0x72, 0xb2);
/// Buffer capacity (sky blue, dashed).
pub const BUFFER: Rgb = Rgb(0x56, 0xb4, 0xe9);
/// Equivalence points and titration end points (reddish purple, open circles).
pub const EQUIVALENCE: Rgb = Rgb(0xcc, 0x79, 0xa7);
/// Warnings and limits of the prediction (orange).
pub const WARN: Rgb = Rgb(0xc2, 0x7c, 0x00);
/// The current recipe on any chart (near-black on white).
pub const CURRENT: Rgb = Rgb(0x22, 0x22, 0x22);
/// The forms of a system on the species chart, in order; odd forms are also dashed.
pub const SPECIES: [Rgb; 7] = [
    Rgb(0xcc, 0xbb, 0x44),
    Rgb(0xaa, 0x33, 0x77),
    Rgb(0x44, 0x77, 0xaa),
    Rgb(0x99, 0x99, 0x99),
    Rgb(0xee, 0x66, 0x77),
    Rgb(0x66, 0xcc, 0xee),
    Rgb(0x22, 0x88, 0x33),
];

/// Points on a dose curve computed here, as in the window.
pub const DOSE_POINTS: usize = 161;
/// pH step of the species chart, as in the window.
pub const SPECIES_PH_STEP: f64 = 0.05;

/// A target pH and the half-width of its band.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TargetBand {
    /// Target pH.
    pub ph: f64,
    /// Half-width of the band, pH units.
    pub tolerance: f64,
}

/// The dose curve and its buffer capacity: pH against the dose of one adjuster.
#[derive(Debug, Clone, PartialEq)]
pub struct DoseChart {
    /// Display name of the adjuster.
    pub adjuster_name: String,
    /// Points from no dose to the largest (dose in g of the adjuster as supplied).
    pub points: Vec<CurvePoint>,
    /// Equivalence points on the curve.
    pub equivalence: Vec<EquivalencePoint>,
    /// The target band, when a target is set.
    pub target: Option<TargetBand>,
    /// The pH band under the tolerances (5th to 95th percentile), drawn at no dose.
    pub band: Option<(f64, f64)>,
    /// The dose that reaches the target, g, when there is one.
    pub dose_to_target_g: Option<f64>,
}

impl DoseChart {
    /// A chart of a curve already swept (the window's), with no target, band or dose marked.
    pub fn from_curve(adjuster_name: &str, curve: &DoseCurve) -> Self {
        Self {
            adjuster_name: adjuster_name.to_owned(),
            points: curve.points.clone(),
            equivalence: curve.equivalence.clone(),
            target: None,
            band: None,
            dose_to_target_g: None,
        }
    }

    /// Sweeps the dose curve of `adjuster` on `batch` from 0 to `max_g` g ([`DOSE_POINTS`]
    /// points), with the dose to the target marked when a target is given and reached.
    pub fn compute(
        library: &Library,
        constants: &Constants,
        batch: &Batch,
        adjuster: &str,
        max_g: f64,
        target: Option<TargetBand>,
    ) -> Result<Self, ExportError> {
        if !(max_g.is_finite() && max_g > 0.0) {
            return Err(ExportError::DoseRange { max_g });
        }
        let doser = Doser::new(library, constants, batch, adjuster)?;
        let curve = doser.curve(max_g, DOSE_POINTS);
        let name = library
            .entry(adjuster)
            .map_or_else(|| adjuster.to_owned(), |e| e.ingredient.name.clone());
        let mut chart = Self::from_curve(&name, &curve);
        chart.target = target;
        chart.dose_to_target_g = target
            .and_then(|t| doser.to_target(t.ph).ok())
            .map(|d| d.amount_g)
            .filter(|d| *d <= max_g);
        Ok(chart)
    }
}

/// Fractions of every form of one system against pH 0–14, at the recipe's ionic strength.
#[derive(Debug, Clone, PartialEq)]
pub struct SpeciesChart {
    /// Display name of the system.
    pub system_name: String,
    /// Names of the forms, fully protonated first.
    pub forms: Vec<String>,
    /// The pH of each column of `fractions`.
    pub ph: Vec<f64>,
    /// Per form, its fraction at each pH of `ph`.
    pub fractions: Vec<Vec<f64>>,
    /// The recipe's pH, marked on the chart.
    pub current_ph: f64,
    /// Ionic strength the fractions are computed at, mol/kg water.
    pub ionic_strength: f64,
}

impl SpeciesChart {
    /// The chart of `system_id` if the recipe holds it, else of the recipe's first system (as
    /// the window chooses); `None` when the recipe has no acid–base system.
    pub fn compute(
        library: &Library,
        constants: &Constants,
        report: &Report,
        system_id: Option<&str>,
    ) -> Option<Self> {
        let state = report.shown_system(library, system_id)?;
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
        let fractions = (0..forms.len())
            .map(|j| {
                table
                    .iter()
                    .map(|(_, f)| f.get(j).copied().unwrap_or(0.0))
                    .collect()
            })
            .collect();
        Some(Self {
            system_name: system.name.clone(),
            forms,
            ph: table.iter().map(|(ph, _)| *ph).collect(),
            fractions,
            current_ph: report.solution.ph,
            ionic_strength,
        })
    }
}

/// A predicted QC titration: pH against mL of titrant, with the end points.
#[derive(Debug, Clone, PartialEq)]
pub struct TitrationChart {
    /// The titrant as shown, e.g. `0.1 N hydrochloric acid`.
    pub titrant_label: String,
    /// The sample titrated, g.
    pub sample_g: f64,
    /// pH against titrant volume.
    pub points: Vec<TitrationPoint>,
    /// The end points with the volume to each.
    pub end_points: Vec<EndPoint>,
}

impl TitrationChart {
    /// The chart of a prediction of chem's `qc::predict`.
    pub fn from_prediction(titrant_label: &str, sample_g: f64, p: &Prediction) -> Self {
        Self {
            titrant_label: titrant_label.to_owned(),
            sample_g,
            points: p.points.clone(),
            end_points: p.end_points.clone(),
        }
    }
}

/// One curve of a [`LineChart`].
#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    /// Legend entry, also the CSV column's name.
    pub name: String,
    /// (x, y) points in order.
    pub points: Vec<(f64, f64)>,
    /// Its colour.
    pub color: Rgb,
    /// Dashed rather than solid.
    pub dashed: bool,
}

/// Any other chart of the window: named curves against one x axis, with an optional marked x
/// (the current recipe).
#[derive(Debug, Clone, PartialEq)]
pub struct LineChart {
    /// The caption.
    pub title: String,
    /// The x axis, with its unit.
    pub x_label: String,
    /// The y axis, with its unit.
    pub y_label: String,
    /// The CSV column of x: a short name with its unit (`dilution`, `temperature_c`).
    pub x_column: String,
    /// The curves.
    pub series: Vec<Series>,
    /// An x marked with a vertical line, and its legend entry.
    pub marker: Option<(f64, String)>,
    /// Whether the x axis is drawn on a log scale (x must then be above 0).
    pub log_x: bool,
}

/// One of the charts, to draw or to write as CSV.
#[derive(Debug, Clone, Copy)]
pub enum Chart<'a> {
    /// pH against dose, with the target band, band, equivalence points and dose to target.
    Dose(&'a DoseChart),
    /// Buffer capacity against the same dose.
    BufferCapacity(&'a DoseChart),
    /// Fractions of the forms of a system against pH.
    Species(&'a SpeciesChart),
    /// pH against mL of titrant.
    Titration(&'a TitrationChart),
    /// Any other chart: named curves against one axis.
    Lines(&'a LineChart),
}

impl Chart<'_> {
    /// A short file-name stem for the chart, e.g. `dose-curve`.
    pub fn stem(&self) -> &'static str {
        match self {
            Self::Dose(_) => "dose-curve",
            Self::BufferCapacity(_) => "buffer-capacity",
            Self::Species(_) => "species",
            Self::Titration(_) => "qc-titration",
            Self::Lines(_) => "chart",
        }
    }
}
