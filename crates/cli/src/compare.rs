//! `saltwise-cli compare`: every variant of one or more project files side by side.

use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

use anyhow::{Context, Result};
use clap::Args;
use saltwise_chem::project::Project;
use saltwise_chem::text::ascii;
use saltwise_chem::variant::{Summary, summarise};
use saltwise_chem::{Conditions, Constants, Library};
use serde_json::{Value, json};

/// Arguments of `compare`.
#[derive(Debug, Args)]
pub struct CompareArgs {
    /// Project files saved by the workbench.
    #[arg(required = true, value_name = "FILE.ron")]
    pub files: Vec<PathBuf>,
    /// Print JSON instead of text.
    #[arg(long)]
    pub json: bool,
}

/// One variant's row with the file it came from.
struct Row {
    file: String,
    summary: Summary,
}

/// Solves every variant of every file at its project's own settings.
fn rows(files: &[PathBuf]) -> Result<Vec<Row>> {
    let base = Library::built_in().context("the built-in library")?;
    let mut rows = Vec::new();
    for path in files {
        let (project, library) = Project::load_with_library(path, &base)?;
        let s = &project.settings;
        let constants = Constants::new(
            &library,
            Conditions {
                temp_c: s.temp_c,
                activity: s.activity,
            },
        );
        for v in project.variants() {
            let summary = summarise(&library, &constants, v, Some(&s.adjuster))
                .with_context(|| format!("{}, variant '{}'", path.display(), v.name))?;
            rows.push(Row {
                file: path.display().to_string(),
                summary,
            });
        }
    }
    Ok(rows)
}

fn row_json(r: &Row) -> Value {
    let s = &r.summary;
    json!({
        "file": r.file,
        "name": ascii(&s.name),
        "ph": s.ph,
        "p_h_conc": s.p_h_conc,
        "buffer_capacity": s.buffer_capacity,
        "ionic_strength": s.ionic_strength,
        "buffer_forming_g_per_kg": s.buffer_forming_g_per_kg,
        "cost_per_kg": s.cost_per_kg,
        "missing_prices": s.missing_prices,
        "cautions": s.cautions.len(),
        "caution_titles": s.cautions.iter().map(|t| ascii(t)).collect::<Vec<_>>(),
        "warnings": s.warnings.iter().map(|w| ascii(w)).collect::<Vec<_>>(),
    })
}

fn table(rows: &[Row]) -> String {
    let mut t = format!(
        "{:<28} {:>6} {:>6} {:>10} {:>8} {:>9} {:>9}  cautions\n",
        "variant", "pH", "p[H]", "capacity", "I", "buffer", "cost/kg"
    );
    t += &format!(
        "{:<28} {:>6} {:>6} {:>10} {:>8} {:>9} {:>9}\n",
        "", "", "", "mol/kg/pH", "mol/kg", "g/kg", ""
    );
    let several = rows.windows(2).any(|w| w[0].file != w[1].file);
    for (i, r) in rows.iter().enumerate() {
        if several && (i == 0 || rows[i - 1].file != r.file) {
            t += &format!("{}\n", r.file);
        }
        let s = &r.summary;
        let cost = s
            .cost_per_kg
            .map_or_else(|| "no price".to_owned(), |c| format!("{c:.3}"));
        let cautions = if s.cautions.is_empty() {
            "none".to_owned()
        } else {
            format!("{}: {}", s.cautions.len(), s.cautions.join(", "))
        };
        t += &format!(
            "{:<28} {:>6.2} {:>6.2} {:>10.4} {:>8.4} {:>9.2} {:>9}  {cautions}\n",
            s.name,
            s.ph,
            s.p_h_conc,
            s.buffer_capacity,
            s.ionic_strength,
            s.buffer_forming_g_per_kg,
            cost
        );
    }
    t
}

/// `saltwise-cli compare`.
pub fn run(args: &CompareArgs) -> Result<ExitCode> {
    let rows = rows(&args.files)?;
    let text = if args.json {
        let v = json!({ "variants": rows.iter().map(row_json).collect::<Vec<_>>() });
        format!("{}\n", serde_json::to_string_pretty(&v)?)
    } else {
        table(&rows)
    };
    std::io::stdout()
        .lock()
        .write_all(text.as_bytes())
        .context("writing to stdout")?;
    Ok(ExitCode::SUCCESS)
}
