//! `saltwise-cli titrate`: the QC titration of a sample of product predicted — titrant volume to
//! each end point, the curve, and the titration factor for an in-use sample.

use std::io::Write;
use std::process::ExitCode;

use anyhow::{Context, Result};
use clap::Args;
use saltwise_chem::Constants;
use saltwise_chem::qc::{self, Prediction, Request, TITRANT_DENSITY_KG_PER_L, Titrant};
use saltwise_chem::report::evaluate_with;
use saltwise_chem::text::ascii;
use serde_json::{Value, json};

use crate::args::RecipeArgs;
use crate::input;

/// Arguments of `titrate`.
#[derive(Debug, Args)]
pub struct TitrateArgs {
    /// The product, as for `ph`.
    #[command(flatten)]
    pub recipe: RecipeArgs,
    /// Mass of product titrated, e.g. 10g.
    #[arg(long, value_name = "MASS")]
    pub sample: String,
    /// A strong acid or base: library id, formula or id without grade (hcl, naoh, hydrochloric_acid).
    #[arg(long, value_name = "ID")]
    pub titrant: String,
    /// Normality of the titrant, mol/L (above 0, at most 1; density taken as 1.00 kg/L).
    #[arg(long, value_name = "N", allow_negative_numbers = true)]
    pub normality: f64,
    /// An end point pH, repeatable; default 8.3 and 4.3 with an acid titrant, 8.3 with a base.
    #[arg(long = "endpoint", value_name = "PH", allow_negative_numbers = true)]
    pub endpoints: Vec<f64>,
    /// Number of points on the curve.
    #[arg(long, default_value_t = qc::DEFAULT_POINTS)]
    pub points: usize,
    /// mL of in-use solution titrated on the plant floor: prints the titration factor (first end point).
    #[arg(long, value_name = "V", allow_negative_numbers = true)]
    pub in_use_sample_ml: Option<f64>,
    /// Carbonate this % of the product's free hydroxide first (2 OH- + CO2 -> CO3-- + H2O).
    #[arg(long, value_name = "P%", allow_hyphen_values = true)]
    pub carbonated: Option<String>,
    /// Print CSV with header ml,ph.
    #[arg(long, conflicts_with = "json")]
    pub csv: bool,
}

/// `saltwise-cli titrate`.
pub fn run(args: &TitrateArgs) -> Result<ExitCode> {
    let r = input::resolve(&args.recipe)?;
    let sample_g = input::mass_g(&args.sample).context("--sample")?;
    // Its errors name the titrant or the normality themselves.
    let titrant = Titrant::find(&r.library, &args.titrant, args.normality)?;
    let carbonated_percent = args
        .carbonated
        .as_deref()
        .map(|c| input::percent(c, "--carbonated"))
        .transpose()?;
    let constants = Constants::new(&r.library, r.conditions);
    let report = evaluate_with(&r.library, &constants, &r.recipe)?;
    let request = Request {
        sample_g,
        end_points_ph: args.endpoints.clone(),
        points: args.points,
        in_use_sample_ml: args.in_use_sample_ml,
        carbonated_percent,
    };
    let p = qc::predict(&r.library, &constants, &report.batch, &titrant, &request)?;
    let text = if args.csv {
        let mut w = csv::Writer::from_writer(Vec::new());
        w.write_record(["ml", "ph"])?;
        for q in &p.points {
            w.write_record([q.ml.to_string(), q.ph.to_string()])?;
        }
        String::from_utf8_lossy(&w.into_inner().context("writing CSV")?).into_owned()
    } else if args.recipe.json {
        format!(
            "{}\n",
            serde_json::to_string_pretty(&to_json(&p, &titrant, &request))?
        )
    } else {
        to_text(&p, &titrant, &request)
    };
    std::io::stdout()
        .lock()
        .write_all(text.as_bytes())
        .context("writing to stdout")?;
    Ok(ExitCode::SUCCESS)
}

fn to_json(p: &Prediction, titrant: &Titrant, request: &Request) -> Value {
    let mut v = json!({
        "sample_g": request.sample_g,
        "titrant": titrant.id(),
        "titrant_kind": titrant.kind().label(),
        "normality": titrant.normality(),
        "titrant_density_kg_per_l": TITRANT_DENSITY_KG_PER_L,
        "carbonated_percent": request.carbonated_percent,
        "start_ph": p.start_ph,
        "endpoints": p.end_points.iter().map(|e| json!({
            "ph": e.ph,
            "ml": e.ml,
            "meq": e.meq,
            "at_start": e.at_start,
        })).collect::<Vec<_>>(),
        "points": p.points.iter().map(|q| json!({"ml": q.ml, "ph": q.ph})).collect::<Vec<_>>(),
        "warnings": p.warnings.iter().map(|w| ascii(w)).collect::<Vec<_>>(),
    });
    if let (Some(f), Some(obj)) = (&p.factor, v.as_object_mut()) {
        obj.insert("titration_factor".into(), json!(f.percent_per_ml));
        obj.insert("in_use_sample_ml".into(), json!(f.in_use_sample_ml));
        obj.insert("titration_factor_endpoint_ph".into(), json!(f.end_point_ph));
    }
    v
}

fn to_text(p: &Prediction, titrant: &Titrant, request: &Request) -> String {
    let mut t = format!(
        "{} g of product titrated with {} N {} (strong {}); titrant density taken as {:.2} kg/L, 1 mL bringing 1 g of water\n",
        request.sample_g,
        titrant.normality(),
        titrant.id(),
        titrant.kind().label(),
        TITRANT_DENSITY_KG_PER_L,
    );
    if let Some(c) = request.carbonated_percent {
        t +=
            &format!("after {c} % of the product's free hydroxide has taken up CO₂ as carbonate\n");
    }
    t += &format!("start pH {:.2}\n", p.start_ph);
    for e in &p.end_points {
        if e.at_start {
            t += &format!(
                "end point pH {:.2}: 0 mL (the sample is already past it)\n",
                e.ph
            );
        } else {
            t += &format!(
                "end point pH {:.2}: {:.3} mL ({:.4} meq)\n",
                e.ph, e.ml, e.meq
            );
        }
    }
    if let Some(f) = &p.factor {
        t += &format!(
            "titration factor {:.4} % of product per mL ({} mL in-use sample, end point pH {:.2})\n",
            f.percent_per_ml, f.in_use_sample_ml, f.end_point_ph
        );
    }
    t += &format!("\n{:>10} {:>8}\n", "ml", "ph");
    for q in &p.points {
        t += &format!("{:>10.3} {:>8.3}\n", q.ml, q.ph);
    }
    for w in &p.warnings {
        t += &format!("\nwarning: {w}\n");
    }
    t
}
