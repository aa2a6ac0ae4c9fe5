//! The project file a workbench saves: variants of the recipe, settings, custom ingredients,
//! format version; version-1 files (one recipe) are migrated on load.
//!
//! Chem's only file I/O: loading with size and nesting limits, and atomic saving, so the window
//! and the command line share one tested path.

use std::collections::BTreeMap;
use std::fs;
use std::io::Write;
use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};

use crate::amount::Unit;
use crate::error::ProjectError;
use crate::library::{Library, LibraryData};
use crate::limits;
use crate::measured::MeasuredTitration;
use crate::recipe::{Recipe, RecipeLine};
use crate::solver::ActivityModel;
use crate::tolerance::{MAX_SAMPLES, Tolerances};
use crate::variant::{self, Variant};

/// The format version this build writes.
pub const FORMAT_VERSION: u32 = 2;
/// The name given to the one variant of a migrated version-1 project.
pub const FIRST_VARIANT: &str = "Main";
/// The largest project file read, in bytes.
pub const MAX_FILE_BYTES: u64 = 4 * 1024 * 1024;
/// The deepest nesting of brackets accepted in a project file.
pub const MAX_NESTING: usize = 64;

/// Settings saved with a project: conditions and what the charts show.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Settings {
    /// Temperature, °C.
    pub temp_c: f64,
    /// Activity model.
    pub activity: ActivityModel,
    /// Ingredient id of the pH adjuster on the dose curve.
    pub adjuster: String,
    /// Largest dose on the dose curve, g.
    pub dose_max_g: f64,
    /// Target pH of the batch, if any.
    pub target_ph: Option<f64>,
    /// Half-width of the target band, pH units.
    pub target_tolerance: f64,
    /// System id shown on the species chart, if chosen.
    pub species_system: Option<String>,
    /// Weighing tolerances and assay ranges for the pH band (none set: no band).
    pub tolerances: Tolerances,
    /// Samples drawn for the pH band.
    pub band_samples: usize,
    /// Seed of the pH band's draws (the same seed gives the same band).
    pub band_seed: u64,
    /// The active form chosen per system id (protons removed from the fully protonated form);
    /// systems not listed use their uncharged form, else the fully protonated one.
    pub active_forms: BTreeMap<String, usize>,
    /// The QC titration method predicted for the product.
    pub qc: crate::qc::Method,
    /// Whether supersaturated solids settle out in the readout (curves do not precipitate).
    pub precipitate: bool,
}

/// Samples of the pH band unless the project says otherwise.
pub const DEFAULT_BAND_SAMPLES: usize = 1000;

impl Default for Settings {
    fn default() -> Self {
        Self {
            temp_c: 25.0,
            activity: ActivityModel::Auto,
            adjuster: "sodium_hydroxide_50".into(),
            dose_max_g: 10.0,
            target_ph: None,
            target_tolerance: 0.1,
            species_system: None,
            tolerances: Tolerances::default(),
            band_samples: DEFAULT_BAND_SAMPLES,
            band_seed: 1,
            active_forms: BTreeMap::new(),
            qc: crate::qc::Method::default(),
            precipitate: false,
        }
    }
}

/// A saved project: one or more variants of a recipe sharing settings and custom ingredients.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Project {
    /// File format version.
    pub format_version: u32,
    /// Project name.
    pub name: String,
    /// Free notes.
    pub notes: String,
    /// The variants, in the order shown; never empty.
    variants: Vec<Variant>,
    /// Index of the variant being edited.
    current: usize,
    /// Conditions and chart settings.
    pub settings: Settings,
    /// Custom systems, ions and ingredients the recipe may use.
    pub custom: LibraryData,
    /// Measured titrations imported into the project (pH-meter readings), in the order added.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub measured: Vec<MeasuredTitration>,
}

/// A project as written in a file of any supported version, before migration.
#[derive(Deserialize)]
struct Stored {
    format_version: u32,
    #[serde(default)]
    name: String,
    #[serde(default)]
    notes: String,
    /// Version 1: the one recipe (written bare, not as an option).
    #[serde(default, deserialize_with = "present")]
    recipe: Option<Recipe>,
    /// Version 2: the variants.
    #[serde(default)]
    variants: Vec<Variant>,
    #[serde(default)]
    current: usize,
    #[serde(default)]
    settings: Settings,
    #[serde(default)]
    custom: LibraryData,
    #[serde(default)]
    measured: Vec<MeasuredTitration>,
}

