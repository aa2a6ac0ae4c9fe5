//! File ▸ Export: every chart of the window as a PNG or SVG picture or its curves as CSV, and
//! the batch sheet as one HTML page, made from the engine's current results.

use egui::Color32;
use saltwise_chem::curve::DoseCurve;
use saltwise_chem::project::Project;
use saltwise_chem::text::ion_display;
use saltwise_export::chart::{PH_LINE, Rgb, SPECIES};
use saltwise_export::{
    BatchSize, Chart, DoseChart, LineChart, Series, SheetRequest, Size, SpeciesChart, TargetBand,
    TitrationChart,
};

use crate::band_job::BandState;
use crate::engine::Engine;
use crate::ui;

/// Points on a QC titration curve made for an export (when the section has not made one).
const QC_POINTS: usize = 121;

/// A chart of the window.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ChartKind {
    /// pH against the dose of the adjuster.
    Dose,
    /// Buffer capacity against the same dose.
    BufferCapacity,
    /// The forms of the chosen system, or where the chosen metal is, against pH.
    Species,
    /// pH against in-use dilution.
    Dilution,
    /// pH against temperature.
    Temperature,
    /// The predicted QC titration.
    Titration,
    /// Every variant's dose curve.
    Variants,
}

impl ChartKind {
    /// Every chart, in menu order.
    pub const ALL: [ChartKind; 7] = [
        Self::Dose,
        Self::BufferCapacity,
        Self::Species,
        Self::Dilution,
        Self::Temperature,
        Self::Titration,
        Self::Variants,
    ];

    /// Its name in the menu and in messages.
    pub fn words(self) -> &'static str {
        match self {
            Self::Dose => "Dose curve",
            Self::BufferCapacity => "Buffer capacity",
            Self::Species => "Species chart",
            Self::Dilution => "pH against dilution",
            Self::Temperature => "pH against temperature",
            Self::Titration => "QC titration curve",
            Self::Variants => "Variants compared",
        }
    }

    /// The stem of the file name suggested.
    fn stem(self) -> &'static str {
        match self {
            Self::Dose => "dose-curve",
            Self::BufferCapacity => "buffer-capacity",
            Self::Species => "species",
            Self::Dilution => "dilution",
            Self::Temperature => "temperature",
            Self::Titration => "qc-titration",
            Self::Variants => "variants",
        }
    }
}

/// What a chart is written as.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Format {
    /// A PNG picture.
    Png,
    /// An SVG picture.
    Svg,
    /// The curves as CSV.
    Csv,
}

impl Format {
    /// Every format, in menu order.
    pub const ALL: [Format; 3] = [Self::Png, Self::Svg, Self::Csv];

    /// The file extension.
    pub fn extension(self) -> &'static str {
        match self {
            Self::Png => "png",
            Self::Svg => "svg",
            Self::Csv => "csv",
        }
    }

    /// Its name in the menu.
    pub fn words(self) -> &'static str {
        match self {
            Self::Png => "PNG picture…",
            Self::Svg => "SVG picture…",
            Self::Csv => "CSV data…",
        }
    }
}

/// One item of the Export menu.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Export {
    /// The batch sheet as HTML, for a batch of this many kg (none: the recipe's own batch).
    BatchSheet {
        /// Batch size, kg.
        batch_kg: Option<f64>,
    },
    /// A chart in a format.
    Chart(ChartKind, Format),
}

impl Export {
    /// The file extension.
    pub fn extension(self) -> &'static str {
        match self {
            Self::BatchSheet { .. } => "html",
            Self::Chart(_, f) => f.extension(),
        }
    }

    /// What it is, for messages.
    pub fn words(self) -> String {
        match self {
            Self::BatchSheet { .. } => "batch sheet".into(),
            Self::Chart(c, f) => format!(
                "{} ({})",
                c.words().to_lowercase(),
                f.extension().to_uppercase()
            ),
        }
    }

    /// The file name suggested: the project's name and what it is.
    pub fn file_name(self, project: &Project) -> String {
        let base: String = project
            .name
            .chars()
            .map(|c| if c.is_alphanumeric() { c } else { '-' })
            .collect::<String>()
            .split('-')
            .filter(|s| !s.is_empty())
            .collect::<Vec<_>>()
            .join("-")
            .to_lowercase();
        let base = if base.is_empty() {
            "saltwise".into()
        } else {
            base
        };
        let what = match self {
            Self::BatchSheet { .. } => "batch-sheet",
            Self::Chart(c, _) => c.stem(),
        };
        format!("{base}-{what}.{}", self.extension())
    }
}

