//! Saving never loses work: failed saves leave the project open and unsaved with the reason on
//! screen; unsaved work is kept a few seconds after the last edit and offered back after a crash.

mod common;

use std::cell::Cell;
use std::rc::Rc;

use common::{Folders, citric_project, file_names, harness_in};
use egui_kittest::kittest::Queryable as _;
use saltwise::{AUTOSAVE_IDLE_SECS, Command};
use saltwise_chem::project::{Project, backup_path};

/// Input time of one harness step, seconds (egui_kittest's default).
const STEP_SECS: f64 = 0.25;

/// Enough steps for the autosave idle time to pass.
fn idle_steps() -> usize {
    (AUTOSAVE_IDLE_SECS / STEP_SECS).ceil() as usize + 2
}

/// A session that edits the citric rinse, idles until its copy is written, then ends
/// without saving (as a crash would leave it).
fn leave_unsaved_copy(folders: &Folders) {
    let mut h = harness_in(citric_project(), folders);
    h.get_by_label("Remove line 1").click();
    h.run();
    h.run_steps(idle_steps());
}

#[test]
fn a_save_into_a_folder_that_is_gone_is_explained_and_the_work_stays_open_and_unsaved() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    let mut h = harness_in(citric_project(), &folders);
    h.get_by_label("Remove line 1").click();
    h.run();
    let edited = h.state().project().clone();

    let target = dir.path().join("gone").join("rinse.ron");
    h.state_mut().queue(Command::SaveToPath(target.clone()));
    h.run();

    h.get_by_label("Could not save rinse.ron");
    let reason = h.state().notice().unwrap().reason.clone();
    assert!(reason.contains("does not exist"), "{reason}");
    h.get_by_label(&reason);
    h.get_by_label_contains("Nothing was lost");
    assert_eq!(h.state().project(), &edited, "the project is untouched");
    assert!(h.state().is_dirty(), "still marked unsaved");
    assert!(h.state().title().starts_with('•'));
    assert_eq!(h.state().file_path(), None);
    assert!(!target.exists());
}

#[test]
fn a_save_onto_a_folder_is_refused_with_the_reason() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    let folder = dir.path().join("batch-records.ron");
    std::fs::create_dir(&folder).unwrap();
    let mut h = harness_in(citric_project(), &folders);
    h.get_by_label("Remove line 1").click();
    h.run();

    h.state_mut().queue(Command::SaveToPath(folder.clone()));
    h.run();
    h.get_by_label("Could not save batch-records.ron");
    h.get_by_label_contains("is a folder, not a file");
    assert!(h.state().is_dirty());
    assert!(folder.is_dir(), "the folder is left as it was");
    assert!(file_names(&folder).is_empty());
}

#[cfg(unix)]
#[test]
fn a_save_into_a_read_only_folder_is_refused_with_the_systems_reason() {
    use std::os::unix::fs::PermissionsExt as _;
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    let locked = dir.path().join("locked");
    std::fs::create_dir(&locked).unwrap();
    std::fs::set_permissions(&locked, std::fs::Permissions::from_mode(0o555)).unwrap();
    if std::fs::write(locked.join("probe"), "x").is_ok() {
        // Running as root: permissions do not stop writes, so there is nothing to test.
        eprintln!("skipped: this user can write into read-only folders");
        return;
    }
    let mut h = harness_in(citric_project(), &folders);
    h.get_by_label("Remove line 1").click();
    h.run();
    h.state_mut()
        .queue(Command::SaveToPath(locked.join("rinse.ron")));
    h.run();
    h.get_by_label("Could not save rinse.ron");
    h.get_by_label_contains("ermission denied");
    assert!(h.state().is_dirty());
    std::fs::set_permissions(&locked, std::fs::Permissions::from_mode(0o755)).unwrap();
}

