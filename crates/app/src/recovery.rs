//! Copies of unsaved work kept in the OS data folder, so a crash or a kill loses at most the
//! last few seconds of editing.
//!
//! Each running workbench writes its own file, `unsaved-PID-N.ron`, atomically. A file whose
//! session is no longer running was left behind by a crash; the next start offers it back.

use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU32, Ordering};
use std::time::SystemTime;

use saltwise_chem::project::{Project, write_atomic};

/// Environment variable that overrides the data folder (tests and portable setups).
pub const DATA_DIR_ENV: &str = "SALTWISE_DATA_DIR";
/// Start of the name of every kept copy of unsaved work.
const PREFIX: &str = "unsaved-";
/// End of the name of every kept copy of unsaved work.
const SUFFIX: &str = ".ron";

/// Numbers workbenches started in one process (tests start several).
static SESSIONS: AtomicU32 = AtomicU32::new(0);

/// A copy of unsaved work left behind by a session that did not close.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct LeftBehind {
    /// The file.
    pub path: PathBuf,
    /// When it was last written.
    pub modified: Option<SystemTime>,
}

impl LeftBehind {
    /// How long ago the copy was written, in words ("2 minutes ago").
    pub fn age_words(&self) -> String {
        let Some(secs) = self
            .modified
            .and_then(|m| SystemTime::now().duration_since(m).ok())
            .map(|d| d.as_secs())
        else {
            return "at an unknown time".into();
        };
        let (n, unit) = match secs {
            0..60 => return "less than a minute ago".into(),
            60..3600 => (secs / 60, "minute"),
            3600..86_400 => (secs / 3600, "hour"),
            _ => (secs / 86_400, "day"),
        };
        format!("{n} {unit}{} ago", if n == 1 { "" } else { "s" })
    }
}

/// Where this session keeps its copy of unsaved work, and where earlier sessions kept theirs.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct RecoveryStore {
    dir: Option<PathBuf>,
    session: String,
}

impl RecoveryStore {
    /// The folder named by `SALTWISE_DATA_DIR`, else the OS data folder for Saltwise.
    pub fn from_env() -> Self {
        if let Some(dir) = std::env::var_os(DATA_DIR_ENV).filter(|d| !d.is_empty()) {
            return Self::at(PathBuf::from(dir));
        }
        let dir = directories::ProjectDirs::from("", "", "Saltwise")
            .map(|d| d.data_dir().join("unsaved"));
        Self {
            dir,
            session: session_name(),
        }
    }

    /// Copies kept in the given folder.
    pub fn at(dir: impl Into<PathBuf>) -> Self {
        Self {
            dir: Some(dir.into()),
            session: session_name(),
        }
    }

    /// Copies kept nowhere (nothing is written or offered).
    pub fn none() -> Self {
        Self {
            dir: None,
            session: session_name(),
        }
    }

    /// The folder, if there is one.
    pub fn dir(&self) -> Option<&Path> {
        self.dir.as_deref()
    }

    /// This session's copy of unsaved work, if there is a folder.
    pub fn session_file(&self) -> Option<PathBuf> {
        self.dir.as_ref().map(|d| d.join(&self.session))
    }

    /// Keeps a copy of `project` atomically (temporary file, sync, rename).
    pub fn write(&self, project: &Project) -> Result<(), String> {
        let (Some(dir), Some(file)) = (self.dir.as_ref(), self.session_file()) else {
            return Ok(());
        };
        let text = project
            .to_ron()
            .map_err(|e| format!("unsaved work could not be kept: {e}"))?;
        std::fs::create_dir_all(dir)
            .map_err(|e| format!("unsaved work could not be kept in {}: {e}", dir.display()))?;
        write_atomic(&file, text.as_bytes(), false)
            .map_err(|e| format!("unsaved work could not be kept in {}: {e}", file.display()))
    }

    /// Removes this session's copy (after a save, a clean exit, or when nothing is unsaved).
    pub fn clear(&self) {
        if let Some(file) = self.session_file() {
            // A missing file is the usual case; nothing else can be done about a failure here.
            let _ = std::fs::remove_file(file);
        }
    }

    /// Makes a left-behind copy this session's own (after it was recovered), atomically.
    pub fn adopt(&self, left: &Path) -> Result<(), String> {
        let Some(file) = self.session_file() else {
            return Ok(());
        };
        std::fs::rename(left, &file).map_err(|e| format!("{}: {e}", left.display()))
    }

