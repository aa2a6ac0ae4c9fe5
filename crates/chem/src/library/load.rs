//! Loading a library from RON or data, and every check an entry must pass before it is used.

use std::collections::HashMap;

use super::{
    Entry, HYDRON, HYDROXIDE, Ingredient, Ion, Library, LibraryData, MAX_STEPS, Release,
    ResolvedRelease, System,
};
use crate::error::LibraryError;
use crate::formula::Formula;

/// The built-in library, embedded from `assets/library.ron`.
const BUILT_IN_LIBRARY_RON: &str = include_str!("../../../../assets/library.ron");

/// Largest charge magnitude a spectator ion may carry.
const MAX_ION_CHARGE: i32 = 6;

impl Library {
    /// The built-in library.
    pub fn built_in() -> Result<Self, LibraryError> {
        Self::from_ron(BUILT_IN_LIBRARY_RON, "built-in library")
    }

    /// The built-in library's data as written, e.g. to check a model with parts left out.
    pub fn built_in_data() -> Result<LibraryData, LibraryError> {
        parse(BUILT_IN_LIBRARY_RON, "built-in library")
    }

    /// Parses and validates a library from RON text; `origin` names it in errors.
    pub fn from_ron(text: &str, origin: &str) -> Result<Self, LibraryError> {
        Self::from_data(parse(text, origin)?)
    }

    /// Validates library data.
    pub fn from_data(data: LibraryData) -> Result<Self, LibraryError> {
        let mut library = Self {
            systems: Vec::new(),
            ions: Vec::new(),
            entries: Vec::new(),
            system_by_id: HashMap::new(),
            ion_by_id: HashMap::new(),
            entry_by_id: HashMap::new(),
            complexes: Vec::new(),
            solids: Vec::new(),
            pitzer: super::PitzerTable::default(),
            hydron: 0,
            hydroxide: 0,
        };
        library.add_systems_and_ions(data.systems, data.ions)?;
        library.hydron = library.reserved_ion(HYDRON, 1)?;
        library.hydroxide = library.reserved_ion(HYDROXIDE, -1)?;
        for ingredient in data.ingredients {
            library.add_ingredient(ingredient)?;
        }
        library.add_speciation(data.complexes, data.solids, data.pitzer)?;
        Ok(library)
    }

    /// Adds systems and ingredients from another set of data (custom ingredients).
    pub fn extend(&mut self, data: LibraryData) -> Result<(), LibraryError> {
        self.add_systems_and_ions(data.systems, data.ions)?;
        for ingredient in data.ingredients {
            self.add_ingredient(ingredient)?;
        }
        self.add_speciation(data.complexes, data.solids, data.pitzer)
    }

    /// Checks and adds systems, then ions; system and ion ids share one name space.
    fn add_systems_and_ions(
        &mut self,
        systems: Vec<System>,
        ions: Vec<Ion>,
    ) -> Result<(), LibraryError> {
        for s in systems {
            validate_system(&s)?;
            self.claim_id("system", &s.id)?;
            self.system_by_id.insert(s.id.clone(), self.systems.len());
            self.systems.push(s);
        }
        for ion in ions {
            if ion.charge == 0 || ion.charge.abs() > MAX_ION_CHARGE {
                return Err(invalid(
                    "ion",
                    &ion.id,
                    &format!(
                        "charge {} is not allowed: the charge must be between −{MAX_ION_CHARGE} \
                         and +{MAX_ION_CHARGE} and not 0",
                        ion.charge
                    ),
                ));
            }
            self.claim_id("ion", &ion.id)?;
            self.ion_by_id.insert(ion.id.clone(), self.ions.len());
            self.ions.push(ion);
        }
        Ok(())
    }

    /// Refuses a system or ion id that a system or ion already uses.
    fn claim_id(&self, kind: &'static str, id: &str) -> Result<(), LibraryError> {
        if self.system_by_id.contains_key(id) || self.ion_by_id.contains_key(id) {
            return Err(invalid(
                kind,
                id,
                "the id is already used by a system or ion; each id may be used once",
            ));
        }
        Ok(())
    }