fn rgb(c: Color32) -> Rgb {
    Rgb(c.r(), c.g(), c.b())
}

/// The bytes of an export, from the engine's results for `project`, or why it cannot be made.
pub fn build(
    engine: &Engine,
    project: &Project,
    export: Export,
    date: String,
) -> Result<Vec<u8>, String> {
    let library = engine.library().map_err(str::to_owned)?;
    match export {
        Export::BatchSheet { batch_kg } => {
            let sheet = saltwise_export::batch_sheet(&SheetRequest {
                project,
                library,
                variant: project.current(),
                batch: batch_kg.map(BatchSize::kilograms),
                date,
                qc: None,
            })
            .map_err(|e| e.to_string())?;
            saltwise_export::batch_sheet_html(&sheet)
                .map(String::into_bytes)
                .map_err(|e| e.to_string())
        }
        Export::Chart(kind, format) => {
            let charts = Charts::of(engine, project, kind)?;
            let chart = charts.chart();
            let out = match format {
                Format::Png => saltwise_export::png(chart, Size::DEFAULT),
                Format::Svg => saltwise_export::svg(chart, Size::DEFAULT).map(String::into_bytes),
                Format::Csv => saltwise_export::csv(chart).map(String::into_bytes),
            };
            out.map_err(|e| e.to_string())
        }
    }
}

/// The data of one chart, owned, to lend as a [`Chart`].
enum Charts {
    Dose(DoseChart),
    Buffer(DoseChart),
    Species(SpeciesChart),
    Titration(TitrationChart),
    Lines(LineChart),
}