/// Reads a field written bare as present (RON would otherwise expect `Some(…)`).
fn present<'de, D: serde::Deserializer<'de>>(d: D) -> Result<Option<Recipe>, D::Error> {
    Recipe::deserialize(d).map(Some)
}

impl Default for Project {
    fn default() -> Self {
        Self::with_recipe(Recipe::default())
    }
}

impl Project {
    /// An untitled project of one variant holding `recipe`, with default settings.
    pub fn with_recipe(recipe: Recipe) -> Self {
        Self {
            format_version: FORMAT_VERSION,
            name: "Untitled".into(),
            notes: String::new(),
            variants: vec![Variant::new(FIRST_VARIANT, recipe)],
            current: 0,
            settings: Settings::default(),
            custom: LibraryData::default(),
            measured: Vec::new(),
        }
    }

    /// The recipe of the current variant.
    pub fn recipe(&self) -> &Recipe {
        &self.variant().recipe
    }

    /// The recipe of the current variant, to edit.
    pub fn recipe_mut(&mut self) -> &mut Recipe {
        &mut self.variant_mut().recipe
    }

    /// The current variant.
    pub fn variant(&self) -> &Variant {
        &self.variants[self.current]
    }

    /// The current variant, to edit.
    pub fn variant_mut(&mut self) -> &mut Variant {
        &mut self.variants[self.current]
    }

    /// Every variant, in the order shown.
    pub fn variants(&self) -> &[Variant] {
        &self.variants
    }

    /// Index of the current variant.
    pub fn current(&self) -> usize {
        self.current
    }

    /// Index of the variant called `name`.
    pub fn variant_index(&self, name: &str) -> Option<usize> {
        self.variants.iter().position(|v| v.name == name.trim())
    }

    /// Makes variant `index` the current one; false when there is none.
    pub fn set_current(&mut self, index: usize) -> bool {
        if index < self.variants.len() {
            self.current = index;
            true
        } else {
            false
        }
    }

    /// Adds a copy of the current variant under a new name, right after it, and makes it
    /// current; returns its index.
    pub fn copy_current(&mut self) -> usize {
        let taken: Vec<&str> = self.variants.iter().map(|v| v.name.as_str()).collect();
        let mut copy = self.variant().clone();
        copy.name = variant::copy_name(&copy.name, &taken);
        self.current += 1;
        self.variants.insert(self.current, copy);
        self.current
    }

    /// Renames variant `index`, refusing empty, too long or duplicate names.
    pub fn rename_variant(&mut self, index: usize, name: &str) -> Result<(), String> {
        if index >= self.variants.len() {
            return Err(format!("there is no variant number {}", index + 1));
        }
        let others = self
            .variants
            .iter()
            .enumerate()
            .filter(|(i, _)| *i != index)
            .map(|(_, v)| v.name.clone());
        if let Some(problem) = variant::name_problem(name, others) {
            return Err(problem);
        }
        self.variants[index].name = name.trim().to_owned();
        Ok(())
    }

    /// Removes variant `index`, refusing to remove the last one; the current variant stays
    /// current (when it is the one removed, the variant that takes its place, or the last).
    pub fn remove_variant(&mut self, index: usize) -> Result<(), String> {
        if self.variants.len() <= 1 {
            return Err("a project keeps at least one variant".into());
        }
        if index >= self.variants.len() {
            return Err(format!("there is no variant number {}", index + 1));
        }
        self.variants.remove(index);
        if self.current > index || self.current >= self.variants.len() {
            self.current = self.current.saturating_sub(1);
        }
        Ok(())
    }
}

impl Project {
    /// The built-in demo: a mild hand-soap base buffered with lactic acid and sodium lactate.
    pub fn demo() -> Self {
        let line = |id: &str, value: f64, unit: Unit| RecipeLine {
            ingredient: id.into(),
            amount: crate::amount::Amount { value, unit },
            enabled: true,
        };
        let mut p = Self::with_recipe(Recipe {
            lines: vec![
                line("lactic_acid_88", 0.8, Unit::Percent),
                line("sodium_lactate_60", 1.2, Unit::Percent),
                line("sodium_benzoate", 0.4, Unit::Percent),
                line("sodium_chloride", 0.8, Unit::Percent),
            ],
            qs_to_g: Some(1000.0),
            water_hardness: None,
        });
        p.name = "Meadowbrook mild cleanser base (demo)".into();
        p.notes =
            "Invented demo recipe: lactate buffer, benzoate preservative, water q.s. to 1 kg."
                .into();
        p.settings = Settings {
            target_ph: Some(5.0),
            adjuster: "sodium_hydroxide_50".into(),
            dose_max_g: 20.0,
            ..Settings::default()
        };
        p
    }

