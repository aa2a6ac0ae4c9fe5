//! The ingredient library: loading, validating and looking up systems, ions and ingredients.

mod model;

use std::collections::HashMap;

pub use model::{Hazard, Ingredient, Ion, LibraryData, Release, System};

use crate::error::LibraryError;
use crate::formula::{Formula, WATER_MOLAR_MASS_G_PER_MOL};

/// The built-in library, embedded from `assets/library.ron`.
pub const BUILT_IN_LIBRARY_RON: &str = include_str!("../../../../assets/library.ron");

/// Id of the reserved ion for a proton released by a strong acid.
pub const HYDRON: &str = "hydron";
/// Id of the reserved ion for a hydroxide released by a strong base.
pub const HYDROXIDE: &str = "hydroxide";
/// Id of the water ingredient.
pub const WATER: &str = "water";

/// Most acid steps a system may have.
pub const MAX_STEPS: usize = 10;

/// A release resolved to library indices.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum ResolvedRelease {
    /// A spectator ion (or hydron/hydroxide) by index.
    Ion {
        /// Index into [`Library::ions`].
        ion: usize,
        /// Per formula unit.
        count: f64,
    },
    /// A system at a protonation level, by index.
    System {
        /// Index into [`Library::systems`].
        system: usize,
        /// Per formula unit.
        count: f64,
        /// Protons removed from the fully protonated form.
        form: u32,
    },
}

/// An ingredient with its derived quantities.
#[derive(Debug, Clone, PartialEq)]
pub struct Entry {
    /// The ingredient as written.
    pub ingredient: Ingredient,
    /// Molar mass of the named substance (hydrate included), g/mol.
    pub molar_mass_g_per_mol: f64,
    /// Mol of water added to the solvent per mol of substance.
    pub water_mol_per_mol: f64,
    /// What one formula unit releases, resolved.
    pub releases: Vec<ResolvedRelease>,
}

impl Entry {
    /// Grams as supplied of an amount; `None` for % w/w, which needs the batch size.
    pub fn grams(&self, amount: crate::recipe::Amount) -> Option<f64> {
        use crate::recipe::Unit;
        let v = amount.value;
        match amount.unit {
            Unit::Gram => Some(v),
            Unit::Kilogram => Some(v * 1e3),
            Unit::Milligram => Some(v * 1e-3),
            Unit::Mole => Some(v * self.molar_mass_g_per_mol / self.ingredient.assay),
            Unit::Percent => None,
        }
    }
}

/// A validated library ready for use.
#[derive(Debug, Clone, PartialEq)]
pub struct Library {
    systems: Vec<System>,
    ions: Vec<Ion>,
    entries: Vec<Entry>,
    system_by_id: HashMap<String, usize>,
    ion_by_id: HashMap<String, usize>,
    entry_by_id: HashMap<String, usize>,
    hydron: usize,
    hydroxide: usize,
}

impl Library {
    /// The built-in library.
    pub fn built_in() -> Result<Self, LibraryError> {
        Self::from_ron(BUILT_IN_LIBRARY_RON, "built-in library")
    }

    /// Parses and validates a library from RON text; `origin` names it in errors.
    pub fn from_ron(text: &str, origin: &str) -> Result<Self, LibraryError> {
        let data: LibraryData = ron::from_str(text).map_err(|e| LibraryError::Syntax {
            origin: origin.to_owned(),
            line: e.span.start.line,
            column: e.span.start.col,
            message: e.code.to_string(),
        })?;
        Self::from_data(data)
    }