impl Charts {
    fn chart(&self) -> Chart<'_> {
        match self {
            Self::Dose(c) => Chart::Dose(c),
            Self::Buffer(c) => Chart::BufferCapacity(c),
            Self::Species(c) => Chart::Species(c),
            Self::Titration(c) => Chart::Titration(c),
            Self::Lines(c) => Chart::Lines(c),
        }
    }

    fn of(engine: &Engine, project: &Project, kind: ChartKind) -> Result<Self, String> {
        let library = engine.library().map_err(str::to_owned)?;
        let report = engine
            .solved()
            .ok_or("the recipe has not been solved, so there is nothing to chart")?;
        let settings = &project.settings;
        match kind {
            ChartKind::Dose | ChartKind::BufferCapacity => {
                let curve = match engine.curve() {
                    Some(Ok(c)) => c,
                    Some(Err(e)) => return Err(format!("there is no dose curve: {e}")),
                    None => return Err("there is no dose curve yet".into()),
                };
                let mut chart = DoseChart::from_curve(
                    &curve.adjuster_name,
                    &DoseCurve {
                        adjuster: curve.adjuster.clone(),
                        points: curve.points.clone(),
                        equivalence: curve.equivalence.clone(),
                    },
                );
                chart.target = settings.target_ph.map(|ph| TargetBand {
                    ph,
                    tolerance: settings.target_tolerance,
                });
                chart.band = match engine.band() {
                    Some(BandState::Done(Ok(b))) => Some((b.p05, b.p95)),
                    _ => None,
                };
                chart.dose_to_target_g = curve
                    .to_target
                    .as_ref()
                    .and_then(|r| r.as_ref().ok())
                    .map(|d| d.amount_g)
                    .filter(|d| *d <= settings.dose_max_g);
                Ok(if kind == ChartKind::Dose {
                    Self::Dose(chart)
                } else {
                    Self::Buffer(chart)
                })
            }
            ChartKind::Species => {
                if let Some(m) = engine.metal() {
                    return Ok(Self::Lines(metal_chart(library, m)));
                }
                let constants = engine.constants().ok_or("the conditions are not set up")?;
                SpeciesChart::compute(
                    library,
                    constants,
                    report,
                    settings.species_system.as_deref(),
                )
                .map(Self::Species)
                .ok_or_else(|| "the recipe has no acid–base system to chart".into())
            }
            ChartKind::Titration => {
                let constants = engine.constants().ok_or("the conditions are not set up")?;
                let (titrant, prediction) = settings
                    .qc
                    .predict(
                        library,
                        constants,
                        &report.batch,
                        report.solution.ph,
                        QC_POINTS,
                    )
                    .map_err(|e| format!("no QC titration: {e}"))?;
                let formula = library
                    .entry(titrant.id())
                    .map_or_else(|| titrant.id().to_owned(), |e| e.ingredient.formula.clone());
                let label = format!("{} N {formula}", ui::sig(titrant.normality(), 3));
                Ok(Self::Titration(TitrationChart::from_prediction(
                    &label,
                    settings.qc.sample_g,
                    &prediction,
                )))
            }
            ChartKind::Dilution | ChartKind::Temperature => {
                let sweeps = match engine.sweeps() {
                    Some(Ok(s)) => s,
                    Some(Err(e)) => return Err(format!("there is no sweep: {e}")),
                    None => return Err("there is no sweep yet".into()),
                };
                let dilution = kind == ChartKind::Dilution;
                let points: Vec<(f64, f64)> = if dilution {
                    sweeps
                        .dilution
                        .iter()
                        .map(|p| (10f64.powf(p.x), p.y))
                        .collect()
                } else {
                    sweeps.temperature.iter().map(|p| (p.x, p.y)).collect()
                };
                let (title, x_label, x_column) = if dilution {
                    (
                        "pH against in-use dilution with water",
                        "Dilution (mass of diluted liquid / mass of product)",
                        "dilution",
                    )
                } else {
                    ("pH against temperature", "Temperature, °C", "temperature_c")
                };
                let marker = if dilution {
                    (1.0, "Product as made".to_owned())
                } else {
                    (settings.temp_c, format!("{:.1} °C", settings.temp_c))
                };
                Ok(Self::Lines(LineChart {
                    title: title.into(),
                    x_label: x_label.into(),
                    y_label: "pH".into(),
                    x_column: x_column.into(),
                    series: vec![Series {
                        name: "pH".into(),
                        points,
                        color: PH_LINE,
                        dashed: false,
                    }],
                    marker: Some(marker),
                    log_x: dilution,
                }))
            }
            ChartKind::Variants => {
                let adjuster = library
                    .entry(&settings.adjuster)
                    .map_or_else(|| settings.adjuster.clone(), |e| e.ingredient.name.clone());
                let series: Vec<Series> = project
                    .variants()
                    .iter()
                    .zip(engine.variant_rows())
                    .enumerate()
                    .filter_map(|(k, (v, row))| {
                        let points = row.curve.as_ref().ok()?;
                        Some(Series {
                            name: v.name.clone(),
                            points: points.iter().map(|p| (p.x, p.y)).collect(),
                            color: rgb(ui::variants::variant_color(k)),
                            dashed: k % 2 == 1,
                        })
                    })
                    .collect();
                if series.is_empty() {
                    return Err("no variant has a dose curve".into());
                }
                Ok(Self::Lines(LineChart {
                    title: format!("Variants compared: pH against the dose of {adjuster}"),
                    x_label: format!("Dose of {adjuster}, g"),
                    y_label: "pH".into(),
                    x_column: "dose_g".into(),
                    series,
                    marker: None,
                    log_x: false,
                }))
            }
        }
    }
}

/// A metal's distribution as a line chart: its share in each part against pH.
fn metal_chart(
    library: &saltwise_chem::Library,
    m: &saltwise_chem::distribution::MetalDistribution,
) -> LineChart {
    let symbol = library.ion_index(&m.metal).map_or_else(
        || m.metal.clone(),
        |i| {
            let ion = &library.ions()[i];
            ion_display(&ion.symbol, i64::from(ion.charge))
        },
    );
    let series = m
        .parts
        .iter()
        .enumerate()
        .map(|(j, part)| Series {
            name: ui::species_chart::part_words(library, &m.metal, part),
            points: m.points.iter().map(|(ph, s)| (*ph, s[j])).collect(),
            color: SPECIES[j % SPECIES.len()],
            dashed: j % 2 == 1,
        })
        .collect();
    LineChart {
        title: format!("Where {symbol} is, against pH"),
        x_label: "pH".into(),
        y_label: "Share of the metal".into(),
        x_column: "ph".into(),
        series,
        marker: None,
        log_x: false,
    }
}
