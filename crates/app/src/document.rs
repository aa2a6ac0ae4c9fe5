//! The open document: the project, the copy last saved, its file, the undo history and the
//! window title that follows from them.
//!
//! Invariants: the project is dirty exactly when it differs from the saved copy; replacing the
//! project starts a fresh history; a discrete edit is one undo step of its own, even in the
//! middle of a drag.

use std::path::{Path, PathBuf};

use saltwise_chem::project::Project;

use crate::history::History;

/// The project being worked on, with what is needed to save it and step back through it.
#[derive(Debug, Clone)]
pub struct Document {
    project: Project,
    saved: Project,
    file: Option<PathBuf>,
    history: History,
}

impl Document {
    /// A document on `project`, not yet saved to a file.
    pub fn new(project: Project) -> Self {
        Self {
            saved: project.clone(),
            history: History::new(&project),
            project,
            file: None,
        }
    }

    /// The project.
    pub fn project(&self) -> &Project {
        &self.project
    }

    /// The project, for edits that are recorded when they settle (drags and typing).
    pub fn project_mut(&mut self) -> &mut Project {
        &mut self.project
    }

    /// The file the project was last opened from or saved to.
    pub fn file(&self) -> Option<&Path> {
        self.file.as_deref()
    }

    /// Whether the project differs from what was last opened or saved.
    pub fn is_dirty(&self) -> bool {
        self.project != self.saved
    }

    /// The window title: the file name (or project name) and an unsaved-changes mark.
    pub fn title(&self) -> String {
        let name = match &self.file {
            Some(p) => file_name(p),
            None if self.project.name.trim().is_empty() => "Untitled".to_owned(),
            None => self.project.name.clone(),
        };
        let mark = if self.is_dirty() { "• " } else { "" };
        format!("{mark}{name} — Saltwise")
    }

    /// Replaces the project with one opened from `file` (or made new): nothing is unsaved and
    /// the history starts again.
    pub fn replace(&mut self, project: Project, file: Option<PathBuf>) {
        *self = Self::new(project);
        self.file = file;
    }

    /// Replaces the project with work that was never saved: no file, and all of it counts as a
    /// change.
    pub fn replace_with_unsaved(&mut self, project: Project) {
        self.replace(project, None);
        self.saved = Project::default();
    }

    /// Records that the project was just saved to `path`.
    pub fn mark_saved(&mut self, path: PathBuf) {
        self.saved = self.project.clone();
        self.file = Some(path);
    }

    /// Makes one discrete edit, recorded as its own undo step; returns whether it changed
    /// anything.
    pub fn edit(&mut self, change: impl FnOnce(&mut Project)) -> bool {
        // An edit in progress (a drag) becomes a step of its own first.
        self.history.observe(&self.project, true);
        let before = self.project.clone();
        change(&mut self.project);
        self.history.observe(&self.project, true);
        self.project != before
    }

    /// Records a drag or typed edit once it has settled (called every frame).
    pub fn observe(&mut self, settled: bool) {
        self.history.observe(&self.project, settled);
    }

    /// Steps back one edit; returns whether there was one.
    pub fn undo(&mut self) -> bool {
        self.history.undo(&mut self.project)
    }

    /// Steps forward one edit; returns whether there was one.
    pub fn redo(&mut self) -> bool {
        self.history.redo(&mut self.project)
    }

    /// Whether there is an edit to undo.
    pub fn can_undo(&self) -> bool {
        self.history.can_undo()
    }

    /// Whether there is an edit to redo.
    pub fn can_redo(&self) -> bool {
        self.history.can_redo()
    }

    /// A file name for Save as…, from the project name.
    pub fn suggested_file_name(&self) -> String {
        let stem: String = self
            .project
            .name
            .chars()
            .map(|c| {
                if c.is_alphanumeric() {
                    c.to_ascii_lowercase()
                } else {
                    '-'
                }
            })
            .collect();
        let stem = stem.trim_matches('-');
        if stem.is_empty() {
            "project.ron".into()
        } else {
            format!("{stem}.ron")
        }
    }
}

/// The last part of a path, for titles and headlines.
pub fn file_name(path: &Path) -> String {
    path.file_name().map_or_else(
        || path.display().to_string(),
        |n| n.to_string_lossy().into_owned(),
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use saltwise_chem::RecipeLine;

    #[test]
    fn a_new_document_is_clean_and_titled_by_its_project() {
        let doc = Document::new(Project::demo());
        assert!(!doc.is_dirty());
        assert!(!doc.can_undo());
        assert_eq!(
            doc.title(),
            "Meadowbrook mild cleanser base (demo) — Saltwise"
        );
    }

    #[test]
    fn saving_clears_the_mark_and_names_the_file() {
        let mut doc = Document::new(Project::demo());
        doc.project_mut().name = "Changed".into();
        assert!(doc.is_dirty());
        assert!(doc.title().starts_with("• Changed"));
        doc.mark_saved(PathBuf::from("/tmp/x/rinse.ron"));
        assert!(!doc.is_dirty());
        assert_eq!(doc.title(), "rinse.ron — Saltwise");
    }

    #[test]
    fn a_discrete_edit_is_its_own_step_even_during_a_drag() {
        let mut doc = Document::new(Project::demo());
        // A drag in progress, not yet settled.
        doc.project_mut().recipe_mut().lines[0].amount.value = 0.9;
        doc.observe(false);
        assert!(doc.edit(|p| p.recipe_mut().lines.push(RecipeLine::grams("water", 5.0))));
        assert_eq!(doc.project().recipe().lines.len(), 5);
        assert!(doc.undo(), "the added line is undone first");
        assert_eq!(doc.project().recipe().lines.len(), 4);
        assert!((doc.project().recipe().lines[0].amount.value - 0.9).abs() < 1e-12);
        assert!(doc.undo(), "then the drag");
        assert_eq!(doc.project(), &Project::demo());
        assert!(doc.redo() && doc.redo());
        assert_eq!(doc.project().recipe().lines.len(), 5);
    }

    #[test]
    fn an_edit_that_changes_nothing_adds_no_step() {
        let mut doc = Document::new(Project::demo());
        assert!(!doc.edit(|_| {}));
        assert!(!doc.can_undo());
    }

    #[test]
    fn unsaved_work_counts_as_changed_and_replacing_starts_a_new_history() {
        let mut doc = Document::new(Project::demo());
        doc.edit(|p| p.name = "x".into());
        doc.replace_with_unsaved(Project::demo());
        assert!(doc.is_dirty());
        assert!(doc.file().is_none());
        assert!(!doc.can_undo());
        doc.replace(Project::default(), Some(PathBuf::from("a.ron")));
        assert!(!doc.is_dirty());
        assert_eq!(doc.file(), Some(Path::new("a.ron")));
    }

    #[test]
    fn suggested_names_are_plain_file_names() {
        let mut doc = Document::new(Project::demo());
        doc.project_mut().name = "Tidewater: degreaser #2".into();
        assert_eq!(doc.suggested_file_name(), "tidewater--degreaser--2.ron");
        doc.project_mut().name = "  ".into();
        assert_eq!(doc.suggested_file_name(), "project.ron");
    }
}