    /// Validates library data.
    pub fn from_data(data: LibraryData) -> Result<Self, LibraryError> {
        let mut system_by_id = HashMap::new();
        for (i, s) in data.systems.iter().enumerate() {
            validate_system(s)?;
            if system_by_id.insert(s.id.clone(), i).is_some() {
                return Err(invalid("system", &s.id, "the id is used twice"));
            }
        }
        let mut ion_by_id = HashMap::new();
        for (i, ion) in data.ions.iter().enumerate() {
            if ion.charge == 0 || ion.charge.abs() > 6 {
                return Err(invalid(
                    "ion",
                    &ion.id,
                    "the charge must be between −6 and +6 and not 0",
                ));
            }
            if system_by_id.contains_key(&ion.id) || ion_by_id.insert(ion.id.clone(), i).is_some() {
                return Err(invalid("ion", &ion.id, "the id is used twice"));
            }
        }
        let reserved = |id: &str, charge: i32| -> Result<usize, LibraryError> {
            match ion_by_id.get(id) {
                Some(&i) if data.ions[i].charge == charge => Ok(i),
                _ => Err(invalid(
                    "ion",
                    id,
                    &format!("the library must define '{id}' with charge {charge:+}"),
                )),
            }
        };
        let hydron = reserved(HYDRON, 1)?;
        let hydroxide = reserved(HYDROXIDE, -1)?;
        let mut library = Self {
            systems: data.systems,
            ions: data.ions,
            entries: Vec::new(),
            system_by_id,
            ion_by_id,
            entry_by_id: HashMap::new(),
            hydron,
            hydroxide,
        };
        for ingredient in data.ingredients {
            library.add_ingredient(ingredient)?;
        }
        Ok(library)
    }

    /// Adds systems and ingredients from another set of data (custom ingredients).
    pub fn extend(&mut self, data: LibraryData) -> Result<(), LibraryError> {
        for s in data.systems {
            validate_system(&s)?;
            if self.system_by_id.contains_key(&s.id) || self.ion_by_id.contains_key(&s.id) {
                return Err(invalid("system", &s.id, "the id is already in the library"));
            }
            self.system_by_id.insert(s.id.clone(), self.systems.len());
            self.systems.push(s);
        }
        for ion in data.ions {
            if self.ion_by_id.contains_key(&ion.id) || self.system_by_id.contains_key(&ion.id) {
                return Err(invalid("ion", &ion.id, "the id is already in the library"));
            }
            if ion.charge == 0 || ion.charge.abs() > 6 {
                return Err(invalid(
                    "ion",
                    &ion.id,
                    "the charge must be between −6 and +6 and not 0",
                ));
            }
            self.ion_by_id.insert(ion.id.clone(), self.ions.len());
            self.ions.push(ion);
        }
        for ingredient in data.ingredients {
            self.add_ingredient(ingredient)?;
        }
        Ok(())
    }

