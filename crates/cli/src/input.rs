//! Turns arguments into a library, a recipe and conditions: the one place inputs are checked.

use anyhow::{Context, Result, anyhow, bail};
use saltwise_chem::amount::Unit;
use saltwise_chem::limits;
use saltwise_chem::project::Project;
use saltwise_chem::{ActivityModel, Amount, Conditions, Library, Recipe, RecipeLine};

use crate::args::{Activity, HardnessAs, RecipeArgs};
use saltwise_chem::recipe::{Hardness, HardnessAnion};

/// A recipe ready to solve.
pub struct Resolved {
    pub library: Library,
    pub recipe: Recipe,
    pub conditions: Conditions,
    /// The project's chosen pH adjuster, when read from a project file.
    pub adjuster: Option<String>,
    /// The project's chosen active form per system id, when read from a project file.
    pub active_forms: std::collections::BTreeMap<String, usize>,
    /// Whether the project lets supersaturated solids settle out.
    pub precipitate: bool,
}

/// Builds the library, recipe and conditions from the arguments (and project file, if any).
pub fn resolve(args: &RecipeArgs) -> Result<Resolved> {
    let mut library = Library::built_in().context("the built-in library")?;
    // Entries the user saved (fitted ingredients), from the data folder.
    library = crate::user_lib::extend(library)?;
    let mut conditions = Conditions::default();
    let mut recipe = Recipe::default();
    let mut adjuster = None;
    let mut active_forms = std::collections::BTreeMap::new();
    let mut precipitate = false;
    if let Some(path) = &args.project {
        // The same checked loader as the window: limits, custom ingredients, unknown ids with
        // their line and column.
        let (project, with_custom) = Project::load_with_library(path, &library)?;
        library = with_custom;
        adjuster = Some(project.settings.adjuster.clone());
        active_forms = project.settings.active_forms.clone();
        precipitate = project.settings.precipitate;
        conditions = Conditions {
            temp_c: project.settings.temp_c,
            activity: project.settings.activity,
        };
        let variant = match &args.variant {
            None => project.variant(),
            Some(name) => {
                let i = project.variant_index(name).ok_or_else(|| {
                    let names: Vec<String> = project
                        .variants()
                        .iter()
                        .map(|v| format!("'{}'", v.name))
                        .collect();
                    anyhow!(
                        "--variant: {} has no variant called '{name}'; its variants are {}",
                        path.display(),
                        names.join(", ")
                    )
                })?;
                &project.variants()[i]
            }
        };
        recipe = variant.recipe.clone();
    }
    for item in &args.items {
        let (id, amount) = parse_item(item)?;
        recipe.lines.push(RecipeLine {
            ingredient: id,
            amount,
            enabled: true,
        });
    }
    if let Some(qs) = &args.qs_to {
        let g = mass_g(qs).with_context(|| "--qs-to")?;
        recipe.qs_to_g = Some(limits::BATCH_G.check(g).with_context(|| "--qs-to")?);
    }
    if let Some(ppm) = args.hardness {
        let mut h = recipe.water_hardness.unwrap_or_else(|| Hardness::ppm(ppm));
        h.ppm_caco3 = ppm;
        if let Some(share) = args.hardness_calcium {
            h.calcium_share = share;
        }
        if let Some(anion) = args.hardness_as {
            h.anion = match anion {
                HardnessAs::Bicarbonate => HardnessAnion::HydrogenCarbonate,
                HardnessAs::Chloride => HardnessAnion::Chloride,
            };
        }
        h.check().with_context(|| "--hardness")?;
        recipe.water_hardness = Some(h);
    } else if args.hardness_calcium.is_some() || args.hardness_as.is_some() {
        bail!("--hardness-calcium and --hardness-as need --hardness PPM");
    }
    if recipe.lines.is_empty() && recipe.qs_to_g.is_none() {
        bail!(
            "no ingredients: give id=AMOUNT items (e.g. water=900g citric_acid=10g) or --project FILE"
        );
    }
    if let Some(t) = args.temp {
        conditions.temp_c = t;
    }
    if let Some(a) = args.activity {
        conditions.activity = match a {
            Activity::Auto => ActivityModel::Auto,
            Activity::Davies => ActivityModel::Davies,
            Activity::Pitzer => ActivityModel::Pitzer,
            Activity::Ideal => ActivityModel::Ideal,
        };
    }
    saltwise_chem::report::check_temperature(conditions.temp_c)?;
    Ok(Resolved {
        library,
        recipe,
        conditions,
        adjuster,
        active_forms,
        precipitate,
    })
}

