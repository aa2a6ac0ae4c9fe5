//! The user's own library file in the OS data folder: where it is, reading it into the library
//! every command uses, and adding a fitted entry to it (atomic write, previous copy kept).
//!
//! The folder is `$SALTWISE_DATA_DIR` when set, else the OS data folder of Saltwise (on Linux
//! `$XDG_DATA_HOME/saltwise` or `~/.local/share/saltwise`).

use std::path::PathBuf;

use anyhow::{Context, Result, anyhow, bail};
use saltwise_chem::Library;
use saltwise_chem::library::LibraryData;
use saltwise_chem::project::write_atomic;
use saltwise_chem::user_library::{Provenance, USER_LIBRARY_FILE, UserLibrary};

/// Environment variable that overrides the data folder (tests, portable installs).
pub const DATA_DIR_ENV: &str = "SALTWISE_DATA_DIR";

/// Largest user library file read, bytes.
const MAX_BYTES: u64 = 4 * 1024 * 1024;

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
    if !path.exists() {
        return Ok((path, UserLibrary::default()));
    }
    let size = std::fs::metadata(&path)
        .with_context(|| format!("reading {}", path.display()))?
        .len();
    if size > MAX_BYTES {
        bail!(
            "{} is {size} bytes; a user library is at most {MAX_BYTES} bytes",
            path.display()
        );
    }
    let text =
        std::fs::read_to_string(&path).with_context(|| format!("reading {}", path.display()))?;
    let lib = UserLibrary::from_ron(&text, &path.display().to_string())?;
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
    let (path, mut user) = read()?;
    user.add(base, entry, provenance)?;
    let text = user.to_ron().context("writing the user library as text")?;
    if let Some(dir) = path.parent() {
        std::fs::create_dir_all(dir).with_context(|| format!("creating {}", dir.display()))?;
    }
    write_atomic(&path, text.as_bytes(), true)
        .with_context(|| format!("writing {}", path.display()))?;
    Ok(path)
}

/// Today's date (UTC) as `YYYY-MM-DD`, from the system clock.
pub fn today() -> String {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_secs());
    saltwise_export::sheet::iso_date(secs)
}
