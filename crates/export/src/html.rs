//! The batch sheet as one self-contained HTML page: inline SVG charts, an embedded stylesheet
//! with print rules, no scripts and no external resources; every user string escaped.

use std::fmt::Write as _;

use saltwise_chem::hazard::{self, DEFER};

use crate::ExportError;
use crate::chart::{CURRENT, Chart, EQUIVALENCE, PH_LINE, TARGET, WARN};
use crate::draw::{self, Size};
use crate::sheet::{BatchSheet, DoseInstruction, end_point_name, plain, sig};

/// Text made safe for HTML element content and attribute values.
pub fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            _ => out.push(c),
        }
    }
    out
}

/// The size the sheet's charts are drawn at (they scale to the page width).
const SHEET_CHART: Size = Size {
    width: 860,
    height: 420,
};

/// The sheet's stylesheet: screen and print.
fn style() -> String {
    format!(
        r#"
:root {{ --ink: #1d232a; --muted: #5b6570; --rule: #c9d0d6; --tint: #f3f6f8;
  --target: {target}; --ph: {ph}; --warn: {warn}; --eq: {eq}; --now: {now}; }}
* {{ box-sizing: border-box; }}
html {{ background: #e8ecef; }}
body {{ font: 15px/1.45 "DejaVu Sans", "Helvetica Neue", Arial, sans-serif; color: var(--ink);
  max-width: 210mm; margin: 24px auto; padding: 18mm 16mm; background: #fff;
  box-shadow: 0 1px 6px rgba(0,0,0,.15); }}
header.masthead {{ border-bottom: 3px solid var(--ph); padding-bottom: 8px; margin-bottom: 14px; }}
.kicker {{ text-transform: uppercase; letter-spacing: .12em; font-size: 11px; color: var(--muted); margin: 0; }}
h1 {{ font-size: 24px; margin: 2px 0 8px; }}
h2 {{ font-size: 16px; margin: 20px 0 6px; padding-bottom: 3px; border-bottom: 1px solid var(--rule); }}
h2 .no {{ display: inline-block; min-width: 1.6em; color: var(--ph); }}
dl.meta {{ display: grid; grid-template-columns: repeat(3, auto); gap: 2px 18px; margin: 0; font-size: 13px; }}
dl.meta div {{ display: flex; gap: 6px; }}
dl.meta dt {{ color: var(--muted); }}
dl.meta dd {{ margin: 0; font-weight: 600; }}
.tiles {{ display: grid; grid-template-columns: repeat(3, 1fr); gap: 10px; margin: 12px 0 4px; }}
.tile {{ border: 1px solid var(--rule); border-left: 5px solid var(--ph); padding: 8px 10px; background: var(--tint); }}
.tile.target {{ border-left-color: var(--target); }}
.tile.dose {{ border-left-color: var(--eq); }}
.tile .label {{ font-size: 11px; text-transform: uppercase; letter-spacing: .08em; color: var(--muted); }}
.tile .value {{ font-size: 22px; font-weight: 700; }}
.tile .sub {{ font-size: 12px; color: var(--muted); }}
table {{ width: 100%; border-collapse: collapse; font-size: 13.5px; }}
th, td {{ border-bottom: 1px solid var(--rule); padding: 4px 6px; text-align: left; vertical-align: top; }}
th {{ font-size: 11.5px; text-transform: uppercase; letter-spacing: .05em; color: var(--muted); }}
td.num, th.num {{ text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }}
td.mass {{ font-weight: 700; }}
td.box {{ width: 11%; border-bottom: 1px solid var(--ink); }}
tr.total td {{ border-top: 2px solid var(--ink); font-weight: 700; }}
table.weigh code {{ overflow-wrap: anywhere; word-break: break-all; }}
code {{ font-family: "DejaVu Sans Mono", monospace; font-size: 12px; color: var(--muted); }}
p.instruction {{ font-size: 16px; padding: 8px 10px; border: 1px solid var(--target); background: #eef8f4; }}
p.instruction.none {{ border-color: var(--rule); background: var(--tint); }}
p.instruction.problem {{ border-color: var(--warn); background: #fbf3e6; }}
p.note {{ font-size: 12.5px; color: var(--muted); margin: 4px 0; }}
figure {{ margin: 10px 0; break-inside: avoid; page-break-inside: avoid; }}
figure svg {{ width: 100%; height: auto; display: block; border: 1px solid var(--rule); }}
figcaption {{ font-size: 12px; color: var(--muted); margin-top: 3px; }}
ol.cautions {{ padding-left: 1.3em; margin: 6px 0; }}
ol.cautions li {{ margin: 0 0 6px; padding: 4px 8px; border-left: 4px solid var(--warn); background: #fdf8ef; break-inside: avoid; }}
ol.cautions strong {{ display: block; }}
ul.warnings {{ font-size: 12.5px; color: var(--muted); }}
footer {{ margin-top: 18px; border-top: 3px solid var(--ink); padding-top: 8px; font-size: 12.5px; }}
p.deferral {{ font-size: 14px; padding: 8px 10px; border: 2px solid var(--ink); margin: 8px 0; break-inside: avoid; }}
footer, section.qc {{ break-inside: avoid; page-break-inside: avoid; }}
.signoff {{ display: grid; grid-template-columns: repeat(3, 1fr); gap: 18px; margin-top: 16px; }}
.signoff div {{ border-top: 1px solid var(--ink); padding-top: 2px; font-size: 11.5px; color: var(--muted); }}
section {{ break-inside: auto; }}
h2, .tiles, tr {{ break-inside: avoid; page-break-inside: avoid; }}
h2 {{ break-after: avoid; page-break-after: avoid; }}
@page {{ size: A4; margin: 13mm 12mm 14mm; }}
@media print {{
  html {{ background: #fff; }}
  body {{ margin: 0; padding: 0; max-width: none; box-shadow: none; font-size: 10.5pt; }}
  .tile, p.instruction, ol.cautions li {{ -webkit-print-color-adjust: exact; print-color-adjust: exact; }}
  figure svg {{ border: none; }}
  .charts figure {{ width: 100%; }}
}}
"#,
        target = TARGET.hex(),
        ph = PH_LINE.hex(),
        warn = WARN.hex(),
        eq = EQUIVALENCE.hex(),
        now = CURRENT.hex(),
    )
}

/// The batch sheet as one HTML document.
pub fn batch_sheet_html(sheet: &BatchSheet) -> Result<String, ExportError> {
    let e = escape;
    let b = &sheet.batch;
    let mut h = String::new();
    let title = format!(
        "Batch sheet: {}, {}",
        sheet.project_name, sheet.variant_name
    );
    // `write!` into a String cannot fail; the results are ignored on purpose.
    let _ = write!(
        h,
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n<title>{}</title>\n<style>{}</style>\n</head>\n<body>\n",
        e(&title),
        style()
    );
    let _ = write!(
        h,
        "<header class=\"masthead\">\n<p class=\"kicker\">Batch sheet · predicted by Saltwise</p>\n<h1>{}</h1>\n<dl class=\"meta\">\n<div><dt>Variant</dt><dd>{}</dd></div>\n<div><dt>Date</dt><dd>{}</dd></div>\n<div><dt>Batch</dt><dd>{}</dd></div>\n<div><dt>Temperature</dt><dd>{} °C</dd></div>\n<div><dt>Activity model</dt><dd>{}</dd></div>\n<div><dt>Recipe as written</dt><dd>{}</dd></div>\n</dl>\n</header>\n",
        e(&sheet.project_name),
        e(&sheet.variant_name),
        e(&sheet.date),
        e(&b.show(b.mass_g)),
        plain(sheet.temp_c, 3),
        e(&sheet.activity),
        e(&format!("{} g", plain(sheet.recipe_batch_g, 6))),
    );
    tiles(&mut h, sheet);
    weighing(&mut h, sheet);
    adjustment(&mut h, sheet);
    qc(&mut h, sheet);
    charts(&mut h, sheet)?;
    cautions(&mut h, sheet);
    if !sheet.warnings.is_empty() {
        h.push_str("<h2>Model notes</h2>\n<ul class=\"warnings\">\n");
        for w in &sheet.warnings {
            let _ = writeln!(h, "<li>{}</li>", e(w));
        }
        h.push_str("</ul>\n");
    }
    let _ = write!(
        h,
        "<footer>\n<p>Every value on this sheet is a prediction from the recipe by an equilibrium model, not a measurement: check the pH of the batch with a calibrated meter before release and titrate the QC sample as your procedure says.</p>\n<div class=\"signoff\"><div>Prepared by, date</div><div>Checked by, date</div><div>Released by, date</div></div>\n</footer>\n</body>\n</html>\n"
    );
    Ok(h)
}

fn tiles(h: &mut String, s: &BatchSheet) {
    let e = escape;
    h.push_str("<div class=\"tiles\">\n");
    let band = match (&s.band, &s.band_problem) {
        (Some(b), _) => format!(
            "pH band {} to {} (5th–95th percentile of {} weighings within the tolerances)",
            fixed(b.p05, 2),
            fixed(b.p95, 2),
            b.samples
        ),
        (None, Some(p)) => format!("no pH band: {p}"),
        (None, None) => "no weighing tolerances set".into(),
    };
    let _ = writeln!(
        h,
        "<div class=\"tile\"><div class=\"label\">Predicted pH, as weighed</div><div class=\"value\">{}</div><div class=\"sub\">{}</div></div>",
        fixed(s.ph, 2),
        e(&band)
    );
    match s.target {
        Some(t) => {
            let inside = (s.ph - t.ph).abs() <= t.tolerance;
            let _ = writeln!(
                h,
                "<div class=\"tile target\"><div class=\"label\">Target pH</div><div class=\"value\">{} ± {}</div><div class=\"sub\">{}</div></div>",
                fixed(t.ph, 2),
                fixed(t.tolerance, 2),
                if inside {
                    "the batch as weighed is inside the band"
                } else {
                    "the batch as weighed is outside the band"
                }
            );
        }
        None => h.push_str(
            "<div class=\"tile target\"><div class=\"label\">Target pH</div><div class=\"value\">—</div><div class=\"sub\">none set in the project</div></div>\n",
        ),
    }
    let (value, sub) = match &s.dose {
        DoseInstruction::Add {
            adjuster_name,
            amount_g,
            ..
        } => (s.batch.show(*amount_g), adjuster_name.clone()),
        DoseInstruction::NoTarget => ("—".into(), "no target, no dose".into()),
        DoseInstruction::Unreachable(_) => ("—".into(), "the target cannot be reached".into()),
    };
    let _ = write!(
        h,
        "<div class=\"tile dose\"><div class=\"label\">Dose to target</div><div class=\"value\">{}</div><div class=\"sub\">{}</div></div>\n</div>\n",
        e(&value),
        e(&sub)
    );
}

/// A number with a fixed count of decimals.
fn fixed(x: f64, decimals: usize) -> String {
    format!("{x:.decimals$}")
}

fn weighing(h: &mut String, s: &BatchSheet) {
    let e = escape;
    let b = &s.batch;
    h.push_str("<section>\n<h2><span class=\"no\">1</span>Weigh and add, in this order</h2>\n");
    let _ = writeln!(
        h,
        "<p class=\"note\">The recipe scaled from {} g to {}; each line as supplied (its assay as in the library).</p>",
        plain(s.recipe_batch_g, 6),
        e(&b.show(b.mass_g))
    );
    let _ = write!(
        h,
        "<table class=\"weigh\">\n<thead><tr><th class=\"num\">Step</th><th>Ingredient</th><th class=\"num\">Amount ({})</th><th class=\"num\">% w/w</th><th>As written</th><th>Weighed</th><th>Initials</th></tr></thead>\n<tbody>\n",
        b.unit.symbol()
    );
    for l in &s.lines {
        let _ = writeln!(
            h,
            "<tr><td class=\"num\">{}</td><td>{}<br><code>{}</code></td><td class=\"num mass\">{}</td><td class=\"num\">{}</td><td><code>{}</code></td><td class=\"box\"></td><td class=\"box\"></td></tr>",
            l.step,
            e(&l.name),
            e(&l.id),
            e(&sig(l.mass_g / b.unit.grams(), 4)),
            sig(l.percent, 3),
            e(&l.as_written),
        );
    }
    if let Some(w) = s.qs_water_g {
        let _ = writeln!(
            h,
            "<tr><td class=\"num\">{}</td><td>Water, q.s. to {}</td><td class=\"num mass\">{}</td><td class=\"num\">{}</td><td><code>q.s.</code></td><td class=\"box\"></td><td class=\"box\"></td></tr>",
            s.lines.len() + 1,
            e(&b.show(b.mass_g)),
            e(&sig(w / b.unit.grams(), 4)),
            sig(100.0 * w / b.mass_g, 3),
        );
    }
    let _ = write!(
        h,
        "<tr class=\"total\"><td></td><td>Batch</td><td class=\"num\">{}</td><td class=\"num\">100</td><td></td><td></td><td></td></tr>\n</tbody>\n</table>\n",
        e(&sig(b.mass_g / b.unit.grams(), 4))
    );
    if !s.left_out.is_empty() {
        let names: Vec<String> = s.left_out.iter().map(|n| e(n)).collect();
        let _ = writeln!(
            h,
            "<p class=\"note\">Switched off in the recipe and not weighed: {}.</p>",
            names.join(", ")
        );
    }
    h.push_str("</section>\n");
}

fn adjustment(h: &mut String, s: &BatchSheet) {
    let e = escape;
    h.push_str("<section>\n<h2><span class=\"no\">2</span>Adjust the pH</h2>\n");
    match &s.dose {
        DoseInstruction::Add {
            adjuster_name,
            adjuster,
            amount_g,
            percent_of_batch,
            ph_reached,
        } => {
            let target = s.target.map_or(String::new(), |t| fixed(t.ph, 2));
            let _ = writeln!(
                h,
                "<p class=\"instruction\">Add <strong>{}</strong> of <strong>{}</strong> (<code>{}</code>, as supplied) to the whole batch: {} % of the batch as weighed, predicted to bring it to pH {} (target {}). Add it slowly with mixing, in parts, and check the pH with a calibrated meter before the last part.</p>",
                e(&s.batch.show(*amount_g)),
                e(adjuster_name),
                e(adjuster),
                sig(*percent_of_batch, 3),
                fixed(*ph_reached, 2),
                target,
            );
            h.push_str("<p class=\"note\">The dose goes on top of the batch as weighed; it is found on the dose curve below.</p>\n");
        }
        DoseInstruction::NoTarget => h.push_str(
            "<p class=\"instruction none\">The project sets no target pH, so there is no dose to add. Record the pH of the batch as made.</p>\n",
        ),
        DoseInstruction::Unreachable(why) => {
            let _ = writeln!(
                h,
                "<p class=\"instruction problem\">No dose instruction: {}. Do not adjust this batch by the sheet; ask the formulator.</p>",
                e(why)
            );
        }
    }
    h.push_str("</section>\n");
}

fn qc(h: &mut String, s: &BatchSheet) {
    let e = escape;
    let q = &s.qc;
    h.push_str(
        "<section class=\"qc\">\n<h2><span class=\"no\">3</span>QC titration, predicted</h2>\n",
    );
    let _ = writeln!(
        h,
        "<p class=\"note\">A sample of {} g of product titrated with {}; the titrant's density is taken as 1.00 kg/L (1 mL brings 1 g of water). mL to each end point as a pH meter would show it.</p>",
        plain(q.plan.sample_g, 4),
        e(&q.titrant_label)
    );
    let ok: Vec<_> = q
        .results
        .iter()
        .filter_map(|r| r.prediction.as_ref().ok().map(|p| (r.of, p)))
        .collect();
    if let Some((_, first)) = ok.first() {
        h.push_str("<table class=\"qc\">\n<thead><tr><th>End point</th><th class=\"num\">pH</th>");
        for (of, _) in &ok {
            let _ = write!(h, "<th class=\"num\">mL, {}</th>", e(of));
        }
        h.push_str("</tr></thead>\n<tbody>\n");
        for (i, ep) in first.end_points.iter().enumerate() {
            let _ = write!(
                h,
                "<tr><td>{}</td><td class=\"num\">{}</td>",
                e(&end_point_name(q.kind, ep)),
                fixed(ep.ph, 1)
            );
            for (_, p) in &ok {
                match p.end_points.get(i) {
                    Some(x) if x.at_start => {
                        h.push_str("<td class=\"num\">0 (already past)</td>");
                    }
                    Some(x) => {
                        let _ = write!(h, "<td class=\"num mass\">{}</td>", fixed(x.ml, 2));
                    }
                    None => h.push_str("<td class=\"num\">—</td>"),
                }
            }
            h.push_str("</tr>\n");
        }
        h.push_str("<tr><td>Sample before titrant</td><td class=\"num\"></td>");
        for (_, p) in &ok {
            let _ = write!(h, "<td class=\"num\">pH {}</td>", fixed(p.start_ph, 2));
        }
        h.push_str("</tr>\n</tbody>\n</table>\n");
    }
    for r in &q.results {
        if let Err(why) = &r.prediction {
            let _ = writeln!(
                h,
                "<p class=\"instruction problem\">No QC prediction for the product {}: {}</p>",
                e(r.of),
                e(why)
            );
        }
    }
    h.push_str("</section>\n");
}

fn charts(h: &mut String, s: &BatchSheet) -> Result<(), ExportError> {
    let e = escape;
    h.push_str("<section class=\"charts\">\n<h2><span class=\"no\">4</span>Curves</h2>\n");
    match &s.dose_chart {
        Ok(c) => {
            let svg = draw::svg(Chart::Dose(c), SHEET_CHART)?;
            let _ = writeln!(
                h,
                "<figure>{}<figcaption>pH of this {} batch against the dose of {} added on top (blue); the target band in green, the batch as weighed as a dark diamond, equivalence points as open circles.</figcaption></figure>",
                svg_body(&svg),
                e(&s.batch.show(s.batch.mass_g)),
                e(&c.adjuster_name)
            );
        }
        Err(why) => {
            let _ = writeln!(h, "<p class=\"note\">No dose curve: {}</p>", e(why));
        }
    }
    if let Some(c) = &s.species_chart {
        let svg = draw::svg(Chart::Species(c), SHEET_CHART)?;
        let _ = writeln!(
            h,
            "<figure>{}<figcaption>Fractions of the forms of {} against pH at ionic strength {} mol/kg water; the dark line is the batch as weighed.</figcaption></figure>",
            svg_body(&svg),
            e(&c.system_name),
            sig(c.ionic_strength, 3)
        );
    }
    if let Some(c) = &s.titration_chart {
        let svg = draw::svg(Chart::Titration(c), SHEET_CHART)?;
        let of =
            s.qc.results
                .iter()
                .rev()
                .find(|r| r.prediction.is_ok())
                .map_or("", |r| r.of);
        let _ = writeln!(
            h,
            "<figure>{}<figcaption>Predicted titration of the QC sample of the product {}; end points as open circles.</figcaption></figure>",
            svg_body(&svg),
            e(of)
        );
    }
    h.push_str("</section>\n");
    Ok(())
}

/// The `<svg>` element of an SVG document, without any XML declaration before it.
fn svg_body(svg: &str) -> &str {
    svg.find("<svg").map_or(svg, |at| &svg[at..])
}

fn cautions(h: &mut String, s: &BatchSheet) {
    let e = escape;
    h.push_str(
        "<section>\n<h2><span class=\"no\">5</span>Cautions</h2>\n<ol class=\"cautions\">\n",
    );
    // The deferral closes the list on its own, below the numbered cautions.
    for c in s.cautions.iter().filter(|c| c.text != DEFER) {
        let _ = writeln!(h, "<li><strong>{}</strong>{}</li>", e(&c.title), e(&c.text));
    }
    h.push_str("</ol>\n");
    let _ = writeln!(
        h,
        "<p class=\"deferral\"><strong>{}.</strong> {}</p>\n</section>",
        e(hazard::DEFER_TITLE),
        e(DEFER)
    );
}