    fn add_ingredient(&mut self, ingredient: Ingredient) -> Result<(), LibraryError> {
        let id = ingredient.id.clone();
        if self.entry_by_id.contains_key(&id) {
            return Err(invalid("ingredient", &id, "the id is used twice"));
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
        if !(ingredient.assay > 0.0 && ingredient.assay <= 1.0) {
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
            match r {
                Release::Ion { id: ion_id, count } => {
                    let &ion = self.ion_by_id.get(ion_id).ok_or_else(|| {
                        invalid(
                            "ingredient",
                            &id,
                            &format!("releases unknown ion '{ion_id}'"),
                        )
                    })?;
                    charge += i64::from(self.ions[ion].charge) * i64::from(*count);
                    releases.push(ResolvedRelease::Ion {
                        ion,
                        count: f64::from(*count),
                    });
                }
                Release::System {
                    id: sys_id,
                    count,
                    form,
                } => {
                    let &system = self.system_by_id.get(sys_id).ok_or_else(|| {
                        invalid(
                            "ingredient",
                            &id,
                            &format!("releases unknown system '{sys_id}'"),
                        )
                    })?;
                    let s = &self.systems[system];
                    if *form as usize > s.pka.len() {
                        return Err(invalid(
                            "ingredient",
                            &id,
                            &format!(
                                "form {form} of '{sys_id}' does not exist: it has forms 0 to {}",
                                s.pka.len()
                            ),
                        ));
                    }
                    charge += (i64::from(s.charge_of_fully_protonated) - i64::from(*form))
                        * i64::from(*count);
                    releases.push(ResolvedRelease::System {
                        system,
                        count: f64::from(*count),
                        form: *form,
                    });
                }
            }
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

    /// All systems, in library order.
    pub fn systems(&self) -> &[System] {
        &self.systems
    }

    /// All ions, in library order.
    pub fn ions(&self) -> &[Ion] {
        &self.ions
    }

    /// All ingredients with derived data, in library order.
    pub fn entries(&self) -> &[Entry] {
        &self.entries
    }

    /// Index of an ingredient by id.
    pub fn entry_index(&self, id: &str) -> Option<usize> {
        self.entry_by_id.get(id).copied()
    }

    /// An ingredient by id.
    pub fn entry(&self, id: &str) -> Option<&Entry> {
        self.entry_index(id).map(|i| &self.entries[i])
    }

    /// Index of a system by id.
    pub fn system_index(&self, id: &str) -> Option<usize> {
        self.system_by_id.get(id).copied()
    }

    /// Index of an ion by id.
    pub fn ion_index(&self, id: &str) -> Option<usize> {
        self.ion_by_id.get(id).copied()
    }

    /// Index of the reserved hydron ion.
    pub fn hydron(&self) -> usize {
        self.hydron
    }

    /// Index of the reserved hydroxide ion.
    pub fn hydroxide(&self) -> usize {
        self.hydroxide
    }

    /// Whether an ion index is hydron or hydroxide (part of the proton balance, not a spectator).
    pub fn is_proton_ion(&self, ion: usize) -> bool {
        ion == self.hydron || ion == self.hydroxide
    }

    /// The ingredient ids nearest to a mistyped one, best first.
    pub fn suggest(&self, id: &str) -> Vec<String> {
        let needle = id.to_ascii_lowercase();
        let mut scored: Vec<(usize, &str)> = self
            .entries
            .iter()
            .map(|e| {
                let cand = e.ingredient.id.as_str();
                let mut d = edit_distance(&needle, cand);
                if cand.contains(&needle) || needle.contains(cand) {
                    d = d.min(2);
                }
                (d, cand)
            })
            .filter(|(d, _)| *d <= 3.max(needle.len() / 3))
            .collect();
        scored.sort_unstable();
        scored
            .into_iter()
            .take(3)
            .map(|(_, c)| c.to_owned())
            .collect()
    }
}

/// Names of the forms of a system: the library's, or generated from charges.
pub fn form_names(system: &System) -> Vec<String> {
    if system.forms.len() == system.pka.len() + 1 {
        return system.forms.clone();
    }
    (0..=system.pka.len())
        .map(|j| {
            let z = i64::from(system.charge_of_fully_protonated) - j as i64;
            format!("{} form {j} ({})", system.id, charge_label(z))
        })
        .collect()
}

/// A charge written as `0`, `+1`, `−2`.
pub fn charge_label(z: i64) -> String {
    match z.cmp(&0) {
        std::cmp::Ordering::Equal => "0".to_owned(),
        std::cmp::Ordering::Greater => format!("+{z}"),
        std::cmp::Ordering::Less => format!("−{}", -z),
    }
}

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
        if !pka.is_finite() || !(-5.0..=20.0).contains(pka) {
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
            "pka_ionic_strength must be between 0 and 5 mol/kg",
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

/// Molar mass of water, g/mol (re-exported for recipes).
pub const WATER_G_PER_MOL: f64 = WATER_MOLAR_MASS_G_PER_MOL;

fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    for (i, ca) in a.chars().enumerate() {
        let mut cur = vec![i + 1; b.len() + 1];
        for (j, cb) in b.iter().enumerate() {
            let sub = prev[j] + usize::from(ca != *cb);
            cur[j + 1] = sub.min(prev[j + 1] + 1).min(cur[j] + 1);
        }
        prev = cur;
    }
    prev[b.len()]
}