    /// Serialises to pretty RON text.
    pub fn to_ron(&self) -> Result<String, ron::Error> {
        ron::ser::to_string_pretty(self, ron::ser::PrettyConfig::default().struct_names(false))
    }

    /// Parses a project from text; `origin` names it in errors. Migrates older versions: a
    /// version-1 recipe becomes the one variant, named [`FIRST_VARIANT`].
    pub fn from_ron(text: &str, origin: &str) -> Result<Self, ProjectError> {
        check_nesting(text, origin)?;
        let stored: Stored = ron::from_str(text).map_err(|e| ProjectError::Syntax {
            path: origin.to_owned(),
            line: e.span.start.line,
            column: e.span.start.col,
            message: e.code.to_string(),
        })?;
        let invalid = |message: &str| ProjectError::Invalid {
            path: origin.to_owned(),
            message: message.to_owned(),
        };
        let variants = match (stored.format_version, stored.recipe) {
            (1, Some(recipe)) if stored.variants.is_empty() => {
                vec![Variant::new(FIRST_VARIANT, recipe)]
            }
            (1, None) => return Err(invalid("a version-1 project needs its `recipe`")),
            (1, Some(_)) => {
                return Err(invalid(
                    "a version-1 project has one `recipe` and no `variants`; set format_version: 2 to use variants",
                ));
            }
            (2, None) if !stored.variants.is_empty() => stored.variants,
            (2, None) => {
                return Err(invalid(
                    "a version-2 project needs at least one variant in `variants`",
                ));
            }
            (2, Some(_)) => {
                return Err(invalid(
                    "a version-2 project keeps its recipes inside `variants`, not in `recipe`",
                ));
            }
            (found, _) => {
                return Err(ProjectError::Version {
                    path: origin.to_owned(),
                    found,
                    supported: FORMAT_VERSION,
                });
            }
        };
        if stored.current >= variants.len() {
            return Err(invalid(&format!(
                "`current` is {} but there are only {} variants (counted from 0)",
                stored.current,
                variants.len()
            )));
        }
        let project = Self {
            format_version: FORMAT_VERSION,
            name: stored.name,
            notes: stored.notes,
            variants,
            current: stored.current,
            settings: stored.settings,
            custom: stored.custom,
            measured: stored.measured,
        };
        project.validate(origin)?;
        Ok(project)
    }

    /// "recipe line N" for messages, naming the variant when there are several.
    fn line_label(&self, variant: usize, line: usize) -> String {
        if self.variants.len() > 1 {
            format!(
                "variant '{}', recipe line {}",
                self.variants[variant].name,
                line + 1
            )
        } else {
            format!("recipe line {}", line + 1)
        }
    }

