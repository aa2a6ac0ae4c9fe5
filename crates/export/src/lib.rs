//! Saltwise exports: the charts of the window as SVG and PNG, every curve as CSV, and the
//! printable batch sheet as one self-contained HTML page.
//!
//! Pure: chem's results in, bytes and strings out. Nothing here writes a file — callers write
//! what they get with chem's `project::write_atomic`, so a failed export never leaves half a file.
//!
//! - Charts: build a [`DoseChart`] (also drawn as [`Chart::BufferCapacity`]), [`SpeciesChart`]
//!   or [`TitrationChart`], then [`svg()`], [`png()`] or [`csv()`] of a [`Chart`].
//! - Batch sheet: [`batch_sheet`] computes a [`BatchSheet`] from a [`SheetRequest`];
//!   [`batch_sheet_html`] lays it out.

#![deny(missing_docs)]

pub mod chart;
pub mod draw;
pub mod html;
pub mod sheet;
pub mod table;

use thiserror::Error;

pub use chart::{Chart, DoseChart, LineChart, Series, SpeciesChart, TargetBand, TitrationChart};
pub use draw::{Size, png, svg};
pub use html::{batch_sheet_html, escape};
pub use sheet::{BatchSheet, BatchSize, MassUnit, QcPlan, SheetRequest, batch_sheet};
pub use table::csv;

/// Why an export could not be made.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum ExportError {
    /// A chart with nothing to draw.
    #[error("the {chart} has no points to draw")]
    EmptyChart {
        /// Which chart.
        chart: &'static str,
    },
    /// A picture size outside what is drawn.
    #[error(
        "a picture of {width}×{height} px is not allowed: each side must be {} to {} px",
        draw::SIDE_PX.start(),
        draw::SIDE_PX.end()
    )]
    Size {
        /// Width asked, px.
        width: u32,
        /// Height asked, px.
        height: u32,
    },
    /// A dose curve whose largest dose is not above 0.
    #[error("largest dose {max_g} g is not allowed: it must be above 0")]
    DoseRange {
        /// The largest dose asked, g.
        max_g: f64,
    },
    /// A variant index the project does not have.
    #[error("the project has {count} variants; there is no variant number {index}")]
    NoVariant {
        /// The index asked (from 0).
        index: usize,
        /// How many variants there are.
        count: usize,
    },
    /// A batch size outside the input limits.
    #[error(transparent)]
    BatchSize(saltwise_chem::LimitError),
    /// Drawing failed inside the plotting library.
    #[error("drawing the chart failed: {0}")]
    Draw(String),
    /// Encoding the PNG failed.
    #[error("encoding the PNG failed: {0}")]
    Png(String),
    /// Writing CSV failed.
    #[error("writing CSV failed: {0}")]
    Csv(String),
    /// The recipe cannot be solved.
    #[error(transparent)]
    Recipe(#[from] saltwise_chem::RecipeError),
    /// The adjuster cannot dose the batch.
    #[error(transparent)]
    Dose(#[from] saltwise_chem::DoseError),
}
