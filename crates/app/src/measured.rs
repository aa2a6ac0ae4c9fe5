//! Measured titrations in the window: readings imported from a file or pasted into the project,
//! the fit of chosen unknowns to them, and the fitted ingredient saved to the user's library.

use std::path::Path;

use saltwise_chem::fit::{self, Fit, Unknown};
use saltwise_chem::measured::{MeasuredTitration, parse_readings};
use saltwise_chem::project::Project;
use saltwise_chem::user_library::{Provenance, fitted_entry, fitted_words};

use crate::app::Workbench;
use crate::messages::Notice;

/// Largest readings file read, bytes.
const MAX_FILE_BYTES: u64 = 4 * 1024 * 1024;

/// The fit form: what the next import is called, what to fit, the last fit.
#[derive(Debug, Clone, PartialEq)]
pub struct FitForm {
    /// Readings pasted, waiting to be added.
    pub paste: String,
    /// Name of the next import (empty: the file's name or "Pasted readings").
    pub name: String,
    /// Whether the next import's titrant was weighed (g) rather than measured (mL).
    pub by_mass: bool,
    /// The measured titration shown and fitted (index into the project's).
    pub selected: usize,
    /// Fit a meter offset.
    pub offset: bool,
    /// Fit an unknown acid from this starting pKa.
    pub acid: Option<f64>,
    /// Fit an unknown base from this starting pKa (of its acid).
    pub base: Option<f64>,
    /// Fit the effective assay of this ingredient (library id of a recipe line).
    pub assay: Option<String>,
    /// The last fit, with the measured titration it was made for, or why it failed.
    pub result: Option<(MeasuredTitration, Result<Fit, String>)>,
    /// Id to save the fitted ingredient under.
    pub save_name: String,
    /// Formula of a fitted unknown acid or base (for its molar mass).
    pub save_formula: String,
}

impl Default for FitForm {
    fn default() -> Self {
        Self {
            paste: String::new(),
            name: String::new(),
            by_mass: false,
            selected: 0,
            offset: true,
            acid: None,
            base: None,
            assay: None,
            result: None,
            save_name: String::new(),
            save_formula: String::new(),
        }
    }
}

impl FitForm {
    /// The unknowns chosen, in a fixed order.
    pub fn unknowns(&self) -> Vec<Unknown> {
        let mut out = Vec::new();
        if let Some(id) = &self.assay {
            out.push(Unknown::Assay(id.clone()));
        }
        if let Some(pka_start) = self.acid {
            out.push(Unknown::UnknownAcid { pka_start });
        }
        if let Some(pka_start) = self.base {
            out.push(Unknown::UnknownBase { pka_start });
        }
        if self.offset {
            out.push(Unknown::MeterOffset);
        }
        out
    }

    /// The last fit, if it is for `titration` as it is now.
    pub fn fit_for(&self, titration: &MeasuredTitration) -> Option<&Result<Fit, String>> {
        self.result
            .as_ref()
            .filter(|(t, _)| t == titration)
            .map(|(_, r)| r)
    }
}

/// Today's date (UTC) as YYYY-MM-DD.
pub fn today() -> String {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_secs());
    saltwise_export::sheet::iso_date(secs)
}

impl Workbench {
    /// Imports the readings of a file into the project, titrated as the QC method says.
    pub(crate) fn import_readings_from(&mut self, path: &Path) {
        let text = std::fs::metadata(path)
            .map_err(|e| e.to_string())
            .and_then(|m| {
                if m.len() > MAX_FILE_BYTES {
                    Err(format!(
                        "the file is {} bytes; a readings file is at most {MAX_FILE_BYTES} bytes",
                        m.len()
                    ))
                } else {
                    std::fs::read_to_string(path).map_err(|e| e.to_string())
                }
            });
        let source = crate::document::file_name(path);
        match text {
            Ok(text) => self.import_readings(&text, &source),
            Err(reason) => self.refuse_readings(&source, reason),
        }
    }

    /// Imports the pasted readings.
    pub(crate) fn import_pasted(&mut self) {
        let text = std::mem::take(&mut self.panels.fit.paste);
        self.import_readings(&text, "");
        if self.messages.notice().is_some() {
            // Refused: keep the text so it can be corrected.
            self.panels.fit.paste = text;
        }
    }

    fn refuse_readings(&mut self, source: &str, reason: String) {
        let what = if source.is_empty() {
            "the pasted readings".to_owned()
        } else {
            source.to_owned()
        };
        self.messages.notify(Notice {
            headline: format!("Could not import {what}"),
            reason,
            consequence: "Nothing was added to the project.".into(),
        });
    }

