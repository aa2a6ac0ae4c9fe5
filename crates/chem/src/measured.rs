//! Measured titrations: pH-meter readings (titrant added, pH, optional temperature) parsed from
//! CSV or pasted text, and the titration as kept in a project.
//!
//! The parser takes the shapes a lab hands over: a header line or none; cells separated by
//! commas, semicolons, tabs or runs of spaces; a decimal comma where the separator is a semicolon
//! or a tab ("7,25" is 7.25 there); blank lines and lines starting with `#` skipped; a byte-order
//! mark and Windows line ends ignored. Columns are the titrant added (mL, or g when the titrant
//! is weighed), the pH and, optionally, the temperature in °C; a header that names them (`pH`,
//! `mL`/`volume`/`g`/`mass`, `temp`/`°C`) may give them in another order. Every refusal names
//! the line (counted from 1 as an editor shows it), the column and what is allowed.
//!
//! Pure: text in, points out. Reading the file and the date are the caller's.

use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::limits;

/// Lowest pH reading accepted (the usual range of a pH meter, common practice, no source).
pub const PH_MIN: f64 = 0.0;
/// Highest pH reading accepted (as above).
pub const PH_MAX: f64 = 14.0;
/// Most readings one titration may hold.
pub const MAX_POINTS: usize = 10_000;
/// Largest titrant quantity accepted, mL or g.
pub const MAX_TITRANT: f64 = 1000.0;

/// One pH-meter reading.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct MeasuredPoint {
    /// Titrant added: mL, or g when the titrant is weighed.
    pub titrant: f64,
    /// pH read.
    pub ph: f64,
    /// Temperature read, °C, when the file has it.
    #[serde(default)]
    pub temp_c: Option<f64>,
}

/// How the cells of a file were separated.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Separator {
    /// `,` (decimal point only).
    Comma,
    /// `;` (decimal point or comma).
    Semicolon,
    /// Tab (decimal point or comma).
    Tab,
    /// Runs of spaces (decimal point only).
    Whitespace,
}

impl Separator {
    /// The separator in words, for messages.
    pub fn label(self) -> &'static str {
        match self {
            Self::Comma => "comma",
            Self::Semicolon => "semicolon",
            Self::Tab => "tab",
            Self::Whitespace => "spaces",
        }
    }

    fn split(self, line: &str) -> Vec<&str> {
        match self {
            Self::Comma => line.split(',').collect(),
            Self::Semicolon => line.split(';').collect(),
            Self::Tab => line.split('\t').collect(),
            Self::Whitespace => line.split_whitespace().collect(),
        }
    }

    fn allows_decimal_comma(self) -> bool {
        matches!(self, Self::Semicolon | Self::Tab)
    }
}

/// What a column holds.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Column {
    /// Titrant added (mL or g).
    Titrant,
    /// pH read.
    Ph,
    /// Temperature, °C.
    Temperature,
}

impl Column {
    /// The column in words, for messages.
    pub fn label(self) -> &'static str {
        match self {
            Self::Titrant => "titrant added",
            Self::Ph => "pH",
            Self::Temperature => "temperature",
        }
    }
}

