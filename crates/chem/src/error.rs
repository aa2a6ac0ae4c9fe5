//! Typed errors: each names the field, the value and what is allowed.

use thiserror::Error;

/// A formula that could not be read.
#[derive(Debug, Clone, PartialEq, Error)]
#[error("formula '{formula}', character {position}: {message}")]
pub struct FormulaError {
    /// The formula as given.
    pub formula: String,
    /// Zero-based character position of the problem.
    pub position: usize,
    /// What is wrong and what is allowed.
    pub message: String,
}

/// A number outside the limits of [`crate::limits`], or text that is not a number.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum LimitError {
    /// A number outside its range.
    #[error("{what} {value}{} is not allowed: {problem}; {rule}", with_unit(.unit))]
    NotAllowed {
        /// What the number is, e.g. `temperature` or `amount of citric_acid`.
        what: String,
        /// The value as read.
        value: String,
        /// Its unit, or empty.
        unit: &'static str,
        /// What is wrong with it, e.g. `it is negative`.
        problem: &'static str,
        /// What is allowed.
        rule: &'static str,
    },
    /// Text that is not a number.
    #[error("{what}: '{text}' is not a number; {rule}")]
    NotANumber {
        /// What the number is.
        what: String,
        /// The text as typed.
        text: String,
        /// What is allowed.
        rule: &'static str,
    },
    /// Nothing typed.
    #[error("{what}: type a number; {rule}")]
    Empty {
        /// What the number is.
        what: String,
        /// What is allowed.
        rule: &'static str,
    },
}

fn with_unit(unit: &str) -> String {
    if unit.is_empty() {
        String::new()
    } else {
        format!(" {unit}")
    }
}

/// A problem in the ingredient library or in a custom ingredient.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum LibraryError {
    /// The library text is not valid RON.
    #[error("{origin} line {line}, column {column}: {message}")]
    Syntax {
        /// Where the text came from (a file name or "built-in library").
        origin: String,
        /// One-based line.
        line: usize,
        /// One-based column.
        column: usize,
        /// The parser's message.
        message: String,
    },
    /// An entry is present but inconsistent.
    #[error("{kind} '{id}': {message}")]
    Invalid {
        /// "ingredient", "system" or "ion".
        kind: &'static str,
        /// The entry's id.
        id: String,
        /// What is wrong and what is allowed.
        message: String,
    },
}

/// A recipe that cannot be turned into a solution.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum RecipeError {
    /// An ingredient id that the library does not hold.
    #[error("unknown ingredient '{id}'{}", suggest(.suggestions))]
    UnknownIngredient {
        /// The id as given.
        id: String,
        /// The nearest known ids.
        suggestions: Vec<String>,
    },
    /// An amount given in a unit this ingredient cannot take.
    #[error("amount of {id}: {message}")]
    BadUnit {
        /// The ingredient id.
        id: String,
        /// What is wrong and what is allowed.
        message: String,
    },
    /// The recipe has no water to dissolve in.
    #[error(
        "the recipe has no water: add a water line, a q.s. target or an ingredient in solution"
    )]
    NoWater,
    /// The q.s. target is smaller than the other ingredients together.
    #[error(
        "q.s. to {qs_g} g is less than the {solids_g} g of the other ingredients; raise the batch size or lower the amounts"
    )]
    OverfullBatch {
        /// The q.s. target in g.
        qs_g: f64,
        /// The mass of everything else in g.
        solids_g: f64,
    },
    /// A temperature outside the model's range.
    #[error("temperature {temp_c} °C is outside 0–95 °C, the range of the temperature model")]
    Temperature {
        /// The temperature as given, °C.
        temp_c: f64,
    },
    /// A number outside the input limits (amounts, batch size, temperature).
    #[error(transparent)]
    Limit(#[from] LimitError),
}

fn suggest(ids: &[String]) -> String {
    if ids.is_empty() {
        String::new()
    } else {
        format!("; did you mean {}?", ids.join(", "))
    }
}

/// A dose that cannot be found.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum DoseError {
    /// The adjuster moves pH the wrong way or not far enough.
    #[error("{adjuster} cannot bring this batch to pH {target_ph}: {reason}")]
    Unreachable {
        /// The adjuster id.
        adjuster: String,
        /// The target pH.
        target_ph: f64,
        /// Why, in words with numbers.
        reason: String,
    },
    /// The adjuster releases no acid or base.
    #[error("{adjuster} is not a pH adjuster: it releases no acid or base")]
    NotAnAdjuster {
        /// The adjuster id.
        adjuster: String,
    },
    /// The recipe itself is not valid.
    #[error(transparent)]
    Recipe(#[from] RecipeError),
}

/// A project file that cannot be read or written.
#[derive(Debug, Error)]
pub enum ProjectError {
    /// The file could not be read or written.
    #[error("{path}: {source}")]
    Io {
        /// The file.
        path: String,
        /// The operating system's reason.
        source: std::io::Error,
    },
    /// The file is larger than a project can be.
    #[error(
        "{path}: the file is {size_bytes} bytes; a project file is at most {limit_bytes} bytes"
    )]
    TooLarge {
        /// The file.
        path: String,
        /// Its size.
        size_bytes: u64,
        /// The limit.
        limit_bytes: u64,
    },
    /// The file is not text.
    #[error("{path}: not a text file (byte {offset} is not UTF-8); a project is a .ron text file")]
    NotText {
        /// The file.
        path: String,
        /// First offending byte offset.
        offset: usize,
    },
    /// The text is not a valid project.
    #[error("{path} line {line}, column {column}: {message}")]
    Syntax {
        /// The file.
        path: String,
        /// One-based line.
        line: usize,
        /// One-based column.
        column: usize,
        /// What was expected.
        message: String,
    },
    /// The project is from a newer or unknown format.
    #[error(
        "{path}: format version {found} is not one this program reads (it reads 1 to {supported})"
    )]
    Version {
        /// The file.
        path: String,
        /// The version in the file.
        found: u32,
        /// The newest version supported.
        supported: u32,
    },
    /// The path to save to is a folder.
    #[error("{path} is a folder, not a file: choose a file name inside it")]
    IsAFolder {
        /// The path given.
        path: String,
    },
    /// The folder to save into does not exist.
    #[error("{path}: the folder {folder} does not exist ({source})")]
    NoFolder {
        /// The file.
        path: String,
        /// Its folder.
        folder: String,
        /// The operating system's reason.
        source: std::io::Error,
    },
    /// The content is well formed but not valid.
    #[error("{path}: {message}")]
    Invalid {
        /// The file.
        path: String,
        /// What is wrong.
        message: String,
    },
}