    fn import_readings(&mut self, text: &str, source: &str) {
        let parsed = match parse_readings(text) {
            Ok(p) => p,
            Err(e) => return self.refuse_readings(source, e.to_string()),
        };
        let titrant = match (self.engine.library(), self.engine.solved()) {
            (Ok(library), Some(report)) => self
                .doc
                .project()
                .settings
                .qc
                .titrant(library, report.solution.ph)
                .map(|t| t.id().to_owned())
                .map_err(|e| e.to_string()),
            _ => Err("the recipe has not been solved, so the titrant cannot be chosen".into()),
        };
        let titrant = match titrant {
            Ok(t) => t,
            Err(reason) => return self.refuse_readings(source, reason),
        };
        let form = &self.panels.fit;
        let count = self.doc.project().measured.len();
        let name = if !form.name.trim().is_empty() {
            form.name.trim().to_owned()
        } else if !source.is_empty() {
            source.to_owned()
        } else {
            format!("Pasted readings {}", count + 1)
        };
        let method = self.doc.project().settings.qc.clone();
        let titration = MeasuredTitration {
            name: name.clone(),
            titrant,
            normality: method.normality,
            sample_g: method.sample_g,
            titrant_by_mass: form.by_mass,
            points: parsed.points,
            source_file: source.to_owned(),
            imported: today(),
        };
        let n = titration.points.len();
        self.doc.edit(|p| p.measured.push(titration));
        self.panels.fit.selected = count;
        self.panels.fit.name.clear();
        self.messages.dismiss_notice();
        self.messages
            .status(&format!("Imported {n} readings as '{name}'."), false);
    }

    /// Removes a measured titration from the project.
    pub(crate) fn remove_measured(&mut self, index: usize) {
        self.doc.edit(|p| {
            if index < p.measured.len() {
                p.measured.remove(index);
            }
        });
        let left = self.doc.project().measured.len();
        self.panels.fit.selected = self.panels.fit.selected.min(left.saturating_sub(1));
    }

    /// Fits the chosen unknowns to the selected measured titration.
    pub(crate) fn run_fit(&mut self) {
        let project: &Project = self.doc.project();
        let Some(titration) = project.measured.get(self.panels.fit.selected).cloned() else {
            return;
        };
        let unknowns = self.panels.fit.unknowns();
        let result = match self.engine.library() {
            Ok(library) => {
                let conditions = saltwise_chem::Conditions {
                    temp_c: project.settings.temp_c,
                    activity: project.settings.activity,
                };
                if unknowns.is_empty() {
                    Err("choose at least one unknown to fit".into())
                } else {
                    fit::fit(library, conditions, project.recipe(), &titration, &unknowns)
                        .map_err(|e| e.to_string())
                }
            }
            Err(e) => Err(e.to_owned()),
        };
        if let Ok(f) = &result {
            self.messages
                .status(&format!("Fitted: RMS residual {:.4} pH.", f.rms_ph), false);
        }
        self.panels.fit.result = Some((titration, result));
    }

    /// Saves the last fit's ingredient to the user's library, with its provenance.
    pub(crate) fn save_fitted(&mut self) {
        let Some((titration, Ok(fit))) = self.panels.fit.result.clone() else {
            return;
        };
        let name = self.panels.fit.save_name.trim().to_owned();
        let formula = self.panels.fit.save_formula.trim().to_owned();
        let saved = self
            .engine
            .base_library()
            .map_err(str::to_owned)
            .and_then(|base| {
                let note = format!(
                    "fitted to '{}' ({}) on {}",
                    titration.name,
                    if titration.source_file.is_empty() {
                        "pasted readings"
                    } else {
                        titration.source_file.as_str()
                    },
                    today()
                );
                let entry = fitted_entry(base, &fit, &name, Some(&formula), &note)
                    .map_err(|e| e.to_string())?;
                let provenance = Provenance {
                    id: name.clone(),
                    data_file: titration.source_file.clone(),
                    date: today(),
                    fitted: fitted_words(&fit),
                    titration: format!(
                        "{} g of product with {} N {}, {} readings",
                        titration.sample_g,
                        titration.normality,
                        titration.titrant,
                        titration.points.len()
                    ),
                };
                let built_in = saltwise_chem::Library::built_in().map_err(|e| e.to_string())?;
                self.user_store.add(&built_in, entry, provenance)
            });
        match saved.and_then(|user| self.engine.set_user_library(&user)) {
            Ok(()) => self.messages.status(
                &format!(
                    "Saved '{name}' to your own library{}.",
                    self.user_store
                        .path()
                        .map_or_else(String::new, |p| format!(" ({})", p.display()))
                ),
                false,
            ),
            Err(reason) => self.messages.notify(Notice {
                headline: format!("Could not save '{name}' to your library"),
                reason,
                consequence: "Your library file is as it was.".into(),
            }),
        }
    }
}