    /// Copies left behind by sessions that are no longer running, newest first.
    pub fn left_behind(&self) -> Vec<LeftBehind> {
        let Some(dir) = self.dir.as_ref() else {
            return Vec::new();
        };
        let Ok(entries) = std::fs::read_dir(dir) else {
            return Vec::new();
        };
        let own_pid = std::process::id();
        let mut found: Vec<LeftBehind> = entries
            .filter_map(Result::ok)
            .filter_map(|e| {
                let name = e.file_name().to_string_lossy().into_owned();
                let pid = session_pid(&name)?;
                // A copy from this process that is not ours is from an earlier workbench of
                // this process (tests) or from a dead process whose number was reused.
                let running = pid != own_pid && process_is_running(pid);
                if name == self.session || running || !e.path().is_file() {
                    return None;
                }
                Some(LeftBehind {
                    path: e.path(),
                    modified: e.metadata().ok().and_then(|m| m.modified().ok()),
                })
            })
            .collect();
        found.sort_by(|a, b| b.modified.cmp(&a.modified).then(a.path.cmp(&b.path)));
        found
    }
}

fn session_name() -> String {
    let n = SESSIONS.fetch_add(1, Ordering::Relaxed);
    format!("{PREFIX}{}-{n}{SUFFIX}", std::process::id())
}

/// The process number in a kept copy's file name.
fn session_pid(name: &str) -> Option<u32> {
    let middle = name.strip_prefix(PREFIX)?.strip_suffix(SUFFIX)?;
    let (pid, n) = middle.split_once('-')?;
    n.parse::<u32>().ok()?;
    pid.parse().ok()
}

/// Whether a workbench with this process number is running. On Linux, `/proc` tells: a process
/// that has ended but not been reaped yet (a zombie), or an unrelated program that was given the
/// same number later, does not count. Elsewhere no process counts as running, so a second
/// window may be offered the first one's copy.
fn process_is_running(pid: u32) -> bool {
    if !cfg!(target_os = "linux") {
        return false;
    }
    let proc_dir = Path::new("/proc").join(pid.to_string());
    let Ok(stat) = std::fs::read_to_string(proc_dir.join("stat")) else {
        return false;
    };
    // The state letter follows the command name, which is in parentheses and may hold spaces.
    let state = stat
        .rfind(')')
        .and_then(|i| stat.get(i + 1..))
        .and_then(|rest| rest.split_whitespace().next());
    if matches!(state, Some("Z" | "X" | "x") | None) {
        return false;
    }
    let command = |dir: &Path| std::fs::read_to_string(dir.join("comm")).ok();
    command(&proc_dir) == command(Path::new("/proc/self"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn session_file_names_carry_the_process_number() {
        assert_eq!(session_pid("unsaved-1234-0.ron"), Some(1234));
        assert_eq!(session_pid("unsaved-1234.ron"), None);
        assert_eq!(session_pid(".unsaved-1-0.ron.saving-9"), None);
        assert_eq!(session_pid("workbench.ron"), None);
    }

    #[test]
    fn copies_of_ended_sessions_are_offered_and_this_sessions_own_is_not() {
        let dir = tempfile::tempdir().expect("temp dir");
        let a = RecoveryStore::at(dir.path());
        a.write(&Project::demo()).expect("write");
        // PID 1 is running, but it is not a workbench: its copy is from a session that ended.
        std::fs::write(dir.path().join("unsaved-1-0.ron"), "x").expect("write");
        // No process has a number this large.
        std::fs::write(dir.path().join("unsaved-4000000000-0.ron"), "x").expect("write");
        let b = RecoveryStore::at(dir.path());
        let offered: Vec<String> = b
            .left_behind()
            .iter()
            .map(|l| {
                l.path
                    .file_name()
                    .expect("name")
                    .to_string_lossy()
                    .into_owned()
            })
            .collect();
        assert!(offered.contains(&"unsaved-4000000000-0.ron".to_owned()));
        assert!(
            offered
                .iter()
                .any(|n| a.session_file().expect("file").ends_with(n)),
            "a dropped workbench of this process counts as ended"
        );
        assert!(offered.contains(&"unsaved-1-0.ron".to_owned()));
        assert!(
            a.left_behind()
                .iter()
                .all(|l| Some(&l.path) != a.session_file().as_ref())
        );
    }

    #[cfg(target_os = "linux")]
    #[test]
    fn a_running_workbench_is_told_apart_from_ended_ones() {
        // This test process runs the same program as itself, and is not a zombie.
        assert!(process_is_running(std::process::id()));
        assert!(!process_is_running(4_000_000_000));
    }
}