    /// Index of a reserved ion, which the library must define with the given charge.
    fn reserved_ion(&self, id: &str, charge: i32) -> Result<usize, LibraryError> {
        match self.ion_by_id.get(id) {
            Some(&i) if self.ions[i].charge == charge => Ok(i),
            _ => Err(invalid(
                "ion",
                id,
                &format!("the library must define '{id}' with charge {charge:+}"),
            )),
        }
    }

    /// Checks one ingredient against the systems and ions and adds it with its derived data.
    fn add_ingredient(&mut self, ingredient: Ingredient) -> Result<(), LibraryError> {
        let id = ingredient.id.clone();
        if self.entry_by_id.contains_key(&id) {
            return Err(invalid(
                "ingredient",
                &id,
                "the id is used twice; each ingredient id may be used once",
            ));
        }
        if id.is_empty()
            || !id
                .chars()
                .all(|c| c.is_ascii_lowercase() || c.is_ascii_digit() || c == '_')
        {
            return Err(invalid(
                "ingredient",
                &id,
                "ids use lower-case letters, digits and '_'",
            ));
        }
        let formula = Formula::parse(&ingredient.formula)
            .map_err(|e| invalid("ingredient", &id, &e.to_string()))?;
        if !crate::limits::ASSAY.allows(ingredient.assay) {
            return Err(invalid(
                "ingredient",
                &id,
                &format!(
                    "assay {} is outside (0, 1]: it is the mass fraction of the named substance",
                    ingredient.assay
                ),
            ));
        }
        let mut releases = Vec::new();
        let mut charge = 0i64;
        for r in &ingredient.releases {
            if matches!(
                r,
                Release::Ion { count: 0, .. } | Release::System { count: 0, .. }
            ) {
                return Err(invalid(
                    "ingredient",
                    &id,
                    "a release count must be 1 or more",
                ));
            }
            let (resolved, z) = self.resolve(&id, r)?;
            charge += z;
            releases.push(resolved);
        }
        if charge != 0 {
            return Err(invalid(
                "ingredient",
                &id,
                &format!("its releases sum to charge {charge:+}; an ingredient must be neutral"),
            ));
        }
        let water_mol_per_mol = ingredient
            .water_per_formula
            .unwrap_or(formula.hydrate_water);
        if !water_mol_per_mol.is_finite() || water_mol_per_mol < 0.0 {
            return Err(invalid(
                "ingredient",
                &id,
                "water_per_formula must be 0 or more",
            ));
        }
        let entry = Entry {
            molar_mass_g_per_mol: formula.molar_mass_g_per_mol(),
            water_mol_per_mol,
            releases,
            ingredient,
        };
        self.entry_by_id.insert(id, self.entries.len());
        self.entries.push(entry);
        Ok(())
    }

    /// One release of ingredient `id` resolved to indices, with the charge it carries.
    fn resolve(&self, id: &str, release: &Release) -> Result<(ResolvedRelease, i64), LibraryError> {
        match release {
            Release::Ion { id: ion_id, count } => {
                let &ion = self.ion_by_id.get(ion_id).ok_or_else(|| {
                    invalid(
                        "ingredient",
                        id,
                        &format!("releases unknown ion '{ion_id}'"),
                    )
                })?;
                let resolved = ResolvedRelease::Ion {
                    ion,
                    count: f64::from(*count),
                };
                Ok((
                    resolved,
                    i64::from(self.ions[ion].charge) * i64::from(*count),
                ))
            }
            Release::System {
                id: sys_id,
                count,
                form,
            } => {
                let &system = self.system_by_id.get(sys_id).ok_or_else(|| {
                    invalid(
                        "ingredient",
                        id,
                        &format!("releases unknown system '{sys_id}'"),
                    )
                })?;
                let s = &self.systems[system];
                if *form as usize > s.pka.len() {
                    return Err(invalid(
                        "ingredient",
                        id,
                        &format!(
                            "form {form} of '{sys_id}' does not exist: it has forms 0 to {}",
                            s.pka.len()
                        ),
                    ));
                }
                let resolved = ResolvedRelease::System {
                    system,
                    count: f64::from(*count),
                    form: *form,
                };
                let z = (i64::from(s.charge_of_fully_protonated) - i64::from(*form))
                    * i64::from(*count);
                Ok((resolved, z))
            }
        }
    }
}

