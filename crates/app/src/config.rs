//! User settings kept between sessions: recent files, window size and zoom, in the OS config folder.

use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};

/// Environment variable that overrides the config folder (tests and portable setups).
pub const CONFIG_DIR_ENV: &str = "SALTWISE_CONFIG_DIR";
/// How many recent files are remembered.
pub const MAX_RECENT: usize = 8;
/// Name of the settings file inside the config folder.
const FILE_NAME: &str = "workbench.ron";

/// What the workbench remembers between sessions (never the project itself).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct UserConfig {
    /// Recently opened or saved projects, newest first.
    pub recent_files: Vec<PathBuf>,
    /// Inner window size in logical points, when last closed.
    pub window_size: Option<[f32; 2]>,
    /// Zoom factor (1 = normal).
    pub zoom: f32,
}

impl Default for UserConfig {
    fn default() -> Self {
        Self {
            recent_files: Vec::new(),
            window_size: None,
            zoom: 1.0,
        }
    }
}

impl UserConfig {
    /// Puts a file at the top of the recent list.
    pub fn push_recent(&mut self, path: &Path) {
        self.recent_files.retain(|p| p != path);
        self.recent_files.insert(0, path.to_path_buf());
        self.recent_files.truncate(MAX_RECENT);
    }
}

/// Where user settings are read from and written to.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ConfigStore {
    dir: Option<PathBuf>,
}

impl ConfigStore {
    /// The folder named by `SALTWISE_CONFIG_DIR`, else the OS config folder for Saltwise.
    pub fn from_env() -> Self {
        if let Some(dir) = std::env::var_os(CONFIG_DIR_ENV).filter(|d| !d.is_empty()) {
            return Self::at(PathBuf::from(dir));
        }
        let dir = directories::ProjectDirs::from("", "", "Saltwise")
            .map(|d| d.config_dir().to_path_buf());
        Self { dir }
    }

    /// Settings kept in the given folder.
    pub fn at(dir: impl Into<PathBuf>) -> Self {
        Self {
            dir: Some(dir.into()),
        }
    }

    /// Settings kept nowhere (nothing is read or written).
    pub fn none() -> Self {
        Self { dir: None }
    }

    /// The settings file, if there is a folder.
    pub fn file(&self) -> Option<PathBuf> {
        self.dir.as_ref().map(|d| d.join(FILE_NAME))
    }

    /// Reads the settings; a missing file gives the defaults, a broken one the defaults and why.
    pub fn load(&self) -> (UserConfig, Option<String>) {
        let Some(file) = self.file() else {
            return (UserConfig::default(), None);
        };
        match std::fs::read_to_string(&file) {
            Ok(text) => match ron::from_str::<UserConfig>(&text) {
                Ok(mut config) => {
                    if !(config.zoom.is_finite() && (0.5..=3.0).contains(&config.zoom)) {
                        config.zoom = 1.0;
                    }
                    (config, None)
                }
                Err(e) => (
                    UserConfig::default(),
                    Some(format!(
                        "{}: the settings could not be read ({e}); using defaults",
                        file.display()
                    )),
                ),
            },
            Err(e) if e.kind() == std::io::ErrorKind::NotFound => (UserConfig::default(), None),
            Err(e) => (
                UserConfig::default(),
                Some(format!("{}: {e}; using default settings", file.display())),
            ),
        }
    }

    /// Writes the settings atomically, creating the folder if needed.
    pub fn save(&self, config: &UserConfig) -> Result<(), String> {
        let (Some(dir), Some(file)) = (self.dir.as_ref(), self.file()) else {
            return Ok(());
        };
        let text = ron::ser::to_string_pretty(config, ron::ser::PrettyConfig::default())
            .map_err(|e| format!("settings could not be written: {e}"))?;
        std::fs::create_dir_all(dir).map_err(|e| format!("{}: {e}", dir.display()))?;
        saltwise_chem::project::write_atomic(&file, text.as_bytes(), false)
            .map_err(|e| format!("{}: {e}", file.display()))
    }
}
