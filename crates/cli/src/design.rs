//! `saltwise-cli design`: the grams of an acid and a salt form of one system for a target pH and
//! buffer capacity, with the rest of the recipe present.

use std::io::Write;
use std::process::ExitCode;

use anyhow::{Context, Result};
use clap::Args;
use saltwise_chem::Constants;
use saltwise_chem::design::design;
use serde_json::json;

use crate::args::RecipeArgs;
use crate::input;

/// Arguments of `design`.
#[derive(Debug, Args)]
pub struct DesignArgs {
    #[command(flatten)]
    pub recipe: RecipeArgs,
    /// The acid form, a library id (e.g. citric_acid_monohydrate).
    #[arg(long, value_name = "ID")]
    pub acid: String,
    /// The salt (base) form of the same system, a library id (e.g. trisodium_citrate_dihydrate).
    #[arg(long, value_name = "ID")]
    pub base: String,
    /// The pH to reach.
    #[arg(long, value_name = "X", allow_negative_numbers = true)]
    pub target_ph: f64,
    /// The buffer capacity to reach, mol/kg water per pH.
    #[arg(long, value_name = "B", allow_negative_numbers = true)]
    pub capacity: f64,
}

/// `saltwise-cli design`.
pub fn run(args: &DesignArgs) -> Result<ExitCode> {
    let r = input::resolve(&args.recipe)?;
    let target = input::target_ph(args.target_ph)?;
    let constants = Constants::new(&r.library, r.conditions);
    let d = design(
        &r.library,
        &constants,
        &r.recipe,
        &args.acid,
        &args.base,
        target,
        args.capacity,
    )?;
    let text = if args.recipe.json {
        let v = json!({
            "acid": args.acid,
            "base": args.base,
            "acid_g": d.acid_g,
            "base_g": d.base_g,
            "ph": d.ph,
            "buffer_capacity": d.buffer_capacity,
            "system_molality": d.system_molal,
        });
        format!("{}\n", serde_json::to_string_pretty(&v)?)
    } else {
        format!(
            "{:.4} g {} + {:.4} g {}: pH {:.3}, buffer capacity {:.4} mol/kg water per pH ({:.4} mol/kg water of the system)\n",
            d.acid_g, args.acid, d.base_g, args.base, d.ph, d.buffer_capacity, d.system_molal
        )
    };
    std::io::stdout()
        .lock()
        .write_all(text.as_bytes())
        .context("writing to stdout")?;
    Ok(ExitCode::SUCCESS)
}
