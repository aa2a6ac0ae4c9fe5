//! Fuzz the project-file reader: any bytes must give a project or a typed error, never a panic.
#![no_main]

use libfuzzer_sys::fuzz_target;
use saltwise_chem::project::Project;

fuzz_target!(|data: &[u8]| {
    if let Ok(text) = std::str::from_utf8(data) {
        if let Ok(project) = Project::from_ron(text, "fuzz.ron") {
            assert!(project.validate("fuzz.ron").is_ok());
            if let Ok(library) = saltwise_chem::Library::built_in() {
                let _ = project.library(&library, "fuzz.ron", Some(text));
            }
        }
    }
});
