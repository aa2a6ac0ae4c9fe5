//! Command-line arguments as typed; resolved into recipes in `input.rs`.

use std::path::PathBuf;

use clap::{Args, Parser, Subcommand, ValueEnum};

/// Saltwise: pH of aqueous recipes by mass, dose curves and doses to target.
#[derive(Debug, Parser)]
#[command(name = "saltwise-cli", version, about)]
pub struct Cli {
    #[command(subcommand)]
    pub command: Command,
}

#[derive(Debug, Subcommand)]
pub enum Command {
    /// The solved state of a recipe (help text below; brackets in a doc comment read as a link).
    #[command(about = "pH, p[H], ionic strength, buffer capacity and species of a recipe.")]
    Ph(PhArgs),
    /// pH against the dose of an ingredient added to the recipe.
    Curve(CurveArgs),
    /// How much of an adjuster brings the recipe to a target pH.
    Dose(DoseArgs),
    /// The ingredients, systems and ions of the library, with constants and sources.
    Library(LibraryArgs),
    /// Properties of water at a temperature: pKw (IAPWS), density, dielectric constant, Davies A.
    Water(WaterArgs),
    /// pH of the recipe against dilution with water (--dilute) or temperature (--temp-range).
    Sweep(crate::sweep::SweepArgs),
    /// pH band (5th, 50th, 95th percentile) under weighing tolerances and assay ranges.
    Tolerance(crate::tolerance::ToleranceArgs),
    /// Grams of an acid and a salt form of one system for a target pH and buffer capacity.
    Design(crate::design::DesignArgs),
    /// The variants of one or more project files side by side: pH, capacity, cost, cautions.
    Compare(crate::compare::CompareArgs),
    /// A QC titration of a sample of product predicted: mL of titrant to each end point, the curve, the titration factor.
    Titrate(crate::titrate::TitrateArgs),
    /// The batch sheet of a project's variant, scaled to a batch size, as one HTML file.
    Report(crate::report::ReportArgs),
    /// A measured titration fitted: assays, an unknown acid or base, a meter offset, with standard errors.
    Fit(crate::fit::FitArgs),
}

/// The anion of the water's hardness.
#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum HardnessAs {
    /// Hydrogen carbonate (carbonate hardness, as in most natural water).
    Bicarbonate,
    /// Chloride (no alkalinity).
    Chloride,
}

/// The activity model named on the command line.
#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum Activity {
    /// Davies where it holds for the ionic strength and charges, Pitzer beyond (the default).
    Auto,
    /// Davies equation with A(T).
    Davies,
    /// Pitzer equations with the library's parameters (concentrates, to 6 mol/kg).
    Pitzer,
    /// Activity coefficients of 1.
    Ideal,
}

#[derive(Debug, Args)]
pub struct RecipeArgs {
    /// Ingredients as id=AMOUNT, AMOUNT a number with unit g, kg, mg, mol or % (e.g. water=900g).
    pub items: Vec<String>,
    /// Read the recipe and settings from a project file saved by the workbench.
    #[arg(long, value_name = "FILE")]
    pub project: Option<PathBuf>,
    /// The project's variant to solve, by name; default the project's current variant.
    #[arg(long, value_name = "NAME", requires = "project")]
    pub variant: Option<String>,
    /// Fill the batch with water to this total mass (q.s.), e.g. 1000g.
    #[arg(long, value_name = "MASS")]
    pub qs_to: Option<String>,
    /// Temperature in °C (0–95); default 25, or the project's.
    #[arg(long, value_name = "C")]
    pub temp: Option<f64>,
    /// Activity model; default auto, or the project's.
    #[arg(long, value_enum)]
    pub activity: Option<Activity>,
    /// Hardness of the water lines and q.s. water, ppm (mg/kg) as CaCO₃ (0–10000).
    #[arg(long, value_name = "PPM")]
    pub hardness: Option<f64>,
    /// Share of the hardness that is calcium, 0–1 (the rest magnesium); default 0.7.
    #[arg(long, value_name = "SHARE")]
    pub hardness_calcium: Option<f64>,
    /// The anion that comes with the hardness; default bicarbonate.
    #[arg(long, value_enum)]
    pub hardness_as: Option<HardnessAs>,
    /// Print JSON instead of text.
    #[arg(long)]
    pub json: bool,
}

#[derive(Debug, Args)]
pub struct PhArgs {
    #[command(flatten)]
    pub recipe: RecipeArgs,
    /// Let supersaturated solids settle out: report the solids formed and the state left; default off, or the project's.
    #[arg(long)]
    pub precipitate: bool,
}

#[derive(Debug, Args)]
pub struct CurveArgs {
    #[command(flatten)]
    pub recipe: RecipeArgs,
    /// The ingredient to dose and its range, id=FROM..TO with a unit (e.g. sodium_hydroxide_50=0..20g).
    #[arg(long, value_name = "ID=FROM..TO")]
    pub dose: String,
    /// Number of points on the curve.
    #[arg(long, default_value_t = 101)]
    pub points: usize,
    /// Print CSV with header dose_g,ph,buffer_capacity.
    #[arg(long, conflicts_with = "json")]
    pub csv: bool,
}

#[derive(Debug, Args)]
pub struct DoseArgs {
    #[command(flatten)]
    pub recipe: RecipeArgs,
    /// The pH adjuster, a library id (e.g. lactic_acid_88).
    #[arg(long)]
    pub adjuster: String,
    /// The pH to reach.
    #[arg(long, value_name = "X", allow_negative_numbers = true)]
    pub target_ph: f64,
}

#[derive(Debug, Args)]
pub struct LibraryArgs {
    /// Print JSON instead of text.
    #[arg(long)]
    pub json: bool,
}

#[derive(Debug, Args)]
pub struct WaterArgs {
    /// Temperature in °C (0–100).
    #[arg(long, value_name = "C", default_value_t = 25.0)]
    pub temp: f64,
    /// Print JSON instead of text.
    #[arg(long)]
    pub json: bool,
}