/// Why measured readings cannot be read.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum MeasuredError {
    /// No reading at all.
    #[error(
        "the data hold no readings: give one line per reading, titrant added then pH (e.g. `0,7.25`), optionally with a header line"
    )]
    Empty,
    /// A cell that is not a number.
    #[error(
        "line {line}, column {column} ({what}): '{cell}' is not a number; cells are plain numbers such as 7.25 (a decimal comma, 7,25, only with ; or tab between cells)"
    )]
    NotANumber {
        /// Line, from 1.
        line: usize,
        /// Column, from 1.
        column: usize,
        /// What the column holds.
        what: &'static str,
        /// The cell as written.
        cell: String,
    },
    /// A pH outside what a pH meter reads.
    #[error(
        "line {line}, column {column}: pH {ph} is not allowed: a pH reading is from {PH_MIN} to {PH_MAX}"
    )]
    PhOutOfRange {
        /// Line, from 1.
        line: usize,
        /// Column, from 1.
        column: usize,
        /// The pH read.
        ph: f64,
    },
    /// A negative or too large titrant quantity.
    #[error(
        "line {line}, column {column}: titrant added {value} is not allowed: it is from 0 to {MAX_TITRANT} (mL or g)"
    )]
    TitrantOutOfRange {
        /// Line, from 1.
        line: usize,
        /// Column, from 1.
        column: usize,
        /// The quantity given.
        value: f64,
    },
    /// A temperature outside the model's range.
    #[error("line {line}, column {column}: {message}")]
    Temperature {
        /// Line, from 1.
        line: usize,
        /// Column, from 1.
        column: usize,
        /// Why, from the limits table.
        message: String,
    },
    /// A line with the wrong number of cells.
    #[error(
        "line {line} has {found} cells separated by {separator}; every reading has {expected} (titrant added, pH{temp})",
        temp = if *expected == 3 { ", temperature" } else { "" }
    )]
    WrongColumns {
        /// Line, from 1.
        line: usize,
        /// Cells found.
        found: usize,
        /// Cells expected.
        expected: usize,
        /// The separator in use, in words.
        separator: &'static str,
    },
    /// A header that cannot be matched to the columns.
    #[error(
        "line {line}: the header '{header}' does not name one titrant column and one pH column; name the columns e.g. `mL,pH` or `g;pH;temp`, or leave the header out"
    )]
    Header {
        /// Line, from 1.
        line: usize,
        /// The header as written.
        header: String,
    },
    /// More readings than one titration holds.
    #[error(
        "line {line}: more than {MAX_POINTS} readings; one titration holds at most {MAX_POINTS}"
    )]
    TooMany {
        /// Line, from 1.
        line: usize,
    },
}

/// Readings parsed from text, with how they were written.
#[derive(Debug, Clone, PartialEq)]
pub struct ParsedReadings {
    /// The readings, in file order.
    pub points: Vec<MeasuredPoint>,
    /// The line number of each reading, from 1.
    pub lines: Vec<usize>,
    /// The header cells, when the text had a header line.
    pub header: Option<Vec<String>>,
    /// The separator found.
    pub separator: Separator,
    /// Whether any cell used a decimal comma.
    pub decimal_comma: bool,
}

/// The lines that hold content, numbered from 1.
fn content_lines(text: &str) -> impl Iterator<Item = (usize, &str)> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    text.lines()
        .enumerate()
        .map(|(i, l)| (i + 1, l.trim_end_matches('\r').trim()))
        .filter(|(_, l)| !l.is_empty() && !l.starts_with('#'))
}

fn detect_separator(text: &str) -> Separator {
    let lines: Vec<&str> = content_lines(text).map(|(_, l)| l).take(50).collect();
    if lines.iter().any(|l| l.contains('\t')) {
        Separator::Tab
    } else if lines.iter().any(|l| l.contains(';')) {
        Separator::Semicolon
    } else if lines.iter().any(|l| l.contains(',')) {
        Separator::Comma
    } else {
        Separator::Whitespace
    }
}

fn unquote(cell: &str) -> &str {
    let c = cell.trim();
    c.strip_prefix('"')
        .and_then(|c| c.strip_suffix('"'))
        .unwrap_or(c)
        .trim()
}

/// A cell as a number: the decimal comma read as a point where the separator allows it.
fn number(cell: &str, separator: Separator) -> Option<(f64, bool)> {
    let c = unquote(cell);
    if c.is_empty() {
        return None;
    }
    let (text, comma) = if separator.allows_decimal_comma() && c.contains(',') {
        if c.contains('.') || c.matches(',').count() > 1 {
            return None;
        }
        (c.replace(',', "."), true)
    } else {
        (c.to_owned(), false)
    };
    let v: f64 = text.parse().ok()?;
    v.is_finite().then_some((v, comma))
}

