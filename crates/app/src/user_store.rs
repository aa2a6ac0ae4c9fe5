//! The user's own library file (fitted ingredients), shared with the command line: read at
//! start, added to atomically (the previous copy kept as `.bak`).
//!
//! The file is `user-library.ron` in `$SALTWISE_DATA_DIR` when set, else in the OS data folder
//! of Saltwise (on Linux `$XDG_DATA_HOME/saltwise` or `~/.local/share/saltwise`) — the same
//! place `saltwise-cli fit --save-to-library` writes.

use std::path::{Path, PathBuf};

use saltwise_chem::Library;
use saltwise_chem::library::LibraryData;
use saltwise_chem::user_library::{Provenance, USER_LIBRARY_FILE, UserLibrary};

use crate::recovery::DATA_DIR_ENV;

/// Where the user library file is, if anywhere.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct UserStore {
    path: Option<PathBuf>,
}

impl UserStore {
    /// The file in `$SALTWISE_DATA_DIR`, else in the OS data folder.
    pub fn from_env() -> Self {
        let dir = std::env::var_os(DATA_DIR_ENV)
            .filter(|d| !d.is_empty())
            .map(PathBuf::from)
            .or_else(|| {
                directories::ProjectDirs::from("", "", "Saltwise")
                    .map(|d| d.data_dir().to_path_buf())
            });
        Self {
            path: dir.map(|d| d.join(USER_LIBRARY_FILE)),
        }
    }

    /// The file `user-library.ron` in the given folder.
    pub fn in_dir(dir: &Path) -> Self {
        Self {
            path: Some(dir.join(USER_LIBRARY_FILE)),
        }
    }

    /// The file, if there is a folder for it.
    pub fn path(&self) -> Option<&Path> {
        self.path.as_deref()
    }

    /// The library as saved: empty when there is no file yet, or why it cannot be read.
    pub fn read(&self) -> Result<UserLibrary, String> {
        match self.path.as_deref() {
            Some(path) => UserLibrary::read_file(path).map_err(|e| e.to_string()),
            None => Ok(UserLibrary::default()),
        }
    }

    /// Adds an entry over `base` and writes the file; returns the library as it is now.
    pub fn add(
        &self,
        base: &Library,
        entry: LibraryData,
        provenance: Provenance,
    ) -> Result<UserLibrary, String> {
        let path = self
            .path
            .as_deref()
            .ok_or("no data folder is known for this user; set SALTWISE_DATA_DIR to a folder")?;
        UserLibrary::add_to_file(path, base, entry, provenance).map_err(|e| e.to_string())
    }
}
