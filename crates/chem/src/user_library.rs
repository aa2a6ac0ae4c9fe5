//! The user's own library: systems and ingredients fitted to measured titrations, each with its
//! provenance (data file, date, the fitted values), kept as RON text beside the built-in library.
//!
//! Reading the file and adding to it atomically (the previous copy kept) are here, so that the
//! window and the command line share one tested path, as they do for project files; where the
//! file lives (the OS data folder) is the front ends'.

use std::path::Path;

use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::error::LibraryError;
use crate::fit::{Fit, Unknown};
use crate::library::{Ingredient, Library, LibraryData, Release, System};
use crate::limits;

/// The format version this build writes.
pub const USER_LIBRARY_VERSION: u32 = 1;
/// The file name of the user library inside the data folder.
pub const USER_LIBRARY_FILE: &str = "user-library.ron";
/// Largest user library file read, bytes.
pub const MAX_USER_LIBRARY_BYTES: u64 = 4 * 1024 * 1024;

/// Where a saved entry came from.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Provenance {
    /// The id of the ingredient (and system) saved.
    pub id: String,
    /// The measured data file the fit used.
    pub data_file: String,
    /// The date of the fit, as the caller wrote it.
    pub date: String,
    /// The fitted values with their standard errors, in words.
    pub fitted: String,
    /// What was titrated with what (sample, titrant, normality, readings).
    pub titration: String,
}

/// The user library file: data as in `assets/library.ron`, and the provenance of each entry.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct UserLibrary {
    /// File format version.
    pub format_version: u32,
    /// Systems and ingredients the user saved.
    pub data: LibraryData,
    /// Where each saved entry came from.
    pub provenance: Vec<Provenance>,
}

impl Default for UserLibrary {
    fn default() -> Self {
        Self {
            format_version: USER_LIBRARY_VERSION,
            data: LibraryData::default(),
            provenance: Vec::new(),
        }
    }
}

/// Why a fitted entry cannot be saved.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum UserLibraryError {
    /// The file is not valid RON of a user library.
    #[error(transparent)]
    Library(#[from] LibraryError),
    /// A file of a newer format.
    #[error(
        "{origin}: user library format {found} is newer than this build reads ({USER_LIBRARY_VERSION})"
    )]
    Version {
        /// Where the text came from.
        origin: String,
        /// The version found.
        found: u32,
    },
    /// An id already taken.
    #[error("'{id}' is already in the {place}; choose another name")]
    Taken {
        /// The id.
        id: String,
        /// "built-in library" or "user library".
        place: &'static str,
    },
    /// A name that cannot be an id.
    #[error(
        "'{name}' cannot name a library entry: use lower-case letters, digits and '_' (e.g. lot_24_117_acid)"
    )]
    BadName {
        /// The name as given.
        name: String,
    },
    /// Nothing in the fit to save, or more than one thing.
    #[error("{0}")]
    Nothing(String),
    /// The file could not be read or written, or is too large.
    #[error("{path}: {message}")]
    File {
        /// The file.
        path: String,
        /// What went wrong.
        message: String,
    },
}

/// A file error naming the file.
fn file_error(path: &Path, message: impl std::fmt::Display) -> UserLibraryError {
    UserLibraryError::File {
        path: path.display().to_string(),
        message: message.to_string(),
    }
}

impl UserLibrary {
    /// Parses a user library; `origin` names it in errors.
    pub fn from_ron(text: &str, origin: &str) -> Result<Self, UserLibraryError> {
        let lib: Self = ron::from_str(text).map_err(|e| LibraryError::Syntax {
            origin: origin.to_owned(),
            line: e.span.start.line,
            column: e.span.start.col,
            message: e.code.to_string(),
        })?;
        if lib.format_version > USER_LIBRARY_VERSION {
            return Err(UserLibraryError::Version {
                origin: origin.to_owned(),
                found: lib.format_version,
            });
        }
        Ok(lib)
    }

    /// The user library saved at `path`: empty when there is no file yet.
    pub fn read_file(path: &Path) -> Result<Self, UserLibraryError> {
        if !path.exists() {
            return Ok(Self::default());
        }
        let size = std::fs::metadata(path)
            .map_err(|e| file_error(path, e))?
            .len();
        if size > MAX_USER_LIBRARY_BYTES {
            return Err(file_error(
                path,
                format!("{size} bytes; a user library is at most {MAX_USER_LIBRARY_BYTES} bytes"),
            ));
        }
        let text = std::fs::read_to_string(path).map_err(|e| file_error(path, e))?;
        Self::from_ron(&text, &path.display().to_string())
    }

