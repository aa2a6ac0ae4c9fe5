//! What the window tells the person: the status line, a file problem shown until dismissed, and
//! the unsaved-changes question.
//!
//! Invariants: at most one of each; a new file problem replaces the old one; answering or
//! cancelling the question removes it.

use std::path::PathBuf;

/// An action that waits for the answer to the unsaved-changes question.
#[derive(Debug, Clone, PartialEq)]
pub enum Pending {
    /// Start a new project.
    New,
    /// Open the demo project.
    OpenDemo,
    /// Choose a project file to open.
    Open,
    /// Open this project file.
    OpenPath(PathBuf),
    /// Open the copy of unsaved work kept from an earlier session.
    Recover,
    /// Close the window.
    Quit,
}

/// An unsaved-changes question waiting for an answer.
#[derive(Debug, Clone, PartialEq)]
pub struct Prompt {
    /// What goes ahead once answered.
    pub action: Pending,
}

impl Prompt {
    /// The question in words.
    pub fn question(&self) -> &'static str {
        match self.action {
            Pending::New => "Start a new project? This one has unsaved changes.",
            Pending::OpenDemo => "Open the demo project? This one has unsaved changes.",
            Pending::Open | Pending::OpenPath(_) => {
                "Open another project? This one has unsaved changes."
            }
            Pending::Recover => {
                "Recover the unsaved work of the last session? This project has unsaved changes."
            }
            Pending::Quit => "Quit Saltwise? This project has unsaved changes.",
        }
    }
}

/// A message in the status line.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Status {
    /// The message, a sentence.
    pub text: String,
    /// Whether something failed.
    pub is_error: bool,
}

/// A problem with a file, shown in a strip under the menu until dismissed.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Notice {
    /// What failed, in a few words ("Could not open degreaser.ron").
    pub headline: String,
    /// Why, as the core reports it: what, where, what is allowed.
    pub reason: String,
    /// What this means for the open project.
    pub consequence: String,
}

/// A message from the core as the window shows it: trimmed, first letter capitalised — unless
/// the first word is a term the trade writes in lower case (pH, p[H], q.s.).
pub fn sentence(text: &str) -> String {
    let text = text.trim();
    let first_word = text.split_whitespace().next().unwrap_or("");
    let keeps_case = first_word.starts_with("q.s.") || first_word.chars().any(char::is_uppercase);
    let mut chars = text.chars();
    match chars.next() {
        Some(first) if first.is_lowercase() && !keeps_case => {
            first.to_uppercase().chain(chars).collect()
        }
        _ => text.to_owned(),
    }
}

/// The status line, the file problem and the question, each at most one.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Messages {
    status: Option<Status>,
    notice: Option<Notice>,
    prompt: Option<Prompt>,
}

impl Messages {
    /// Shows a message in the status line (sentence case, full stop added when missing).
    pub fn status(&mut self, text: &str, is_error: bool) {
        let mut text = sentence(text);
        if !text.ends_with(['.', '!', '?', ')']) {
            text.push('.');
        }
        self.status = Some(Status { text, is_error });
    }

    /// The status line, if any.
    pub fn current_status(&self) -> Option<&Status> {
        self.status.as_ref()
    }

    /// Shows a file problem, replacing any earlier one.
    pub fn notify(&mut self, notice: Notice) {
        self.notice = Some(notice);
    }

    /// Hides the file problem.
    pub fn dismiss_notice(&mut self) {
        self.notice = None;
    }

    /// The file problem shown, if any.
    pub fn notice(&self) -> Option<&Notice> {
        self.notice.as_ref()
    }

    /// Asks the unsaved-changes question before `action`.
    pub fn ask(&mut self, action: Pending) {
        self.prompt = Some(Prompt { action });
    }

    /// Takes the question away to answer it.
    pub fn take_prompt(&mut self) -> Option<Prompt> {
        self.prompt.take()
    }

    /// The question waiting for an answer, if any.
    pub fn prompt(&self) -> Option<&Prompt> {
        self.prompt.as_ref()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn status_messages_are_sentences() {
        let mut m = Messages::default();
        m.status("saved a.ron", false);
        assert_eq!(
            m.current_status().map(|s| s.text.as_str()),
            Some("Saved a.ron.")
        );
        m.status("Nothing to undo.", false);
        assert_eq!(
            m.current_status().map(|s| s.text.as_str()),
            Some("Nothing to undo.")
        );
    }

    #[test]
    fn the_trades_lower_case_terms_keep_their_case() {
        assert_eq!(sentence("pH 16 is not allowed"), "pH 16 is not allowed");
        assert_eq!(sentence("q.s. batch size 0 g"), "q.s. batch size 0 g");
        assert_eq!(sentence(" ionic strength 2"), "Ionic strength 2");
    }

    #[test]
    fn one_notice_and_one_question_at_a_time() {
        let mut m = Messages::default();
        let notice = |h: &str| Notice {
            headline: h.into(),
            reason: "r".into(),
            consequence: "c".into(),
        };
        m.notify(notice("first"));
        m.notify(notice("second"));
        assert_eq!(m.notice().map(|n| n.headline.as_str()), Some("second"));
        m.dismiss_notice();
        assert!(m.notice().is_none());
        m.ask(Pending::New);
        m.ask(Pending::Quit);
        assert_eq!(m.take_prompt().map(|p| p.action), Some(Pending::Quit));
        assert!(m.prompt().is_none());
    }
}
