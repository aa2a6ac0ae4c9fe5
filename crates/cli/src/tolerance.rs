//! `saltwise-cli tolerance`: the pH band of a recipe under weighing tolerances and assay ranges.

use std::io::Write;
use std::process::ExitCode;

use anyhow::{Context, Result, anyhow, bail};
use clap::Args;
use saltwise_chem::Constants;
use saltwise_chem::tolerance::{Band, Tolerances, band};
use serde_json::json;

use crate::args::RecipeArgs;
use crate::input;

/// Arguments of `tolerance`.
#[derive(Debug, Args)]
pub struct ToleranceArgs {
    #[command(flatten)]
    pub recipe: RecipeArgs,
    /// Weighing tolerance of one ingredient's lines, ID=P% (± P %), e.g. citric_acid=2%.
    #[arg(long, value_name = "ID=P%")]
    pub vary: Vec<String>,
    /// Weighing tolerance (± P %) of every line not named by --vary, e.g. 1%.
    #[arg(long, value_name = "P%", allow_hyphen_values = true)]
    pub vary_all: Option<String>,
    /// Assay range of an ingredient, ID=LO..HI as fractions (0.98..1.0) or % (98%..100%).
    #[arg(long, value_name = "ID=LO..HI")]
    pub assay: Vec<String>,
    /// Number of Monte Carlo samples.
    #[arg(long, default_value_t = 1000)]
    pub samples: usize,
    /// Seed of the random draws; the same seed gives the same numbers.
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
}

/// An assay end: `98%` as a percentage or `0.98` as a fraction.
fn assay_end(text: &str, id: &str) -> Result<f64> {
    let t = text.trim();
    let (t, scale) = match t.strip_suffix('%') {
        Some(p) => (p.trim(), 0.01),
        None => (t, 1.0),
    };
    let v: f64 = t
        .parse()
        .map_err(|_| anyhow!("--assay {id}: '{text}' is not a number (e.g. 0.98 or 98%)"))?;
    if scale == 1.0 && v > 1.0 {
        bail!("--assay {id}: '{text}' is above 1; give a fraction (0.98) or a percentage (98%)");
    }
    Ok(v * scale)
}

/// Builds the tolerances from the flags.
fn tolerances(args: &ToleranceArgs) -> Result<Tolerances> {
    let mut t = Tolerances::default();
    if let Some(all) = &args.vary_all {
        t.all_percent = input::percent(all, "--vary-all")?;
    }
    for v in &args.vary {
        let (id, p) = v
            .split_once('=')
            .ok_or_else(|| anyhow!("--vary '{v}' is not ID=P% (e.g. citric_acid=2%)"))?;
        t.per_ingredient
            .push((id.trim().to_owned(), input::percent(p, "--vary")?));
    }
    for a in &args.assay {
        let (id, range) = a.split_once('=').ok_or_else(|| {
            anyhow!("--assay '{a}' is not ID=LO..HI (e.g. lactic_acid_88=0.87..0.89)")
        })?;
        let id = id.trim();
        let (lo, hi) = range
            .split_once("..")
            .ok_or_else(|| anyhow!("--assay {id}: '{range}' is not LO..HI"))?;
        t.assay
            .push((id.to_owned(), assay_end(lo, id)?, assay_end(hi, id)?));
    }
    Ok(t)
}

/// `saltwise-cli tolerance`.
pub fn run(args: &ToleranceArgs) -> Result<ExitCode> {
    let r = input::resolve(&args.recipe)?;
    let tol = tolerances(args)?;
    let constants = Constants::new(&r.library, r.conditions);
    let b = band(
        &r.library,
        &constants,
        &r.recipe,
        &tol,
        args.samples,
        args.seed,
    )?;
    let text = if args.recipe.json {
        format!("{}\n", serde_json::to_string_pretty(&as_json(&b))?)
    } else {
        as_text(&b)
    };
    std::io::stdout()
        .lock()
        .write_all(text.as_bytes())
        .context("writing to stdout")?;
    Ok(ExitCode::SUCCESS)
}

fn as_json(b: &Band) -> serde_json::Value {
    json!({
        "nominal_ph": b.nominal_ph,
        "p05": b.p05,
        "p50": b.p50,
        "p95": b.p95,
        "samples": b.samples,
        "seed": b.seed,
        "not_converged": b.not_converged,
        "sensitivity": b.sensitivity.iter().map(|s| json!({
            "id": s.id,
            "line": s.line,
            "dph_per_percent": s.dph_per_percent,
        })).collect::<Vec<_>>(),
    })
}

fn as_text(b: &Band) -> String {
    let mut t = format!(
        "nominal pH {:.3}; band over {} samples (seed {}): 5 % {:.3}, median {:.3}, 95 % {:.3}\n",
        b.nominal_ph, b.samples, b.seed, b.p05, b.p50, b.p95
    );
    if b.not_converged > 0 {
        t += &format!(
            "{} samples did not converge; their last estimates are counted\n",
            b.not_converged
        );
    }
    t += "sensitivity (pH change per +1 % of the line's amount, largest first)\n";
    for s in &b.sensitivity {
        t += &format!("  {:<36} {:+.5}\n", s.id, s.dph_per_percent);
    }
    t
}