    /// Adds an entry over `base` to the file at `path` (its folder made when missing; written
    /// atomically, the previous copy kept as `.bak`); returns the library as saved.
    pub fn add_to_file(
        path: &Path,
        base: &Library,
        entry: LibraryData,
        provenance: Provenance,
    ) -> Result<Self, UserLibraryError> {
        let mut user = Self::read_file(path)?;
        user.add(base, entry, provenance)?;
        let text = user
            .to_ron()
            .map_err(|e| file_error(path, format!("writing the user library as text: {e}")))?;
        if let Some(dir) = path.parent() {
            std::fs::create_dir_all(dir).map_err(|e| file_error(dir, e))?;
        }
        crate::project::write_atomic(path, text.as_bytes(), true)
            .map_err(|e| file_error(path, e))?;
        Ok(user)
    }

    /// Pretty RON text.
    pub fn to_ron(&self) -> Result<String, ron::Error> {
        ron::ser::to_string_pretty(self, ron::ser::PrettyConfig::default().struct_names(false))
    }

    /// The base library extended with this one (checks every entry as the loader does).
    pub fn extend(&self, base: &Library) -> Result<Library, LibraryError> {
        let mut lib = base.clone();
        lib.extend(self.data.clone())?;
        Ok(lib)
    }

    /// Adds a fitted entry, refusing an id the base library or this one already uses, and
    /// checking that the result still loads over `base`.
    pub fn add(
        &mut self,
        base: &Library,
        entry: LibraryData,
        provenance: Provenance,
    ) -> Result<(), UserLibraryError> {
        let ids = entry
            .ingredients
            .iter()
            .map(|i| i.id.as_str())
            .chain(entry.systems.iter().map(|s| s.id.as_str()));
        for id in ids {
            if base.entry_index(id).is_some() || base.system_index(id).is_some() {
                return Err(UserLibraryError::Taken {
                    id: id.to_owned(),
                    place: "built-in library",
                });
            }
            let here = self.data.ingredients.iter().any(|i| i.id == id)
                || self.data.systems.iter().any(|s| s.id == id);
            if here {
                return Err(UserLibraryError::Taken {
                    id: id.to_owned(),
                    place: "user library",
                });
            }
        }
        let mut next = self.clone();
        next.data.systems.extend(entry.systems);
        next.data.ions.extend(entry.ions);
        next.data.ingredients.extend(entry.ingredients);
        next.provenance.push(provenance);
        next.extend(base)?;
        *self = next;
        Ok(())
    }
}

fn check_name(name: &str) -> Result<String, UserLibraryError> {
    let id = name.trim();
    if id.is_empty()
        || id.len() > 64
        || !id
            .chars()
            .all(|c| c.is_ascii_lowercase() || c.is_ascii_digit() || c == '_')
    {
        return Err(UserLibraryError::BadName {
            name: name.to_owned(),
        });
    }
    Ok(id.to_owned())
}

/// The fitted values of a fit in words, with standard errors (for provenance and notes).
pub fn fitted_words(fit: &Fit) -> String {
    fit.parameters
        .iter()
        .map(|p| match p.std_error {
            Some(se) => format!("{} = {:.6} ± {:.2e} {}", p.name, p.value, se, p.unit),
            None => format!("{} = {:.6} {} (not determined)", p.name, p.value, p.unit),
        })
        .collect::<Vec<_>>()
        .join("; ")
        + &format!("; RMS residual {:.4} pH", fit.rms_ph)
}

