//! The user's own library file in the OS data folder: where it is, reading it into the library
//! every command uses, and adding a fitted entry to it (atomic write, previous copy kept).
//!
//! The folder is `$SALTWISE_DATA_DIR` when set, else the OS data folder of Saltwise (on Linux
//! `$XDG_DATA_HOME/saltwise` or `~/.local/share/saltwise`).

use std::path::PathBuf;

use anyhow::{Context, Result, anyhow};
use saltwise_chem::Library;
use saltwise_chem::library::LibraryData;
use saltwise_chem::user_library::{Provenance, USER_LIBRARY_FILE, UserLibrary};

/// Environment variable that overrides the data folder (tests, portable installs).
pub const DATA_DIR_ENV: &str = "SALTWISE_DATA_DIR";

/// The data folder.
pub fn data_dir() -> Result<PathBuf> {
    if let Some(d) = std::env::var_os(DATA_DIR_ENV).filter(|d| !d.is_empty()) {
        return Ok(PathBuf::from(d));
    }
    directories::ProjectDirs::from("", "", "Saltwise")
        .map(|p| p.data_dir().to_path_buf())
        .ok_or_else(|| {
            anyhow!("no data folder is known for this user; set {DATA_DIR_ENV} to a folder")
        })
}

/// The user library file.
pub fn path() -> Result<PathBuf> {
    Ok(data_dir()?.join(USER_LIBRARY_FILE))
}

/// The user library as saved, or an empty one when there is no file yet.
pub fn read() -> Result<(PathBuf, UserLibrary)> {
    let path = path()?;
    let lib = UserLibrary::read_file(&path)?;
    Ok((path, lib))
}

/// The library extended with the user's saved entries, if there are any.
pub fn extend(library: Library) -> Result<Library> {
    let (path, user) = read()?;
    if user.data == LibraryData::default() {
        return Ok(library);
    }
    user.extend(&library)
        .with_context(|| format!("the user library {}", path.display()))
}

/// Adds an entry to the user library file; returns the file.
pub fn save(base: &Library, entry: LibraryData, provenance: Provenance) -> Result<PathBuf> {
    let path = path()?;
    UserLibrary::add_to_file(&path, base, entry, provenance)?;
    Ok(path)
}
