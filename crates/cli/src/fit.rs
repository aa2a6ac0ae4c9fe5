//! `saltwise-cli fit`: a measured titration (pH-meter readings from a CSV or text file) fitted
//! with chosen unknowns — a line's assay, an unknown acid or base, a meter offset — and the fitted
//! ingredient saved to the user's library on request.

use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

use anyhow::{Context, Result, bail};
use clap::Args;
use saltwise_chem::fit::{self, Fit, Unknown};
use saltwise_chem::measured::{MeasuredTitration, parse_readings};
use saltwise_chem::qc::TITRANT_DENSITY_KG_PER_L;
use saltwise_chem::text::ascii;
use saltwise_chem::user_library::{Provenance, fitted_entry, fitted_words};
use serde_json::{Value, json};

use crate::args::RecipeArgs;
use crate::{input, user_lib};

/// Largest data file read, bytes.
const MAX_DATA_BYTES: u64 = 4 * 1024 * 1024;

/// Arguments of `fit`.
#[derive(Debug, Args)]
pub struct FitArgs {
    /// The product, as for `ph` (items and/or --project).
    #[command(flatten)]
    pub recipe: RecipeArgs,
    /// pH-meter readings: CSV or text, columns ml,ph (g,ph with --titrant-by-mass), optional temperature.
    #[arg(long, value_name = "FILE.csv")]
    pub data: PathBuf,
    /// The strong acid or base titrated with: library id, formula or id without grade.
    #[arg(long, value_name = "ID")]
    pub titrant: String,
    /// Normality of the titrant, mol/L (above 0, at most 1; density taken as 1.00 kg/L).
    #[arg(long, value_name = "N", allow_negative_numbers = true)]
    pub normality: f64,
    /// Mass of product titrated, e.g. 10g.
    #[arg(long, value_name = "MASS")]
    pub sample: String,
    /// An unknown to fit, repeatable: assay:ID, unknown-acid:PKA, unknown-base:PKA, meter-offset.
    #[arg(long = "fit", value_name = "UNKNOWN", required = true)]
    pub unknowns: Vec<String>,
    /// The titrant was weighed: the first column is g of titrant (1.00 kg/L taken).
    #[arg(long)]
    pub titrant_by_mass: bool,
    /// Save the fitted ingredient to the user library under this id (lower case, digits, _).
    #[arg(long, value_name = "NAME")]
    pub save_to_library: Option<String>,
    /// Formula of the unknown acid or base saved with --save-to-library (for its molar mass).
    #[arg(long, value_name = "FORMULA", requires = "save_to_library")]
    pub formula: Option<String>,
}

fn read_data(path: &PathBuf) -> Result<String> {
    let name = path.display();
    let size = std::fs::metadata(path)
        .with_context(|| format!("--data {name}"))?
        .len();
    if size > MAX_DATA_BYTES {
        bail!("--data {name} is {size} bytes; a titration file is at most {MAX_DATA_BYTES} bytes");
    }
    let bytes = std::fs::read(path).with_context(|| format!("--data {name}"))?;
    String::from_utf8(bytes).map_err(|e| {
        anyhow::anyhow!(
            "--data {name} is not UTF-8 text (byte {}); save it as UTF-8 CSV",
            e.utf8_error().valid_up_to()
        )
    })
}

/// `saltwise-cli fit`.
pub fn run(args: &FitArgs) -> Result<ExitCode> {
    let r = input::resolve(&args.recipe)?;
    let sample_g = input::mass_g(&args.sample).context("--sample")?;
    let unknowns: Vec<Unknown> = args
        .unknowns
        .iter()
        .map(|u| Unknown::parse(u))
        .collect::<Result<_, _>>()?;
    let text = read_data(&args.data)?;
    let data_name = args.data.display().to_string();
    let readings = parse_readings(&text).with_context(|| format!("--data {data_name}"))?;
    let file_name = args
        .data
        .file_name()
        .map_or_else(|| data_name.clone(), |n| n.to_string_lossy().into_owned());
    let date = crate::report::today();
    let titration = MeasuredTitration {
        name: file_name.clone(),
        titrant: args.titrant.clone(),
        normality: args.normality,
        sample_g,
        titrant_by_mass: args.titrant_by_mass,
        points: readings.points,
        source_file: file_name.clone(),
        imported: date.clone(),
    };
    let f = fit::fit(&r.library, r.conditions, &r.recipe, &titration, &unknowns)?;
    let saved = match &args.save_to_library {
        Some(name) => {
            let titrant_id =
                saltwise_chem::qc::Titrant::find(&r.library, &args.titrant, args.normality)?
                    .id()
                    .to_owned();
            let how = format!(
                "{sample_g} g of product titrated with {} N {titrant_id}, {} readings",
                args.normality,
                titration.points.len()
            );
            let note = format!(
                "Provenance: data file {file_name}, fitted {date} ({how}): {}",
                fitted_words(&f)
            );
            let entry = fitted_entry(&r.library, &f, name, args.formula.as_deref(), &note)?;
            let provenance = Provenance {
                id: name.trim().to_owned(),
                data_file: file_name.clone(),
                date: date.clone(),
                fitted: fitted_words(&f),
                titration: how,
            };
            // Checked against the library without the user's entries already in it (`save`
            // reads the user library and checks the whole of it).
            let base = base_library(&args.recipe)?;
            Some((
                name.trim().to_owned(),
                user_lib::save(&base, entry, provenance)?,
            ))
        }
        None => None,
    };
    let out = if args.recipe.json {
        let mut v = to_json(&f, &titration, &data_name);
        if let (Some((id, path)), Some(obj)) = (&saved, v.as_object_mut()) {
            obj.insert(
                "saved_to_library".into(),
                json!({"id": id, "file": path.display().to_string()}),
            );
        }
        format!("{}\n", serde_json::to_string_pretty(&v)?)
    } else {
        let mut t = to_text(&f, &titration, &data_name);
        if let Some((id, path)) = &saved {
            t += &format!("\nsaved '{id}' to the user library {}\n", path.display());
        }
        t
    };
    std::io::stdout()
        .lock()
        .write_all(out.as_bytes())
        .context("writing to stdout")?;
    Ok(ExitCode::SUCCESS)
}