    /// Checks amounts and settings against the input limits ([`crate::limits`]).
    pub fn validate(&self, origin: &str) -> Result<(), ProjectError> {
        let bad = |e: crate::error::LimitError| ProjectError::Invalid {
            path: origin.to_owned(),
            message: e.to_string(),
        };
        let invalid = |message: String| ProjectError::Invalid {
            path: origin.to_owned(),
            message,
        };
        if self.variants.is_empty() || self.current >= self.variants.len() {
            return Err(invalid("a project needs at least one variant".into()));
        }
        for (k, v) in self.variants.iter().enumerate() {
            let others = self.variants[..k].iter().map(|o| o.name.clone());
            if let Some(problem) = variant::name_problem(&v.name, others) {
                return Err(invalid(format!("variant {}: {problem}", k + 1)));
            }
            for (i, line) in v.recipe.lines.iter().enumerate() {
                let what = format!("{} ({}): amount", self.line_label(k, i), line.ingredient);
                limits::AMOUNT
                    .check_as(line.amount.value, &what)
                    .map_err(bad)?;
            }
            if let Some(qs) = v.recipe.qs_to_g {
                limits::BATCH_G.check(qs).map_err(bad)?;
            }
            if let Some(h) = &v.recipe.water_hardness {
                h.check()
                    .map_err(|e| invalid(format!("variant '{}': {e}", v.name)))?;
            }
            for (id, price) in &v.prices {
                let what = format!("variant '{}': price per kg of {id}", v.name);
                limits::PRICE_PER_KG.check_as(*price, &what).map_err(bad)?;
            }
        }
        let s = &self.settings;
        limits::TEMPERATURE_C.check(s.temp_c).map_err(bad)?;
        limits::DOSE_MAX_G.check(s.dose_max_g).map_err(bad)?;
        if let Some(t) = s.target_ph {
            limits::TARGET_PH.check(t).map_err(bad)?;
        }
        limits::BAND.check(s.target_tolerance).map_err(bad)?;
        let t = &s.tolerances;
        limits::WEIGHING_TOLERANCE
            .check_as(t.all_percent, "weighing tolerance of every line")
            .map_err(bad)?;
        for (id, p) in &t.per_ingredient {
            let what = format!("weighing tolerance of {id}");
            limits::WEIGHING_TOLERANCE
                .check_as(*p, &what)
                .map_err(bad)?;
        }
        for (id, lo, hi) in &t.assay {
            for (end, v) in [("low", lo), ("high", hi)] {
                let what = format!("{end} end of the assay range of {id}");
                limits::ASSAY.check_as(*v, &what).map_err(bad)?;
            }
            if lo > hi {
                return Err(invalid(format!(
                    "the assay range of {id} runs from {lo} down to {hi}: give the low end first"
                )));
            }
        }
        s.qc.check()
            .map_err(|e| invalid(format!("QC method: {e}")))?;
        for m in &self.measured {
            m.check().map_err(invalid)?;
        }
        if s.band_samples == 0 || s.band_samples > MAX_SAMPLES {
            return Err(invalid(format!(
                "band_samples {} is not allowed: give 1 to {MAX_SAMPLES}",
                s.band_samples
            )));
        }
        Ok(())
    }

    /// Reads a project file, refusing files that are too large, not text or malformed.
    pub fn load(path: &Path) -> Result<Self, ProjectError> {
        let text = read_text(path)?;
        Self::from_ron(&text, &path.display().to_string())
    }
}

impl Project {
    /// Reads a project file and builds the library its recipe needs (the base library with the
    /// project's custom ingredients), refusing unknown ingredient ids with their line and column.
    pub fn load_with_library(path: &Path, base: &Library) -> Result<(Self, Library), ProjectError> {
        let name = path.display().to_string();
        let text = read_text(path)?;
        let project = Self::from_ron(&text, &name)?;
        let library = project.library(base, &name, Some(&text))?;
        Ok((project, library))
    }

    /// The base library extended with this project's custom ingredients; every recipe line's
    /// ingredient must be in it. `text`, when given, locates problems by line and column.
    pub fn library(
        &self,
        base: &Library,
        origin: &str,
        text: Option<&str>,
    ) -> Result<Library, ProjectError> {
        let mut library = base.clone();
        library
            .extend(self.custom.clone())
            .map_err(|e| ProjectError::Invalid {
                path: origin.to_owned(),
                message: format!("custom ingredients: {e}"),
            })?;
        let lines = self.variants.iter().enumerate().flat_map(|(k, v)| {
            v.recipe
                .lines
                .iter()
                .enumerate()
                .map(move |(i, l)| (k, i, l))
        });
        for (k, i, line) in lines {
            if library.entry_index(&line.ingredient).is_none() {
                let suggestions = library.suggest(&line.ingredient);
                let hint = if suggestions.is_empty() {
                    String::new()
                } else {
                    format!("; did you mean {}?", suggestions.join(", "))
                };
                let message = format!(
                    "{} uses unknown ingredient '{}'{hint}",
                    self.line_label(k, i),
                    line.ingredient
                );
                let needle = format!("\"{}\"", line.ingredient);
                return Err(match text.and_then(|t| locate(t, &needle)) {
                    Some((l, c)) => ProjectError::Syntax {
                        path: origin.to_owned(),
                        line: l,
                        column: c,
                        message,
                    },
                    None => ProjectError::Invalid {
                        path: origin.to_owned(),
                        message,
                    },
                });
            }
        }
        Ok(library)
    }

    /// Writes the project atomically: a temporary file in the same folder, synced, then renamed;
    /// the previous file is kept beside it as `NAME.bak`. The one save path of every front end.
    pub fn save(&self, path: &Path) -> Result<(), ProjectError> {
        self.save_with(path, |_| Ok(()))
    }