/// Checks one system's constants: step count, ΔH°/ΔCp°/form counts, ranges and source.
fn validate_system(s: &System) -> Result<(), LibraryError> {
    let n = s.pka.len();
    if n == 0 || n > MAX_STEPS {
        return Err(invalid(
            "system",
            &s.id,
            &format!("it has {n} pKa values; 1 to {MAX_STEPS} are allowed"),
        ));
    }
    if s.dh_kj_mol.len() != n {
        return Err(invalid(
            "system",
            &s.id,
            &format!(
                "it has {n} pKa values but {} ΔH° values; give one ΔH° per step",
                s.dh_kj_mol.len()
            ),
        ));
    }
    if s.dcp_j_mol_k.len() > n {
        return Err(invalid(
            "system",
            &s.id,
            "it has more ΔCp° values than steps",
        ));
    }
    if !s.forms.is_empty() && s.forms.len() != n + 1 {
        return Err(invalid(
            "system",
            &s.id,
            &format!(
                "it names {} forms; a system with {n} steps has {}",
                s.forms.len(),
                n + 1
            ),
        ));
    }
    for (k, pka) in s.pka.iter().enumerate() {
        if !crate::limits::PKA.allows(*pka) {
            return Err(invalid(
                "system",
                &s.id,
                &format!("pKa{} = {pka} is outside −5…20", k + 1),
            ));
        }
    }
    if s.dh_kj_mol
        .iter()
        .chain(&s.dcp_j_mol_k)
        .any(|v| !v.is_finite() || v.abs() > 1000.0)
    {
        return Err(invalid(
            "system",
            &s.id,
            "ΔH° and ΔCp° values must be finite and under 1000 in size",
        ));
    }
    if !(0.0..=5.0).contains(&s.pka_ionic_strength) {
        return Err(invalid(
            "system",
            &s.id,
            "pka_ionic_strength must be between 0 and 5 mol/kg water",
        ));
    }
    if !s.pka_ionic_strengths.is_empty() && s.pka_ionic_strengths.len() != n {
        return Err(invalid(
            "system",
            &s.id,
            &format!(
                "it has {n} pKa values but {} pka_ionic_strengths; give one per step or none",
                s.pka_ionic_strengths.len()
            ),
        ));
    }
    if s.pka_ionic_strengths
        .iter()
        .any(|i| !(0.0..=5.0).contains(i))
    {
        return Err(invalid(
            "system",
            &s.id,
            "pka_ionic_strengths must each be between 0 and 5 mol/kg water",
        ));
    }
    if s.source.trim().is_empty() {
        return Err(invalid(
            "system",
            &s.id,
            "every system needs the source of its constants",
        ));
    }
    Ok(())
}

fn invalid(kind: &'static str, id: &str, message: &str) -> LibraryError {
    LibraryError::Invalid {
        kind,
        id: id.to_owned(),
        message: message.to_owned(),
    }
}

/// Library data from RON text; `origin` names it in errors.
fn parse(text: &str, origin: &str) -> Result<LibraryData, LibraryError> {
    ron::from_str(text).map_err(|e| LibraryError::Syntax {
        origin: origin.to_owned(),
        line: e.span.start.line,
        column: e.span.start.col,
        message: e.code.to_string(),
    })
}
