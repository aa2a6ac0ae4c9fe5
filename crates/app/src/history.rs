//! Undo and redo over project edits: snapshots taken when an edit has settled.

use saltwise_chem::project::Project;

/// Most undo steps kept.
const MAX_STEPS: usize = 200;

/// Undo and redo stacks of project snapshots.
#[derive(Debug, Clone)]
pub struct History {
    undo: Vec<Project>,
    redo: Vec<Project>,
    committed: Project,
}

impl History {
    /// A history that starts at `project`.
    pub fn new(project: &Project) -> Self {
        Self {
            undo: Vec::new(),
            redo: Vec::new(),
            committed: project.clone(),
        }
    }

    /// Records the current project as one step if it differs from the last one recorded.
    ///
    /// Called every frame with `settled` false while a drag or a text edit is in progress, so a
    /// whole drag becomes one step.
    pub fn observe(&mut self, current: &Project, settled: bool) {
        if settled && *current != self.committed {
            let previous = std::mem::replace(&mut self.committed, current.clone());
            self.undo.push(previous);
            if self.undo.len() > MAX_STEPS {
                self.undo.remove(0);
            }
            self.redo.clear();
        }
    }

    /// Steps back; returns whether anything changed.
    pub fn undo(&mut self, current: &mut Project) -> bool {
        self.observe(current, true);
        let Some(previous) = self.undo.pop() else {
            return false;
        };
        let now = std::mem::replace(&mut self.committed, previous);
        self.redo.push(now);
        *current = self.committed.clone();
        true
    }

    /// Steps forward again; returns whether anything changed.
    pub fn redo(&mut self, current: &mut Project) -> bool {
        self.observe(current, true);
        let Some(next) = self.redo.pop() else {
            return false;
        };
        let now = std::mem::replace(&mut self.committed, next);
        self.undo.push(now);
        *current = self.committed.clone();
        true
    }

    /// Whether there is a step to undo.
    pub fn can_undo(&self) -> bool {
        !self.undo.is_empty()
    }

    /// Whether there is a step to redo.
    pub fn can_redo(&self) -> bool {
        !self.redo.is_empty()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_settled_edit_undoes_and_redoes() {
        let mut p = Project::demo();
        let mut h = History::new(&p);
        p.name = "changed".into();
        h.observe(&p, false);
        assert!(!h.can_undo(), "an edit in progress is not a step yet");
        h.observe(&p, true);
        assert!(h.undo(&mut p));
        assert_eq!(p, Project::demo());
        assert!(h.redo(&mut p));
        assert_eq!(p.name, "changed");
    }
}