    /// As [`Project::save`], with a hook run between writing the temporary file and renaming
    /// it (tests inject failures there). Says when the path is a folder or its folder is gone.
    pub fn save_with(
        &self,
        path: &Path,
        before_rename: impl FnOnce(&Path) -> std::io::Result<()>,
    ) -> Result<(), ProjectError> {
        let name = path.display().to_string();
        if path.is_dir() {
            return Err(ProjectError::IsAFolder { path: name });
        }
        let text = self.to_ron().map_err(|e| ProjectError::Invalid {
            path: name.clone(),
            message: format!("the project could not be written as text: {e}"),
        })?;
        write_atomic_with(path, text.as_bytes(), true, before_rename).map_err(|source| {
            match path.parent() {
                Some(dir) if !dir.as_os_str().is_empty() && !dir.is_dir() => {
                    ProjectError::NoFolder {
                        path: name,
                        folder: dir.display().to_string(),
                        source,
                    }
                }
                _ => ProjectError::Io { path: name, source },
            }
        })
    }
}

/// Reads a file as text within the size limit.
fn read_text(path: &Path) -> Result<String, ProjectError> {
    let name = path.display().to_string();
    let io = |source| ProjectError::Io {
        path: name.clone(),
        source,
    };
    let size_bytes = fs::metadata(path).map_err(io)?.len();
    if size_bytes > MAX_FILE_BYTES {
        return Err(ProjectError::TooLarge {
            path: name,
            size_bytes,
            limit_bytes: MAX_FILE_BYTES,
        });
    }
    let bytes = fs::read(path).map_err(io)?;
    String::from_utf8(bytes).map_err(|e| ProjectError::NotText {
        path: name.clone(),
        offset: e.utf8_error().valid_up_to(),
    })
}

/// One-based line and column of the first occurrence of `needle` in `text`.
fn locate(text: &str, needle: &str) -> Option<(usize, usize)> {
    let at = text.find(needle)?;
    let before = &text[..at];
    let line = before.matches('\n').count() + 1;
    let column = before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
    Some((line, column))
}

/// The backup file kept beside a saved project.
pub fn backup_path(path: &Path) -> PathBuf {
    let mut os = path.as_os_str().to_owned();
    os.push(".bak");
    PathBuf::from(os)
}

/// Writes bytes to `path` atomically (temp file in the same folder, fsync, rename).
pub fn write_atomic(path: &Path, bytes: &[u8], keep_backup: bool) -> std::io::Result<()> {
    write_atomic_with(path, bytes, keep_backup, |_| Ok(()))
}

/// As [`write_atomic`], with a hook run between writing the temporary file and renaming it
/// (tests inject failures there).
pub fn write_atomic_with(
    path: &Path,
    bytes: &[u8],
    keep_backup: bool,
    before_rename: impl FnOnce(&Path) -> std::io::Result<()>,
) -> std::io::Result<()> {
    let dir = match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
        _ => PathBuf::from("."),
    };
    let file_name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| "project".into());
    let tmp = dir.join(format!(".{file_name}.saving-{}", std::process::id()));
    let result = (|| {
        let mut f = fs::File::create(&tmp)?;
        f.write_all(bytes)?;
        f.sync_all()?;
        drop(f);
        before_rename(&tmp)?;
        if keep_backup && path.exists() {
            fs::copy(path, backup_path(path))?;
        }
        fs::rename(&tmp, path)?;
        if let Ok(d) = fs::File::open(&dir) {
            // Persist the rename itself; not all platforms allow syncing a folder.
            let _ = d.sync_all();
        }
        Ok(())
    })();
    if result.is_err() {
        let _ = fs::remove_file(&tmp);
    }
    result
}

fn check_nesting(text: &str, origin: &str) -> Result<(), ProjectError> {
    let mut depth = 0usize;
    let (mut line, mut column) = (1usize, 0usize);
    let mut in_string = false;
    let mut escaped = false;
    for c in text.chars() {
        column += 1;
        if c == '\n' {
            line += 1;
            column = 0;
        }
        if in_string {
            match (escaped, c) {
                (false, '\\') => escaped = true,
                (false, '"') => in_string = false,
                _ => escaped = false,
            }
            continue;
        }
        match c {
            '"' => in_string = true,
            '(' | '[' | '{' => {
                depth += 1;
                if depth > MAX_NESTING {
                    return Err(ProjectError::Syntax {
                        path: origin.to_owned(),
                        line,
                        column,
                        message: format!(
                            "brackets nest deeper than {MAX_NESTING} levels; a project is never this deep"
                        ),
                    });
                }
            }
            ')' | ']' | '}' => depth = depth.saturating_sub(1),
            _ => {}
        }
    }
    Ok(())
}
