//! The project file a workbench saves: recipe, settings, custom ingredients, format version.
//!
//! Chem's only file I/O: loading with size and nesting limits, and atomic saving, so the window
//! and the command line share one tested path.

use std::fs;
use std::io::Write;
use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};

use crate::amount::Unit;
use crate::error::ProjectError;
use crate::library::{Library, LibraryData};
use crate::limits;
use crate::recipe::{Recipe, RecipeLine};
use crate::solver::ActivityModel;

/// The format version this build writes.
pub const FORMAT_VERSION: u32 = 1;
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
}

impl Default for Settings {
    fn default() -> Self {
        Self {
            temp_c: 25.0,
            activity: ActivityModel::Davies,
            adjuster: "sodium_hydroxide_50".into(),
            dose_max_g: 10.0,
            target_ph: None,
            target_tolerance: 0.1,
            species_system: None,
        }
    }
}

/// A saved project.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Project {
    /// File format version.
    pub format_version: u32,
    /// Project name.
    #[serde(default)]
    pub name: String,
    /// Free notes.
    #[serde(default)]
    pub notes: String,
    /// The recipe.
    pub recipe: Recipe,
    /// Conditions and chart settings.
    #[serde(default)]
    pub settings: Settings,
    /// Custom systems, ions and ingredients the recipe may use.
    #[serde(default)]
    pub custom: LibraryData,
}

impl Default for Project {
    fn default() -> Self {
        Self {
            format_version: FORMAT_VERSION,
            name: "Untitled".into(),
            notes: String::new(),
            recipe: Recipe::default(),
            settings: Settings::default(),
            custom: LibraryData::default(),
        }
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
        Self {
            name: "Meadowbrook mild cleanser base (demo)".into(),
            notes:
                "Invented demo recipe: lactate buffer, benzoate preservative, water q.s. to 1 kg."
                    .into(),
            recipe: Recipe {
                lines: vec![
                    line("lactic_acid_88", 0.8, Unit::Percent),
                    line("sodium_lactate_60", 1.2, Unit::Percent),
                    line("sodium_benzoate", 0.4, Unit::Percent),
                    line("sodium_chloride", 0.8, Unit::Percent),
                ],
                qs_to_g: Some(1000.0),
            },
            settings: Settings {
                target_ph: Some(5.0),
                adjuster: "sodium_hydroxide_50".into(),
                dose_max_g: 20.0,
                ..Settings::default()
            },
            ..Self::default()
        }
    }

    /// Serialises to pretty RON text.
    pub fn to_ron(&self) -> Result<String, ron::Error> {
        ron::ser::to_string_pretty(self, ron::ser::PrettyConfig::default().struct_names(false))
    }

    /// Parses a project from text; `origin` names it in errors. Migrates older versions.
    pub fn from_ron(text: &str, origin: &str) -> Result<Self, ProjectError> {
        check_nesting(text, origin)?;
        let project: Self = ron::from_str(text).map_err(|e| ProjectError::Syntax {
            path: origin.to_owned(),
            line: e.span.start.line,
            column: e.span.start.col,
            message: e.code.to_string(),
        })?;
        if project.format_version == 0 || project.format_version > FORMAT_VERSION {
            return Err(ProjectError::Version {
                path: origin.to_owned(),
                found: project.format_version,
                supported: FORMAT_VERSION,
            });
        }
        project.validate(origin)?;
        Ok(project)
    }

    /// Checks amounts and settings against the input limits ([`crate::limits`]).
    pub fn validate(&self, origin: &str) -> Result<(), ProjectError> {
        let bad = |e: crate::error::LimitError| ProjectError::Invalid {
            path: origin.to_owned(),
            message: e.to_string(),
        };
        for (i, line) in self.recipe.lines.iter().enumerate() {
            let what = format!("recipe line {} ({}): amount", i + 1, line.ingredient);
            limits::AMOUNT
                .check_as(line.amount.value, &what)
                .map_err(bad)?;
        }
        if let Some(qs) = self.recipe.qs_to_g {
            limits::BATCH_G.check(qs).map_err(bad)?;
        }
        let s = &self.settings;
        limits::TEMPERATURE_C.check(s.temp_c).map_err(bad)?;
        limits::DOSE_MAX_G.check(s.dose_max_g).map_err(bad)?;
        if let Some(t) = s.target_ph {
            limits::TARGET_PH.check(t).map_err(bad)?;
        }
        limits::BAND.check(s.target_tolerance).map_err(bad)?;
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
        for (i, line) in self.recipe.lines.iter().enumerate() {
            if library.entry_index(&line.ingredient).is_none() {
                let suggestions = library.suggest(&line.ingredient);
                let hint = if suggestions.is_empty() {
                    String::new()
                } else {
                    format!("; did you mean {}?", suggestions.join(", "))
                };
                let message = format!(
                    "recipe line {} uses unknown ingredient '{}'{hint}",
                    i + 1,
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