/// Splits `id=AMOUNT`.
pub fn parse_item(item: &str) -> Result<(String, Amount)> {
    let (id, amount) = item
        .split_once('=')
        .ok_or_else(|| anyhow!("'{item}' is not id=AMOUNT (e.g. citric_acid=12.5g)"))?;
    let amount = Amount::parse(amount).map_err(|e| anyhow!("{id}: {e}"))?;
    check_amount(id, amount.value)?;
    Ok((id.trim().to_owned(), amount))
}

/// A mass such as `1000g` or `1.2kg`, in grams.
pub fn mass_g(text: &str) -> Result<f64> {
    let a = Amount::parse(text).map_err(|e| anyhow!(e))?;
    if !a.value.is_finite() || a.value < 0.0 {
        check_amount("q.s. batch size", a.value)?;
    }
    Ok(match a.unit {
        Unit::Gram => a.value,
        Unit::Kilogram => a.value * 1e3,
        Unit::Milligram => a.value * 1e-3,
        Unit::Mole | Unit::Percent => bail!("'{text}' is not a mass; use g, kg or mg"),
    })
}

/// A percentage such as `2%` or `2`.
pub fn percent(text: &str, what: &str) -> Result<f64> {
    let t = text.trim();
    let t = t.strip_suffix('%').unwrap_or(t).trim();
    let v: f64 = t
        .parse()
        .map_err(|_| anyhow!("{what} '{text}' is not a percentage (e.g. 2%)"))?;
    if !v.is_finite() {
        bail!("{what} '{text}' is not a finite number");
    }
    Ok(v)
}

fn check_amount(id: &str, v: f64) -> Result<()> {
    limits::AMOUNT.check_as(v, &format!("amount of {id}"))?;
    Ok(())
}

/// A target pH, checked against the limits table.
pub fn target_ph(value: f64) -> Result<f64> {
    limits::TARGET_PH.check(value).context("--target-ph")
}

/// Parses `id=FROM..TO` with units into (id, from_g, to_g).
pub fn parse_dose_range(text: &str, library: &Library) -> Result<(String, f64, f64)> {
    let (id, range) = text.split_once('=').ok_or_else(|| {
        anyhow!("--dose '{text}' is not id=FROM..TO (e.g. sodium_hydroxide_50=0..20g)")
    })?;
    let id = id.trim();
    let entry = library.entry(id).ok_or_else(|| {
        let s = library.suggest(id);
        if s.is_empty() {
            anyhow!("unknown ingredient '{id}'")
        } else {
            anyhow!("unknown ingredient '{id}'; did you mean {}?", s.join(", "))
        }
    })?;
    let (from, to) = range
        .split_once("..")
        .ok_or_else(|| anyhow!("--dose range '{range}' is not FROM..TO (e.g. 0..20g)"))?;
    let to_amount = Amount::parse(to).map_err(|e| anyhow!("--dose end: {e}"))?;
    if to_amount.unit == Unit::Percent {
        bail!("--dose: use g, kg, mg or mol for the dose range");
    }
    let from_amount = match Amount::parse(from) {
        Ok(a) => a,
        Err(_) => Amount {
            value: from
                .trim()
                .parse()
                .map_err(|_| anyhow!("--dose start '{from}' is not a number"))?,
            unit: to_amount.unit,
        },
    };
    check_amount(id, from_amount.value)?;
    check_amount(id, to_amount.value)?;
    let g = |a: Amount| {
        entry
            .grams(a)
            .ok_or_else(|| anyhow!("--dose: use g, kg, mg or mol"))
    };
    let (from_g, to_g) = (g(from_amount)?, g(to_amount)?);
    if to_g <= from_g {
        bail!("--dose range {from}..{to} is empty: the end must be above the start");
    }
    limits::DOSE_MAX_G
        .check_as(to_g, "--dose end")
        .context("--dose")?;
    Ok((id.to_owned(), from_g, to_g))
}