/// The column a header cell names, if it names one.
fn header_column(cell: &str) -> Option<Column> {
    let c = unquote(cell).to_ascii_lowercase();
    let c = c.trim_matches(|ch: char| ch == '(' || ch == ')' || ch == '[' || ch == ']');
    if c == "ph" || c.starts_with("ph ") || c.starts_with("ph(") || c.starts_with("ph[") {
        Some(Column::Ph)
    } else if c.starts_with("temp")
        || c.contains("°c")
        || c == "t"
        || c == "c"
        || c.starts_with("t ")
        || c.starts_with("t(")
    {
        Some(Column::Temperature)
    } else if c.contains("ml")
        || c.starts_with("vol")
        || c == "v"
        || c == "g"
        || c.starts_with("mass")
        || c.starts_with("titrant")
        || c.starts_with("g ")
        || c.starts_with("g(")
        || c.starts_with("added")
    {
        Some(Column::Titrant)
    } else {
        None
    }
}

/// Parses pH-meter readings from CSV or pasted text (see the module documentation for shapes).
pub fn parse_readings(text: &str) -> Result<ParsedReadings, MeasuredError> {
    let separator = detect_separator(text);
    let mut order: Vec<Column> = Vec::new();
    let mut header = None;
    let mut expected: Option<usize> = None;
    let mut points = Vec::new();
    let mut lines = Vec::new();
    let mut decimal_comma = false;
    for (k, (line_no, line)) in content_lines(text).enumerate() {
        let cells = separator.split(line);
        let cells: Vec<&str> = if separator == Separator::Whitespace {
            cells
        } else {
            // A trailing separator (spreadsheets write them) leaves an empty last cell.
            let mut c = cells;
            while c.len() > 2 && c.last().is_some_and(|s| s.trim().is_empty()) {
                c.pop();
            }
            c
        };
        if k == 0 && cells.iter().all(|c| number(c, separator).is_none()) {
            // A first content line of words only is a header; it may name the columns.
            let named: Vec<Option<Column>> = cells.iter().map(|c| header_column(c)).collect();
            if named.iter().all(Option::is_some) {
                let cols: Vec<Column> = named.into_iter().flatten().collect();
                let count = |c: Column| cols.iter().filter(|x| **x == c).count();
                if count(Column::Ph) != 1
                    || count(Column::Titrant) != 1
                    || count(Column::Temperature) > 1
                {
                    return Err(MeasuredError::Header {
                        line: line_no,
                        header: line.to_owned(),
                    });
                }
                order = cols;
            }
            expected = Some(cells.len());
            header = Some(cells.iter().map(|c| unquote(c).to_owned()).collect());
            continue;
        }
        let n = *expected.get_or_insert(cells.len());
        if cells.len() != n || !(2..=3).contains(&cells.len()) {
            return Err(MeasuredError::WrongColumns {
                line: line_no,
                found: cells.len(),
                expected: n.clamp(2, 3),
                separator: separator.label(),
            });
        }
        if order.len() != n {
            order = [Column::Titrant, Column::Ph, Column::Temperature][..n].to_vec();
        }
        if points.len() >= MAX_POINTS {
            return Err(MeasuredError::TooMany { line: line_no });
        }
        let mut point = MeasuredPoint {
            titrant: 0.0,
            ph: 0.0,
            temp_c: None,
        };
        for (i, (cell, what)) in cells.iter().zip(&order).enumerate() {
            let column = i + 1;
            let Some((v, comma)) = number(cell, separator) else {
                return Err(MeasuredError::NotANumber {
                    line: line_no,
                    column,
                    what: what.label(),
                    cell: unquote(cell).to_owned(),
                });
            };
            decimal_comma |= comma;
            match what {
                Column::Titrant => {
                    if !(0.0..=MAX_TITRANT).contains(&v) {
                        return Err(MeasuredError::TitrantOutOfRange {
                            line: line_no,
                            column,
                            value: v,
                        });
                    }
                    point.titrant = v;
                }
                Column::Ph => {
                    if !(PH_MIN..=PH_MAX).contains(&v) {
                        return Err(MeasuredError::PhOutOfRange {
                            line: line_no,
                            column,
                            ph: v,
                        });
                    }
                    point.ph = v;
                }
                Column::Temperature => {
                    limits::TEMPERATURE_C
                        .check(v)
                        .map_err(|e| MeasuredError::Temperature {
                            line: line_no,
                            column,
                            message: e.to_string(),
                        })?;
                    point.temp_c = Some(v);
                }
            }
        }
        points.push(point);
        lines.push(line_no);
    }
    if points.is_empty() {
        return Err(MeasuredError::Empty);
    }
    Ok(ParsedReadings {
        points,
        lines,
        header,
        separator,
        decimal_comma,
    })
}

