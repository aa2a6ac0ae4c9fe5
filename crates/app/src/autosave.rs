//! When to keep a copy of unsaved work, and the copy an earlier session left behind.
//!
//! Invariants: a copy is written only when the project has unsaved changes that are not kept
//! yet, and only after the edits have been idle for a while; a clean project has no copy; a
//! failed write is not retried for half a minute.

use std::path::{Path, PathBuf};
use std::time::Duration;

use saltwise_chem::project::Project;

use crate::recovery::{LeftBehind, RecoveryStore};

/// Default seconds of idle after the last edit before unsaved work is kept.
pub const AUTOSAVE_IDLE_SECS: f64 = 3.0;
/// Seconds before a failed autosave is tried again.
const RETRY_SECS: f64 = 30.0;

/// What one look at the project decided.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Tick {
    /// Nothing to do.
    Idle,
    /// Come back after this long, even with no input.
    WakeAfter(Duration),
    /// A copy was written.
    Kept,
    /// The copy could not be written; the reason, in words.
    Failed(String),
}

/// A copy of unsaved work from an earlier session, offered back.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Offer {
    /// The copy.
    pub left: LeftBehind,
    /// Its project name and size, if it could be read.
    pub summary: Option<String>,
    /// How many more copies than this one were left behind.
    pub more: usize,
}

/// Keeps this session's unsaved work and offers back what earlier sessions left.
#[derive(Debug)]
pub struct Autosave {
    store: RecoveryStore,
    idle_secs: f64,
    /// The project at the last edit seen, and when that was (seconds of input time).
    last_edit: Option<(Project, f64)>,
    /// The project as last kept.
    kept: Option<Project>,
    /// After a failed write, no new attempt before this time (seconds of input time).
    retry_at: f64,
    offer: Option<Offer>,
}

impl Autosave {
    /// Copies kept by `store`, written after the default idle time.
    pub fn new(store: RecoveryStore) -> Self {
        Self {
            store,
            idle_secs: AUTOSAVE_IDLE_SECS,
            last_edit: None,
            kept: None,
            retry_at: 0.0,
            offer: None,
        }
    }

    /// Sets the seconds of idle after the last edit before a copy is written.
    pub fn set_idle_secs(&mut self, secs: f64) {
        self.idle_secs = secs.max(0.0);
    }

    /// This session's copy (whether or not it exists yet).
    pub fn session_file(&self) -> Option<PathBuf> {
        self.store.session_file()
    }

    /// Looks at the project at time `now_secs` and keeps a copy when it is due.
    pub fn tick(&mut self, project: &Project, dirty: bool, now_secs: f64) -> Tick {
        if self.last_edit.as_ref().is_none_or(|(p, _)| p != project) {
            self.last_edit = Some((project.clone(), now_secs));
        }
        if !dirty {
            // Back to what is on disk (an undo, a save): nothing needs recovering.
            if self.kept.is_some() {
                self.forget();
            }
            return Tick::Idle;
        }
        if self.kept.as_ref() == Some(project) {
            return Tick::Idle;
        }
        let edited_at = self.last_edit.as_ref().map_or(now_secs, |(_, t)| *t);
        let due = (edited_at + self.idle_secs).max(self.retry_at);
        if now_secs < due {
            return Tick::WakeAfter(Duration::from_secs_f64(due - now_secs));
        }
        match self.store.write(project) {
            Ok(()) => {
                self.kept = Some(project.clone());
                self.retry_at = 0.0;
                Tick::Kept
            }
            Err(e) => {
                self.retry_at = now_secs + RETRY_SECS;
                Tick::Failed(format!("{e}; trying again in 30 s"))
            }
        }
    }

    /// This session's copy is no longer needed (saved, closed cleanly, or nothing unsaved).
    pub fn forget(&mut self) {
        self.store.clear();
        self.kept = None;
    }

    /// Takes a recovered copy as this session's own, so it is kept until saved.
    pub fn adopt(&mut self, left: &Path, project: &Project) -> Result<(), String> {
        self.store.adopt(left)?;
        self.kept = Some(project.clone());
        Ok(())
    }

    /// Looks for copies left behind by sessions that did not close; `summary` describes one.
    pub fn look_for_left_behind(&mut self, summary: impl Fn(&Path) -> Option<String>) {
        let mut left = self.store.left_behind();
        let more = left.len().saturating_sub(1);
        self.offer = (!left.is_empty()).then(|| {
            let left = left.remove(0);
            Offer {
                summary: summary(&left.path),
                left,
                more,
            }
        });
    }

    /// The copy offered back, if any.
    pub fn offer(&self) -> Option<&Offer> {
        self.offer.as_ref()
    }

    /// Takes the offered copy to recover or discard it.
    pub fn take_offer(&mut self) -> Option<Offer> {
        self.offer.take()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn changed() -> Project {
        let mut p = Project::demo();
        p.name = "changed".into();
        p
    }

    #[test]
    fn a_copy_is_kept_only_after_the_edits_are_idle() {
        let dir = tempfile::tempdir().expect("temp dir");
        let mut a = Autosave::new(RecoveryStore::at(dir.path()));
        let p = changed();
        assert_eq!(
            a.tick(&p, true, 10.0),
            Tick::WakeAfter(Duration::from_secs(3))
        );
        assert!(matches!(a.tick(&p, true, 12.0), Tick::WakeAfter(_)));
        assert_eq!(a.tick(&p, true, 13.0), Tick::Kept);
        let file = a.session_file().expect("file");
        assert!(file.is_file());
        assert_eq!(a.tick(&p, true, 20.0), Tick::Idle, "nothing new to keep");
        // Back to the saved state: the copy goes.
        assert_eq!(a.tick(&p, false, 21.0), Tick::Idle);
        assert!(!file.exists());
    }

    #[test]
    fn a_failed_write_waits_before_trying_again() {
        let dir = tempfile::tempdir().expect("temp dir");
        let blocked = dir.path().join("blocked");
        std::fs::write(&blocked, "a file where the folder should be").expect("write");
        let mut a = Autosave::new(RecoveryStore::at(&blocked));
        a.set_idle_secs(0.0);
        let p = changed();
        assert!(matches!(a.tick(&p, true, 1.0), Tick::Failed(why) if why.contains("30 s")));
        assert_eq!(
            a.tick(&p, true, 2.0),
            Tick::WakeAfter(Duration::from_secs(29))
        );
    }

    #[test]
    fn copies_of_other_sessions_are_offered_with_a_summary() {
        let dir = tempfile::tempdir().expect("temp dir");
        // No process has a number this large: its session ended.
        std::fs::write(dir.path().join("unsaved-4000000000-0.ron"), "x").expect("write");
        std::fs::write(dir.path().join("unsaved-4000000001-0.ron"), "y").expect("write");
        let mut a = Autosave::new(RecoveryStore::at(dir.path()));
        a.look_for_left_behind(|_| Some("a summary".into()));
        let offer = a.offer().expect("offered");
        assert_eq!(offer.more, 1);
        assert_eq!(offer.summary.as_deref(), Some("a summary"));
        assert!(a.take_offer().is_some());
        assert!(a.offer().is_none());
    }
}