#[test]
fn a_failure_between_writing_and_renaming_leaves_the_old_file_whole_and_the_next_save_works() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    let file = dir.path().join("rinse.ron");
    let mut h = harness_in(citric_project(), &folders);
    h.state_mut().queue(Command::SaveToPath(file.clone()));
    h.run();
    assert!(!h.state().is_dirty());
    let first = std::fs::read(&file).unwrap();

    // The disk fails once, after the new text is written and synced but before the rename.
    let failures = Rc::new(Cell::new(0));
    let count = Rc::clone(&failures);
    h.state_mut().inject_save_fault(move |tmp| {
        assert!(
            tmp.exists(),
            "the temporary file is written before the rename"
        );
        count.set(count.get() + 1);
        if count.get() == 1 {
            Err(std::io::Error::other(
                "no space left on the device (simulated)",
            ))
        } else {
            Ok(())
        }
    });
    h.get_by_label("Remove line 1").click();
    h.run();
    let edited = h.state().project().clone();
    h.state_mut().queue(Command::Save);
    h.run();

    assert_eq!(failures.get(), 1);
    h.get_by_label("Could not save rinse.ron");
    h.get_by_label_contains("no space left on the device (simulated)");
    assert_eq!(
        std::fs::read(&file).unwrap(),
        first,
        "the old file is whole"
    );
    assert_eq!(
        file_names(dir.path()),
        ["config", "rinse.ron"],
        "no temporary file is left behind"
    );
    assert_eq!(h.state().project(), &edited);
    assert!(h.state().is_dirty());

    h.state_mut().queue(Command::Save);
    h.run();
    assert!(!h.state().is_dirty(), "{:?}", h.state().status_text());
    assert!(
        h.state().notice().is_none(),
        "a good save clears the notice"
    );
    assert_eq!(Project::load(&file).unwrap(), edited);
    assert_eq!(std::fs::read(backup_path(&file)).unwrap(), first);
}

#[test]
fn unsaved_work_is_kept_a_few_idle_seconds_after_the_last_edit() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    let mut h = harness_in(citric_project(), &folders);
    let kept = h.state().recovery_file().unwrap();
    assert!(kept.starts_with(&folders.data));

    h.get_by_label("Remove line 1").click();
    h.run();
    assert!(!kept.exists(), "not while the edit is fresh");
    h.run_steps(idle_steps());
    assert_eq!(&Project::load(&kept).unwrap(), h.state().project());

    // A later edit is kept too, once it has been idle.
    h.state_mut().project_mut().name = "Citric rinse, second try".into();
    h.run();
    assert_ne!(&Project::load(&kept).unwrap(), h.state().project());
    h.run_steps(idle_steps());
    assert_eq!(
        Project::load(&kept).unwrap().name,
        "Citric rinse, second try"
    );

    // Saving the project makes the copy unnecessary.
    h.state_mut()
        .queue(Command::SaveToPath(dir.path().join("rinse.ron")));
    h.run();
    assert!(!kept.exists());
}

#[test]
fn undoing_back_to_the_saved_state_removes_the_kept_copy() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    let mut h = harness_in(citric_project(), &folders);
    let kept = h.state().recovery_file().unwrap();
    h.get_by_label("Remove line 1").click();
    h.run();
    h.run_steps(idle_steps());
    assert!(kept.exists());
    h.state_mut().queue(Command::Undo);
    h.run();
    assert!(!h.state().is_dirty());
    assert!(!kept.exists(), "nothing is unsaved any more");
}