/// The library the saved entry is checked against: built-in and project custom ingredients,
/// without the user library (which `save` reads and checks itself).
fn base_library(recipe: &RecipeArgs) -> Result<saltwise_chem::Library> {
    let built_in = saltwise_chem::Library::built_in().context("the built-in library")?;
    match &recipe.project {
        Some(path) => Ok(saltwise_chem::project::Project::load_with_library(path, &built_in)?.1),
        None => Ok(built_in),
    }
}

/// A number for JSON: `null` when not finite.
fn num(v: f64) -> Value {
    if v.is_finite() { json!(v) } else { Value::Null }
}

fn to_json(f: &Fit, t: &MeasuredTitration, data: &str) -> Value {
    json!({
        "data": data,
        "sample_g": t.sample_g,
        "titrant": t.titrant,
        "normality": t.normality,
        "titrant_by_mass": t.titrant_by_mass,
        "titrant_density_kg_per_l": TITRANT_DENSITY_KG_PER_L,
        "parameters": f.parameters.iter().map(|p| json!({
            "name": p.name,
            "value": num(p.value),
            "std_error": p.std_error.map_or(Value::Null, num),
            "unit": p.unit,
            "start": num(p.start),
            "determined": p.determined,
        })).collect::<Vec<_>>(),
        "correlation": f.correlation.iter()
            .map(|row| row.iter().map(|&c| num(c)).collect::<Vec<_>>())
            .collect::<Vec<_>>(),
        "rms_ph": num(f.rms_ph),
        "start_rms_ph": num(f.start_rms_ph),
        "degrees_of_freedom": f.degrees_of_freedom,
        "converged": f.converged,
        "termination": f.termination,
        "residuals": f.residuals.iter().map(|r| json!({
            "titrant": r.titrant,
            "ml": r.ml,
            "measured_ph": r.measured_ph,
            "start_ph": num(r.start_ph),
            "fitted_ph": num(r.fitted_ph),
            "residual": num(r.residual),
        })).collect::<Vec<_>>(),
        "warnings": f.warnings.iter().map(|w| ascii(w)).collect::<Vec<_>>(),
    })
}

fn to_text(f: &Fit, t: &MeasuredTitration, data: &str) -> String {
    let unit = if t.titrant_by_mass { "g" } else { "mL" };
    let mut s = format!(
        "{} readings from {data}: {} g of product titrated with {} N {} (density taken as {:.2} kg/L)\n",
        t.points.len(),
        t.sample_g,
        t.normality,
        t.titrant,
        TITRANT_DENSITY_KG_PER_L
    );
    s += &format!(
        "fit {}; RMS residual {:.4} pH (before the fit {:.4} pH), {} degrees of freedom\n\n",
        if f.converged {
            "converged".to_owned()
        } else {
            format!("did not converge ({})", f.termination)
        },
        f.rms_ph,
        f.start_rms_ph,
        f.degrees_of_freedom
    );
    s += &format!(
        "{:<28} {:>14} {:>12}  {}\n",
        "parameter", "value", "std error", "unit"
    );
    for p in &f.parameters {
        let se = p
            .std_error
            .map_or_else(|| "—".to_owned(), |e| format!("{e:.4}"));
        let mark = if p.determined {
            ""
        } else {
            "  (not determined)"
        };
        s += &format!(
            "{:<28} {:>14.4} {:>12}  {}{mark}\n",
            p.name, p.value, se, p.unit
        );
    }
    if f.parameters.len() > 1 {
        s += "\ncorrelation\n";
        for (p, row) in f.parameters.iter().zip(&f.correlation) {
            s += &format!("{:<28}", p.name);
            for c in row {
                if c.is_finite() {
                    s += &format!(" {c:>8.4}");
                } else {
                    s += &format!(" {:>8}", "—");
                }
            }
            s += "\n";
        }
    }
    s += &format!(
        "\n{:>10} {:>10} {:>10} {:>10}\n",
        unit, "pH read", "pH fitted", "residual"
    );
    for r in &f.residuals {
        s += &format!(
            "{:>10.3} {:>10.3} {:>10.3} {:>+10.4}\n",
            r.titrant, r.measured_ph, r.fitted_ph, r.residual
        );
    }
    for w in &f.warnings {
        s += &format!("\nwarning: {w}\n");
    }
    s
}
