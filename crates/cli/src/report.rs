//! `saltwise-cli report`: the batch sheet of one variant of a project, scaled to a batch size,
//! written atomically as one self-contained HTML file.

use std::path::PathBuf;
use std::process::ExitCode;
use std::time::{SystemTime, UNIX_EPOCH};

use anyhow::{Context, Result, anyhow, bail};
use clap::Args;
use saltwise_chem::Library;
use saltwise_chem::amount::Unit;
use saltwise_chem::project::{Project, write_atomic};
use saltwise_export::{BatchSize, QcPlan, SheetRequest, batch_sheet, batch_sheet_html};

use crate::input;

/// Arguments of `report`.
#[derive(Debug, Args)]
pub struct ReportArgs {
    /// The project file saved by the workbench.
    #[arg(long, value_name = "FILE")]
    pub project: PathBuf,
    /// The variant, by name; default the project's current one.
    #[arg(long, value_name = "NAME")]
    pub variant: Option<String>,
    /// The batch size, in g or kg (e.g. 250kg, 5000g); default the recipe's own batch, in g.
    #[arg(long, value_name = "MASS", allow_hyphen_values = true)]
    pub batch: Option<String>,
    /// The HTML file to write (replaced atomically).
    #[arg(long, value_name = "FILE.html")]
    pub out: PathBuf,
    /// The date printed on the sheet; default today's date (UTC) as YYYY-MM-DD.
    #[arg(long, value_name = "TEXT")]
    pub date: Option<String>,
    /// QC titrant (library id, formula or id without grade); default hcl, or naoh for a product at or below pH 4.3.
    #[arg(long, value_name = "ID")]
    pub titrant: Option<String>,
    /// QC titrant normality, mol/L; default 0.1.
    #[arg(long, value_name = "N", allow_negative_numbers = true)]
    pub normality: Option<f64>,
    /// QC sample of product, e.g. 10g; default 10 g.
    #[arg(long, value_name = "MASS")]
    pub sample: Option<String>,
    /// QC end point pH, repeatable; default 8.3 and 4.3 with an acid titrant, 8.3 with a base.
    #[arg(long = "endpoint", value_name = "PH", allow_negative_numbers = true)]
    pub endpoints: Vec<f64>,
}

/// A batch size as typed: a mass in g or kg, shown on the sheet in the unit typed (mg in g).
pub fn batch_size(text: &str) -> Result<BatchSize> {
    let g = input::mass_g(text).with_context(|| format!("--batch '{text}'"))?;
    saltwise_chem::limits::BATCH_G
        .check_as(g, "--batch")
        .context("--batch")?;
    let unit = saltwise_chem::Amount::parse(text)
        .map_err(|e| anyhow!(e))?
        .unit;
    Ok(match unit {
        Unit::Kilogram => BatchSize::kilograms(g / 1000.0),
        _ => BatchSize::grams(g),
    })
}

/// Today's date (UTC) as YYYY-MM-DD, from the system clock (the batch sheet's and a saved fit's).
pub(crate) fn today() -> String {
    let secs = SystemTime::now()
        .duration_since(UNIX_EPOCH)
        .map_or(0, |d| d.as_secs());
    saltwise_export::sheet::iso_date(secs)
}

/// `saltwise-cli report`.
pub fn run(args: &ReportArgs) -> Result<ExitCode> {
    let base = Library::built_in().context("the built-in library")?;
    let (project, library) = Project::load_with_library(&args.project, &base)?;
    let variant = match &args.variant {
        None => project.current(),
        Some(name) => project.variant_index(name).ok_or_else(|| {
            let names: Vec<String> = project
                .variants()
                .iter()
                .map(|v| format!("'{}'", v.name))
                .collect();
            anyhow!(
                "--variant: {} has no variant called '{name}'; its variants are {}",
                args.project.display(),
                names.join(", ")
            )
        })?,
    };
    let batch = args.batch.as_deref().map(batch_size).transpose()?;
    let qc = if args.titrant.is_some()
        || args.normality.is_some()
        || args.sample.is_some()
        || !args.endpoints.is_empty()
    {
        // Each flag given replaces that part of the project's QC method.
        let method = &project.settings.qc;
        let sample_g = match &args.sample {
            Some(s) => input::mass_g(s).context("--sample")?,
            None => method.sample_g,
        };
        let end_points_ph = if args.endpoints.is_empty() {
            method.end_points_ph.clone()
        } else {
            args.endpoints.clone()
        };
        Some(QcPlan {
            // Without --titrant, the method's titrant (or its choice for the product's pH).
            titrant: args
                .titrant
                .clone()
                .or_else(|| method.titrant.clone())
                .unwrap_or_default(),
            normality: args.normality.unwrap_or(method.normality),
            sample_g,
            end_points_ph,
        })
    } else {
        None
    };
    let date = args.date.clone().unwrap_or_else(today);
    let request = SheetRequest {
        project: &project,
        library: &library,
        variant,
        batch,
        date,
        qc,
    };
    let sheet = batch_sheet(&request)
        .with_context(|| format!("variant '{}'", project.variants()[variant].name))?;
    if let Some(plan) = &request.qc {
        check_qc(plan, &sheet)?;
    }
    let html = batch_sheet_html(&sheet)?;
    write_atomic(&args.out, html.as_bytes(), false)
        .with_context(|| format!("writing {}", args.out.display()))?;
    println!(
        "wrote {} (batch sheet of '{}', {} bytes)",
        args.out.display(),
        sheet.variant_name,
        html.len()
    );
    Ok(ExitCode::SUCCESS)
}

/// QC flags given on the command line must work: a titrant, normality or sample the sheet
/// could not use is an error rather than a note on the page.
fn check_qc(plan: &QcPlan, sheet: &saltwise_export::BatchSheet) -> Result<()> {
    if plan.sample_g <= 0.0 {
        bail!(
            "--sample {} g is not allowed: it must be above 0 g",
            plan.sample_g
        );
    }
    if sheet.qc.kind.is_none() || sheet.qc.results.iter().all(|r| r.prediction.is_err()) {
        let why = sheet
            .qc
            .results
            .iter()
            .find_map(|r| r.prediction.as_ref().err())
            .cloned()
            .unwrap_or_default();
        bail!("QC titration: {why}");
    }
    Ok(())
}