#[test]
fn after_a_crash_the_next_start_offers_the_unsaved_work_back() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    let edited = {
        let mut h = harness_in(citric_project(), &folders);
        h.get_by_label("Remove line 1").click();
        h.run();
        h.run_steps(idle_steps());
        h.state().project().clone()
        // The harness is dropped here without quitting, as a crash would leave it.
    };
    assert_eq!(file_names(&folders.data).len(), 1);

    let mut h = harness_in(Project::demo(), &folders);
    assert!(h.state().recovery_offer().is_some());
    h.get_by_label_contains("Unsaved work from a session that did not close was kept");
    h.get_by_label_contains("“Citric rinse”, 1 recipe line");
    h.get_by_label("Recover it").click();
    h.run();
    assert_eq!(h.state().project(), &edited);
    assert!(h.state().is_dirty(), "recovered work still needs saving");
    assert!(h.state().file_path().is_none());
    // The copy is now this session's own: a second crash would still not lose it.
    let own = h.state().recovery_file().unwrap();
    assert_eq!(
        file_names(&folders.data),
        [own.file_name().unwrap().to_string_lossy()]
    );
    assert_eq!(Project::load(&own).unwrap(), edited);

    // Saving it clears the kept copy, so the next session is not offered it again.
    h.state_mut()
        .queue(Command::SaveToPath(dir.path().join("kept.ron")));
    h.run();
    assert!(file_names(&folders.data).is_empty());
    let next = harness_in(Project::demo(), &folders);
    assert!(next.state().recovery_offer().is_none());
}

#[test]
fn recovering_over_unsaved_changes_asks_first() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    leave_unsaved_copy(&folders);
    let mut h = harness_in(Project::demo(), &folders);
    h.get_by_label("Remove line 4").click();
    h.run();
    let mine = h.state().project().clone();
    h.get_by_label("Recover it").click();
    h.run();
    assert!(h.state().prompt().is_some());
    h.get_by_label("Cancel").click();
    h.run();
    assert_eq!(h.state().project(), &mine);
    assert!(
        h.state().recovery_offer().is_some(),
        "the offer stays until answered"
    );
}

#[test]
fn throwing_the_kept_copy_away_removes_it() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    leave_unsaved_copy(&folders);
    let mut h = harness_in(Project::demo(), &folders);
    h.get_by_label("Throw it away").click();
    h.run();
    assert!(h.state().recovery_offer().is_none());
    assert!(file_names(&folders.data).is_empty());
    assert_eq!(h.state().project(), &Project::demo());
}

#[test]
fn a_kept_copy_that_cannot_be_read_is_explained_and_left_in_place() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    std::fs::create_dir_all(&folders.data).unwrap();
    let broken = folders.data.join("unsaved-4000000000-0.ron");
    std::fs::write(&broken, "(format_version: 1, recipe: (lines: [").unwrap();
    let mut h = harness_in(Project::demo(), &folders);
    h.get_by_label("Recover it").click();
    h.run();
    h.get_by_label("Could not recover the unsaved work");
    assert_eq!(h.state().project(), &Project::demo());
    assert!(broken.exists(), "the copy is kept for a person to look at");
}

#[test]
fn an_autosave_that_cannot_be_written_says_so_and_loses_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    // The data folder's place is taken by a file.
    std::fs::write(&folders.data, "not a folder").unwrap();
    let mut h = harness_in(citric_project(), &folders);
    h.get_by_label("Remove line 1").click();
    h.run();
    h.run_steps(idle_steps());
    let status = h.state().status_text().unwrap().to_owned();
    assert!(
        status.contains("Unsaved work could not be kept"),
        "{status}"
    );
    h.get_by_label(&status);
    assert_eq!(h.state().project().recipe().lines.len(), 1);
    assert!(h.state().is_dirty());
}

#[test]
fn quitting_without_unsaved_changes_leaves_no_copy_behind() {
    let dir = tempfile::tempdir().unwrap();
    let folders = Folders::under(dir.path());
    let mut h = harness_in(citric_project(), &folders);
    h.get_by_label("Remove line 1").click();
    h.run();
    h.run_steps(idle_steps());
    h.state_mut()
        .queue(Command::SaveToPath(dir.path().join("rinse.ron")));
    h.state_mut().queue(Command::Quit);
    h.run();
    assert!(h.state().quit_requested());
    assert!(file_names(&folders.data).is_empty());
}
