//! The ingredient library: systems, ions and ingredients, validated and indexed by id.
//!
//! The data as written live in `model.rs`; loading and every check in `load.rs`; the derived
//! [`Entry`] of an ingredient in `entry.rs`; suggestions for mistyped ids in `suggest.rs`; names
//! of the forms of a system in `forms.rs`. This file holds the indexed [`Library`] and its lookups.

mod entry;
mod forms;
mod load;
mod model;
mod speciation;
mod suggest;

use std::collections::HashMap;

pub use entry::{Entry, ResolvedRelease};
pub use forms::{charge_label, form_names};
pub use model::{
    Complex, Hazard, Ingredient, Ion, LibraryData, PitzerData, PitzerMixing, PitzerPair,
    PitzerTriple, Release, Solid, System,
};
pub use speciation::{PitzerTable, ResolvedComplex, ResolvedSolid, Species};

/// Id of the reserved ion for a proton released by a strong acid.
pub const HYDRON: &str = "hydron";
/// Id of the reserved ion for a hydroxide released by a strong base.
pub const HYDROXIDE: &str = "hydroxide";
/// Id of the water ingredient.
pub const WATER: &str = "water";

/// Most acid steps a system may have.
pub const MAX_STEPS: usize = 10;

/// A validated library ready for use.
#[derive(Debug, Clone, PartialEq)]
pub struct Library {
    systems: Vec<System>,
    ions: Vec<Ion>,
    entries: Vec<Entry>,
    system_by_id: HashMap<String, usize>,
    ion_by_id: HashMap<String, usize>,
    entry_by_id: HashMap<String, usize>,
    complexes: Vec<ResolvedComplex>,
    solids: Vec<ResolvedSolid>,
    pitzer: PitzerTable,
    hydron: usize,
    hydroxide: usize,
}

impl Library {
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
}
