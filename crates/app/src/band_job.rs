//! The pH band of the current recipe, drawn a part at a time within a frame's budget so the
//! window never waits on it, and kept until its recipe, tolerances, samples or seed change.

use std::time::{Duration, Instant};

use saltwise_chem::project::Settings;
use saltwise_chem::solver::Constants;
use saltwise_chem::tolerance::{Band, BandRun, Perturber, Tolerances};
use saltwise_chem::{Library, Recipe};

/// Longest a frame spends drawing samples before it shows progress and goes on next frame.
const FRAME_BUDGET: Duration = Duration::from_millis(8);
/// Samples drawn between looks at the clock.
const CHUNK: usize = 25;

/// What a band is made from.
#[derive(Debug, Clone, PartialEq)]
pub struct BandKey {
    recipe: Recipe,
    tolerances: Tolerances,
    samples: usize,
    seed: u64,
}

impl BandKey {
    /// The key of the band for this recipe and settings.
    pub fn of(recipe: &Recipe, settings: &Settings) -> Self {
        Self {
            recipe: recipe.clone(),
            tolerances: settings.tolerances.clone(),
            samples: settings.band_samples,
            seed: settings.band_seed,
        }
    }
}

/// How far the band is.
#[derive(Debug, Clone, PartialEq)]
pub enum BandState {
    /// Still drawing samples.
    Drawing(BandRun),
    /// Finished, or why it could not be drawn.
    Done(Result<Band, String>),
}

/// Whether any tolerance or assay range is set (otherwise there is no band to show).
pub fn any_set(t: &Tolerances) -> bool {
    t.all_percent > 0.0 || t.per_ingredient.iter().any(|(_, p)| *p > 0.0) || !t.assay.is_empty()
}

/// One band, with the key it is for.
#[derive(Debug, Clone, PartialEq)]
pub struct BandJob {
    /// What the band is made from.
    pub key: BandKey,
    /// How far it is.
    pub state: BandState,
}

impl BandJob {
    /// A band for `key`, none of it drawn (or why it cannot be).
    pub fn start(key: BandKey) -> Self {
        let state = match BandRun::new(key.samples, key.seed) {
            Ok(run) => BandState::Drawing(run),
            Err(e) => BandState::Done(Err(e.to_string())),
        };
        Self { key, state }
    }

    /// A band for `key` that cannot be drawn, and why.
    pub fn failed(key: BandKey, why: &str) -> Self {
        Self {
            key,
            state: BandState::Done(Err(why.to_owned())),
        }
    }

    /// Draws samples until the frame's budget is spent or the band is done; returns whether
    /// anything was drawn.
    pub fn advance(&mut self, library: &Library, constants: &Constants) -> bool {
        let BandState::Drawing(run) = &mut self.state else {
            return false;
        };
        let perturber =
            match Perturber::new(library, constants, &self.key.recipe, &self.key.tolerances) {
                Ok(p) => p,
                Err(e) => {
                    self.state = BandState::Done(Err(e.to_string()));
                    return true;
                }
            };
        let started = Instant::now();
        while !run.is_done() && started.elapsed() < FRAME_BUDGET {
            perturber.advance(run, CHUNK);
        }
        if run.is_done() {
            self.state = BandState::Done(Ok(perturber.finish(run)));
        }
        true
    }

    /// Whether samples are still being drawn.
    pub fn is_drawing(&self) -> bool {
        matches!(self.state, BandState::Drawing(_))
    }
}
