//! `saltwise-cli sweep`: pH of a recipe against dilution with water or against temperature.

use std::io::Write;
use std::process::ExitCode;

use anyhow::{Context, Result, anyhow};
use clap::{ArgGroup, Args};
use saltwise_chem::Constants;
use saltwise_chem::limits::parse_number;
use saltwise_chem::report::evaluate_with;
use saltwise_chem::sweep::{self, SweepPoint};
use serde_json::json;

use crate::args::RecipeArgs;
use crate::input;

/// Arguments of `sweep`: a recipe and exactly one of a dilution or a temperature range.
#[derive(Debug, Args)]
#[command(group(ArgGroup::new("axis").required(true).args(["dilute", "temp_range"])))]
pub struct SweepArgs {
    /// The recipe and its settings, as for `ph`.
    #[command(flatten)]
    pub recipe: RecipeArgs,
    /// Dilution range FROM..TO (mass of diluted liquid / mass of product, FROM ≥ 1), log-spaced.
    #[arg(long, value_name = "FROM..TO", allow_hyphen_values = true)]
    pub dilute: Option<String>,
    /// Temperature range FROM..TO in °C (0–95), evenly spaced.
    #[arg(long, value_name = "FROM..TO", allow_hyphen_values = true)]
    pub temp_range: Option<String>,
    /// Number of points.
    #[arg(long, default_value_t = 11)]
    pub points: usize,
    /// Print CSV with header dilution,ph or temp_c,ph.
    #[arg(long, conflicts_with = "json")]
    pub csv: bool,
}

/// Splits `FROM..TO` into two numbers.
fn parse_range(text: &str, flag: &str) -> Result<(f64, f64)> {
    let (from, to) = text
        .split_once("..")
        .ok_or_else(|| anyhow!("{flag} '{text}' is not FROM..TO (e.g. 1..100)"))?;
    let num =
        |t: &str| parse_number(t).ok_or_else(|| anyhow!("{flag}: '{}' is not a number", t.trim()));
    Ok((num(from)?, num(to)?))
}

/// `saltwise-cli sweep`.
pub fn run(args: &SweepArgs) -> Result<ExitCode> {
    let r = input::resolve(&args.recipe)?;
    let constants = Constants::new(&r.library, r.conditions);
    let report = evaluate_with(&r.library, &constants, &r.recipe)?;
    let (column, points): (&str, Vec<SweepPoint>) = match (&args.dilute, &args.temp_range) {
        (Some(d), None) => {
            let (from, to) = parse_range(d, "--dilute")?;
            let p =
                sweep::dilution_sweep(&r.library, &constants, &report.batch, from, to, args.points)
                    .context("--dilute")?;
            ("dilution", p)
        }
        (None, Some(t)) => {
            let (from, to) = parse_range(t, "--temp-range")?;
            let p = sweep::temperature_sweep(
                &r.library,
                r.conditions,
                &report.batch,
                from,
                to,
                args.points,
            )
            .context("--temp-range")?;
            ("temp_c", p)
        }
        _ => anyhow::bail!("give exactly one of --dilute FROM..TO or --temp-range FROM..TO"),
    };
    let text = if args.csv {
        let mut w = csv::Writer::from_writer(Vec::new());
        w.write_record([column, "ph"])?;
        for p in &points {
            w.write_record([p.x.to_string(), p.ph.to_string()])?;
        }
        String::from_utf8_lossy(&w.into_inner().context("writing CSV")?).into_owned()
    } else if args.recipe.json {
        let v = json!({
            "points": points.iter().map(|p| json!({column: p.x, "ph": p.ph})).collect::<Vec<_>>(),
        });
        format!("{}\n", serde_json::to_string_pretty(&v)?)
    } else {
        let mut t = format!("{column:>12} {:>8}\n", "ph");
        for p in &points {
            t += &format!("{:>12.4} {:>8.3}\n", p.x, p.ph);
        }
        t
    };
    std::io::stdout()
        .lock()
        .write_all(text.as_bytes())
        .context("writing to stdout")?;
    Ok(ExitCode::SUCCESS)
}