/// The library entry a fit gives, named `name`: the unknown acid or base as a new system and
/// ingredient (`formula` its substance, needed for a molar mass), or else the one ingredient
/// whose assay was fitted, copied with the fitted assay. `note` is said in the entry's note or
/// source (provenance). Refuses a parameter the data do not determine.
pub fn fitted_entry(
    library: &Library,
    fit: &Fit,
    name: &str,
    formula: Option<&str>,
    note: &str,
) -> Result<LibraryData, UserLibraryError> {
    let id = check_name(name)?;
    let undetermined = |names: &[&str]| -> Option<String> {
        names
            .iter()
            .find(|n| fit.parameter(n).is_none_or(|p| !p.determined))
            .map(|n| (*n).to_owned())
    };
    let unknown = fit.unknowns.iter().find_map(|u| match u {
        Unknown::UnknownAcid { .. } => Some(("unknown-acid", false)),
        Unknown::UnknownBase { .. } => Some(("unknown-base", true)),
        _ => None,
    });
    if let Some((label, as_base)) = unknown {
        let amount = format!("{label}:amount");
        let pka = format!("{label}:pka");
        if let Some(n) = undetermined(&[&amount, &pka]) {
            return Err(UserLibraryError::Nothing(format!(
                "not saved: the fit does not determine {n}"
            )));
        }
        let Some(formula) = formula.map(str::trim).filter(|f| !f.is_empty()) else {
            return Err(UserLibraryError::Nothing(
                "not saved: give the unknown's formula (e.g. --formula C2H4O2) so the ingredient has a molar mass".into(),
            ));
        };
        let (pka_value, pka_se) = fit
            .parameter(&pka)
            .map(|p| (p.value, p.std_error.unwrap_or(f64::NAN)))
            .unwrap_or((f64::NAN, f64::NAN));
        limits::PKA
            .check_as(pka_value, "fitted pKa")
            .map_err(|e| UserLibraryError::Nothing(format!("not saved: {e}")))?;
        // The amount's sign says which form is there: positive acid HA, negative base B.
        let signed = fit
            .parameter(&amount)
            .map_or(0.0, |p| if as_base { -p.value } else { p.value });
        let base_form = signed < 0.0;
        let system = System {
            id: id.clone(),
            name: format!("{id} (fitted)"),
            charge_of_fully_protonated: i32::from(base_form),
            forms: Vec::new(),
            pka: vec![pka_value],
            dh_kj_mol: vec![0.0],
            dcp_j_mol_k: Vec::new(),
            pka_ionic_strength: 0.0,
            pka_ionic_strengths: Vec::new(),
            source: format!(
                "fitted to a measured titration: pKa {pka_value:.4} ± {pka_se:.2e} (thermodynamic, at the temperature of the fit; ΔH° not known, taken as 0); {note}"
            ),
        };
        let ingredient = Ingredient {
            id: id.clone(),
            name: format!(
                "{id} (fitted unknown {})",
                if base_form { "base" } else { "acid" }
            ),
            formula: formula.to_owned(),
            assay: 1.0,
            releases: vec![Release::System {
                id: id.clone(),
                count: 1,
                form: u32::from(base_form),
            }],
            water_per_formula: None,
            hazards: Vec::new(),
            note: format!(
                "Fitted unknown {}: {} mmol per kg of product in the fitted product. {note}. Hazards not known: check the safety data sheet.",
                if base_form { "base" } else { "acid" },
                fit.parameter(&amount).map_or(f64::NAN, |p| p.value.abs())
            ),
        };
        return Ok(LibraryData {
            systems: vec![system],
            ingredients: vec![ingredient],
            ..LibraryData::default()
        });
    }
    let assays: Vec<&str> = fit
        .unknowns
        .iter()
        .filter_map(|u| match u {
            Unknown::Assay(id) => Some(id.as_str()),
            _ => None,
        })
        .collect();
    let source_id = match assays.as_slice() {
        [one] => *one,
        [] => {
            return Err(UserLibraryError::Nothing(
                "not saved: the fit has no unknown acid or base and no assay to save".into(),
            ));
        }
        _ => {
            return Err(UserLibraryError::Nothing(format!(
                "not saved: the fit has {} assays ({}); fit one assay to save it",
                assays.len(),
                assays.join(", ")
            )));
        }
    };
    let name_of = format!("assay:{source_id}");
    if let Some(n) = undetermined(&[&name_of]) {
        return Err(UserLibraryError::Nothing(format!(
            "not saved: the fit does not determine {n}"
        )));
    }
    let Some(entry) = library.entry(source_id) else {
        return Err(UserLibraryError::Nothing(format!(
            "not saved: '{source_id}' is not in the library"
        )));
    };
    let (assay_percent, se) = fit
        .parameter(&name_of)
        .map(|p| (p.value, p.std_error.unwrap_or(f64::NAN)))
        .unwrap_or((f64::NAN, f64::NAN));
    let assay = assay_percent / 100.0;
    if !limits::ASSAY.allows(assay) {
        return Err(UserLibraryError::Nothing(format!(
            "not saved: the fitted assay of {source_id} is {assay_percent:.3} %, outside (0, 100] %; check the sample, titrant and recipe"
        )));
    }
    let mut ingredient = entry.ingredient.clone();
    ingredient.id = id.clone();
    ingredient.name = format!("{} (fitted assay {assay_percent:.2} %)", ingredient.name);
    ingredient.assay = assay;
    ingredient.note = format!(
        "{source_id} with the assay fitted to a measured titration: {assay_percent:.4} ± {se:.2e} % w/w. {note}. {}",
        ingredient.note
    );
    Ok(LibraryData {
        ingredients: vec![ingredient],
        ..LibraryData::default()
    })
}