/// A measured titration kept in a project: what was titrated with what, and the readings.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct MeasuredTitration {
    /// A name the user gives it (e.g. "lot 24-117, bench 2").
    pub name: String,
    /// Library id of the titrant.
    pub titrant: String,
    /// Normality of the titrant, mol/L.
    pub normality: f64,
    /// Sample of product titrated, g.
    pub sample_g: f64,
    /// Whether the titrant was weighed (readings in g) rather than measured by volume (mL).
    pub titrant_by_mass: bool,
    /// The readings, in the order taken.
    pub points: Vec<MeasuredPoint>,
    /// Name of the file the readings came from (empty when pasted).
    pub source_file: String,
    /// Date of the import as the caller wrote it (e.g. `2025-03-14`).
    pub imported: String,
}

impl Default for MeasuredTitration {
    fn default() -> Self {
        Self {
            name: String::new(),
            titrant: String::new(),
            normality: 0.1,
            sample_g: 10.0,
            titrant_by_mass: false,
            points: Vec::new(),
            source_file: String::new(),
            imported: String::new(),
        }
    }
}

impl MeasuredTitration {
    /// Titrant added at each reading in mL (grams over the titrant density of 1.00 kg/L).
    pub fn titrant_ml(&self) -> Vec<f64> {
        let per = if self.titrant_by_mass {
            1.0 / (crate::qc::TITRANT_DENSITY_KG_PER_L)
        } else {
            1.0
        };
        self.points.iter().map(|p| p.titrant * per).collect()
    }

    /// Checks what a project file may hold: normality, sample, readings.
    pub fn check(&self) -> Result<(), String> {
        limits::NORMALITY
            .check(self.normality)
            .map_err(|e| format!("measured titration '{}': {e}", self.name))?;
        limits::SAMPLE_G
            .check(self.sample_g)
            .map_err(|e| format!("measured titration '{}': {e}", self.name))?;
        if self.points.len() > MAX_POINTS {
            return Err(format!(
                "measured titration '{}' holds {} readings; at most {MAX_POINTS}",
                self.name,
                self.points.len()
            ));
        }
        for (i, p) in self.points.iter().enumerate() {
            if !(p.titrant.is_finite() && (0.0..=MAX_TITRANT).contains(&p.titrant)) {
                return Err(format!(
                    "measured titration '{}', reading {}: titrant added {} is not from 0 to {MAX_TITRANT}",
                    self.name,
                    i + 1,
                    p.titrant
                ));
            }
            if !(p.ph.is_finite() && (PH_MIN..=PH_MAX).contains(&p.ph)) {
                return Err(format!(
                    "measured titration '{}', reading {}: pH {} is not from {PH_MIN} to {PH_MAX}",
                    self.name,
                    i + 1,
                    p.ph
                ));
            }
            if let Some(t) = p.temp_c {
                limits::TEMPERATURE_C.check(t).map_err(|e| {
                    format!("measured titration '{}', reading {}: {e}", self.name, i + 1)
                })?;
            }
        }
        Ok(())
    }
}
