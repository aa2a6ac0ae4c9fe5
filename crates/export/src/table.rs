//! Every curve as CSV (the `csv` crate): a header row naming each column with its unit, then one
//! row per point, numbers in full precision.

use crate::ExportError;
use crate::chart::{Chart, DoseChart, LineChart, SpeciesChart, TitrationChart};

/// Header of the dose curve's CSV.
pub const DOSE_HEADER: [&str; 3] = ["dose_g", "ph", "buffer_capacity_mol_per_kg_water_per_ph"];
/// Header of the buffer capacity's CSV.
pub const BUFFER_HEADER: [&str; 2] = ["dose_g", "buffer_capacity_mol_per_kg_water_per_ph"];
/// Header of the titration curve's CSV.
pub const TITRATION_HEADER: [&str; 2] = ["titrant_ml", "ph"];
/// First column of the species chart's CSV; one `fraction FORM` column per form follows.
pub const SPECIES_PH_COLUMN: &str = "ph";

/// The curve of a chart as CSV text.
pub fn csv(chart: Chart<'_>) -> Result<String, ExportError> {
    let mut w = csv::Writer::from_writer(Vec::new());
    match chart {
        Chart::Dose(c) => dose(&mut w, c)?,
        Chart::BufferCapacity(c) => buffer(&mut w, c)?,
        Chart::Species(c) => species(&mut w, c)?,
        Chart::Titration(c) => titration(&mut w, c)?,
        Chart::Lines(c) => lines(&mut w, c)?,
    }
    let bytes = w
        .into_inner()
        .map_err(|e| ExportError::Csv(e.to_string()))?;
    String::from_utf8(bytes).map_err(|e| ExportError::Csv(e.to_string()))
}

type Writer = csv::Writer<Vec<u8>>;

fn csv_error(e: csv::Error) -> ExportError {
    ExportError::Csv(e.to_string())
}

fn dose(w: &mut Writer, c: &DoseChart) -> Result<(), ExportError> {
    w.write_record(DOSE_HEADER).map_err(csv_error)?;
    for p in &c.points {
        w.write_record([
            p.dose_g.to_string(),
            p.ph.to_string(),
            p.buffer_capacity.to_string(),
        ])
        .map_err(csv_error)?;
    }
    Ok(())
}

fn buffer(w: &mut Writer, c: &DoseChart) -> Result<(), ExportError> {
    w.write_record(BUFFER_HEADER).map_err(csv_error)?;
    for p in &c.points {
        w.write_record([p.dose_g.to_string(), p.buffer_capacity.to_string()])
            .map_err(csv_error)?;
    }
    Ok(())
}

fn species(w: &mut Writer, c: &SpeciesChart) -> Result<(), ExportError> {
    let mut header = vec![SPECIES_PH_COLUMN.to_owned()];
    header.extend(c.forms.iter().map(|f| format!("fraction {f}")));
    w.write_record(&header).map_err(csv_error)?;
    for (i, ph) in c.ph.iter().enumerate() {
        let mut row = vec![ph.to_string()];
        row.extend(
            c.fractions
                .iter()
                .map(|f| f.get(i).copied().unwrap_or(f64::NAN).to_string()),
        );
        w.write_record(&row).map_err(csv_error)?;
    }
    Ok(())
}

fn titration(w: &mut Writer, c: &TitrationChart) -> Result<(), ExportError> {
    w.write_record(TITRATION_HEADER).map_err(csv_error)?;
    for p in &c.points {
        w.write_record([p.ml.to_string(), p.ph.to_string()])
            .map_err(csv_error)?;
    }
    Ok(())
}

/// Curves sharing their x values: one x column and one column per curve; otherwise one row per
/// point as `series,x,y`.
fn lines(w: &mut Writer, c: &LineChart) -> Result<(), ExportError> {
    let shared = c.series.windows(2).all(|pair| {
        pair[0].points.len() == pair[1].points.len()
            && pair[0]
                .points
                .iter()
                .zip(&pair[1].points)
                .all(|(a, b)| a.0.to_bits() == b.0.to_bits())
    });
    if shared {
        let mut header = vec![c.x_column.clone()];
        header.extend(c.series.iter().map(|s| s.name.clone()));
        w.write_record(&header).map_err(csv_error)?;
        let n = c.series.first().map_or(0, |s| s.points.len());
        for i in 0..n {
            let mut row = vec![c.series[0].points[i].0.to_string()];
            row.extend(c.series.iter().map(|s| s.points[i].1.to_string()));
            w.write_record(&row).map_err(csv_error)?;
        }
    } else {
        w.write_record(["series", c.x_column.as_str(), "y"])
            .map_err(csv_error)?;
        for s in &c.series {
            for p in &s.points {
                w.write_record([s.name.clone(), p.0.to_string(), p.1.to_string()])
                    .map_err(csv_error)?;
            }
        }
    }
    Ok(())
}
