//! The four commands: solve, then print text, JSON or CSV.

use std::io::Write;
use std::process::ExitCode;

use anyhow::{Context, Result};
use saltwise_chem::curve::Doser;
use saltwise_chem::drift;
use saltwise_chem::explain::explain;
use saltwise_chem::hazard::{self, Cautions};
use saltwise_chem::library::{Release, form_names};
use saltwise_chem::precipitation;
use saltwise_chem::report::{Report, evaluate_with};
use saltwise_chem::reserve::{self, Reserve};
use saltwise_chem::text::{Notation, ascii};
use saltwise_chem::{Constants, Library};
use serde_json::{Value, json};

use crate::args::{CurveArgs, DoseArgs, LibraryArgs, PhArgs, RecipeArgs, WaterArgs};
use crate::input::{self, Resolved};

fn solve(args: &RecipeArgs) -> Result<(Resolved, Constants, Report)> {
    let r = input::resolve(args)?;
    let constants = Constants::new(&r.library, r.conditions);
    let report = evaluate_with(&r.library, &constants, &r.recipe)?;
    Ok((r, constants, report))
}

fn species_json(library: &Library, report: &Report) -> Vec<Value> {
    let mut out = Vec::new();
    for st in &report.systems {
        let s = &library.systems()[st.system];
        let names = form_names(s);
        for (j, f) in st.fractions.iter().enumerate() {
            out.push(json!({
                "system": s.id,
                "form": j,
                "name": ascii(&names[j]),
                "charge": st.charges[j],
                "molality": st.total * f,
                "fraction": f,
            }));
        }
    }
    out
}

fn print_stdout(text: &str) -> Result<()> {
    let mut out = std::io::stdout().lock();
    out.write_all(text.as_bytes())
        .context("writing to stdout")?;
    Ok(())
}

/// Cautions as JSON: each `title` and `text`, ASCII, the deferral last.
fn cautions_json(c: &Cautions) -> Vec<Value> {
    c.iter()
        .map(|c| json!({"title": ascii(&c.title), "text": ascii(&c.text)}))
        .collect()
}

/// The reserve as JSON (the documented `reserve` object).
fn reserve_json(r: &Reserve) -> Value {
    json!({
        "side": format!("{:?}", r.side).to_lowercase(),
        "g_naoh_per_100g": r.g_naoh_per_100g,
        "indicator": r.indicator,
        "flagged": r.flagged,
        "caution": ascii(&reserve::caution_text(r)),
    })
}

/// Cautions as text: a heading and one line each, the deferral last.
fn cautions_text(c: &Cautions) -> String {
    let mut t = String::new();
    if !c.is_empty() {
        t += "\ncautions\n";
        for c in c.iter() {
            t += &format!("  {}: {}\n", c.title, c.text);
        }
    }
    t
}

/// `saltwise-cli ph`.
pub fn ph(ph_args: &PhArgs) -> Result<ExitCode> {
    let args = &ph_args.recipe;
    let (r, constants, report) = solve(args)?;
    let lib = &r.library;
    let s = &report.solution;
    let settled = (ph_args.precipitate || r.precipitate).then(|| {
        precipitation::precipitate(lib, &constants, &report.composition, &report.solution)
    });
    // Grams per kg of product from mol per kg of water.
    let water_per_product = report.batch.totals.water_kg / (report.batch.total_mass_g * 1e-3);
    let effects = explain(lib, &constants, &report.batch);
    let warn = hazard::assemble(
        lib,
        &constants,
        &report.batch,
        Some(s),
        r.adjuster.as_deref(),
    );
    // A recipe the drift figures cannot handle still gets its pH: drift is then null.
    let drift = drift::drift(lib, &constants, &report.batch, &report.composition, s);
    // The project's chosen forms, where it names them; the default form for every other system.
    let active = drift::active_forms_chosen(&report.systems, |system| {
        lib.systems()
            .get(system)
            .and_then(|sys| r.active_forms.get(&sys.id).copied())
    });
    let capacity = &report.capacity;
    if args.json {
        let v = json!({
            "ph": s.ph,
            "water_hardness": r.recipe.water_hardness.map(|h| json!({
                "ppm_caco3": h.ppm_caco3,
                "calcium_share": h.calcium_share,
                "anion": match h.anion {
                    saltwise_chem::recipe::HardnessAnion::HydrogenCarbonate => "bicarbonate",
                    saltwise_chem::recipe::HardnessAnion::Chloride => "chloride",
                },
            })),
            "chelant_capacity": capacity.as_ref().map(|c| json!({
                "ppm_caco3": c.ppm_caco3,
                "free_calcium_molal": saltwise_chem::chelant::FREE_CALCIUM,
                "chelants": c.chelants.iter().map(|x| json!({
                    "system": x.system,
                    "capacity_ppm": x.capacity_ppm,
                    "bound_fraction": x.bound_fraction,
                })).collect::<Vec<_>>(),
            })),
            "p_h_conc": s.p_h_conc,
            "ionic_strength": s.ionic_strength,
            "buffer_capacity": s.buffer_capacity,
            "temperature_c": r.conditions.temp_c,
            "activity": s.activity.name(),
            "activity_requested": r.conditions.activity.name(),
            "osmotic_coefficient": report.speciation.osmotic,
            "ions": report.speciation.ions.iter().map(|i| json!({
                "id": i.id,
                "charge": i.charge,
                "molality": i.molality,
                "gamma": i.gamma,
            })).collect::<Vec<_>>(),
            "fallback_ions": report.speciation.fallback_ions(),
            "complexes": report.speciation.complexes.iter().map(|c| json!({
                "id": c.id,
                "metal": c.metal,
                "ligand": c.ligand,
                "charge": c.charge,
                "molality": c.molality,
            })).collect::<Vec<_>>(),
            "saturation": report.speciation.saturation.iter().map(|x| json!({
                "solid": x.solid,
                "saturation_index": x.saturation_index,
            })).collect::<Vec<_>>(),
            "precipitation": settled.as_ref().map(|p| json!({
                "ph": p.solution.ph,
                "ionic_strength": p.solution.ionic_strength,
                "converged": p.converged,
                "formed": p.formed.iter().map(|f| json!({
                    "solid": f.solid,
                    "mol_per_kg_water": f.mol_per_kg_water,
                    "g_per_kg_product": f.g_per_kg_water().map(|g| g * water_per_product),
                })).collect::<Vec<_>>(),
                "saturation": p.saturation.iter().map(|x| json!({
                    "solid": x.solid,
                    "saturation_index": x.saturation_index,
                })).collect::<Vec<_>>(),
            })),
            "water_kg": report.batch.totals.water_kg,
            "batch_mass_g": report.batch.total_mass_g,
            "converged": s.converged(),
            "species": species_json(lib, &report),
            "ingredients": report.batch.lines.iter().zip(&effects).enumerate().map(|(i, (l, e))| json!({
                "id": e.ingredient,
                "mass_g": l.mass_g,
                "molality": report.batch.line_molality(i),
                "effect": e.effect.words(),
                "reason": e.summary_in(Notation::Ascii),
            })).collect::<Vec<_>>(),
            "warnings": report.warnings.iter().map(|w| ascii(w)).collect::<Vec<_>>(),
            "reserve": warn.reserve.as_ref().map(reserve_json),
            "drift": drift.as_ref().ok().map(|d| json!({
                "acid_1mmol_per_kg": d.acid_1mmol_per_kg,
                "base_1mmol_per_kg": d.base_1mmol_per_kg,
                "open_to_air_ph": d.open_to_air_ph,
            })),
            "active_forms": active.iter().map(|a| {
                let sys = &lib.systems()[a.system];
                json!({
                    "system": sys.id,
                    "form": a.form,
                    "name": ascii(form_names(sys).get(a.form).map_or("", String::as_str)),
                    "fraction": a.fraction,
                })
            }).collect::<Vec<_>>(),
            "cautions": cautions_json(&warn),
        });
        print_stdout(&format!("{}\n", serde_json::to_string_pretty(&v)?))?;
        return Ok(ExitCode::SUCCESS);
    }
    let mut t = String::new();
    t += &format!("pH {:.3}   (as a meter reads it, −log a(H⁺))\n", s.ph);
    t += &format!("p[H] {:.3}   (−log of the H⁺ molality)\n", s.p_h_conc);
    t += &format!(
        "ionic strength {:.4} mol/kg water   buffer capacity {:.4} mol/kg water per pH\n",
        s.ionic_strength, s.buffer_capacity
    );
    t += &format!(
        "{:.1} °C, {} activities; {:.4} kg water in a {:.2} g batch\n",
        r.conditions.temp_c,
        s.activity.name(),
        report.batch.totals.water_kg,
        report.batch.total_mass_g
    );
    t += "\ningredients\n";
    for (i, (l, e)) in report.batch.lines.iter().zip(&effects).enumerate() {
        t += &format!(
            "  {:<34} {:>10.4} g {:>10.5} mol/kg water  {}: {}\n",
            e.ingredient,
            l.mass_g,
            report.batch.line_molality(i),
            e.effect.words(),
            e.summary
        );
    }
    if report.batch.qs_water_g > 0.0 {
        t += &format!(
            "  {:<34} {:>10.4} g  (q.s.)\n",
            "water", report.batch.qs_water_g
        );
    }
    t += "\nspecies\n";
    for st in &report.systems {
        let sys = &lib.systems()[st.system];
        let names = form_names(sys);
        for (j, f) in st.fractions.iter().enumerate() {
            t += &format!(
                "  {:<14} {:<30} {:>+3}  {:>12.4e} mol/kg water  {:>7.4}\n",
                sys.id,
                names[j],
                st.charges[j],
                st.total * f,
                f
            );
        }
    }
    t += &speciation_text(&report.speciation);
    if let Some(p) = &settled {
        t += &format!(
            "\nwith supersaturated solids settled out: pH {:.3}, ionic strength {:.4} mol/kg water{}\n",
            p.solution.ph,
            p.solution.ionic_strength,
            if p.converged { "" } else { " (not converged)" }
        );
        if p.formed.is_empty() {
            t += "  no solid forms: none is above saturation\n";
        }
        for f in &p.formed {
            let grams = f.g_per_kg_water().map_or_else(String::new, |g| {
                format!("  {:.4} g per kg of product", g * water_per_product)
            });
            t += &format!(
                "  {:<16} {:>12.4e} mol/kg water{grams}\n",
                f.solid, f.mol_per_kg_water
            );
        }
    }
    if let Some(c) = capacity.as_ref().filter(|c| !c.chelants.is_empty()) {
        t += &format!(
            "\nchelant capacity at this pH: {:.0} ppm hardness as CaCO₃ of product (free Ca²⁺ held at 1e-5 mol/kg)\n",
            c.ppm_caco3
        );
        for x in &c.chelants {
            t += &format!(
                "  {:<14} {:>9.0} ppm   {:>5.1} % bound in the recipe as made\n",
                x.system,
                x.capacity_ppm,
                x.bound_fraction * 100.0
            );
        }
    }
    t += "\ndrift\n";
    match &drift {
        Ok(d) => {
            t += &format!(
                "  1 mmol/kg of product of strong acid: pH {:+.3}; of strong base: pH {:+.3}\n",
                d.acid_1mmol_per_kg, d.base_1mmol_per_kg
            );
            t += &format!(
                "  open to air (CO₂ 420 ppm): settles at pH {:.3}\n",
                d.open_to_air_ph
            );
        }
        Err(e) => t += &format!("  not available: {e}\n"),
    }
    if !active.is_empty() {
        t += "\nactive forms\n";
        for a in &active {
            let sys = &lib.systems()[a.system];
            let name = form_names(sys).get(a.form).cloned().unwrap_or_default();
            t += &format!("  {:<14} {:<30} {:>7.4}\n", sys.id, name, a.fraction);
        }
    }
    for w in &report.warnings {
        t += &format!("\nwarning: {w}\n");
    }
    t += &cautions_text(&warn);
    print_stdout(&t)?;
    Ok(ExitCode::SUCCESS)
}

/// `saltwise-cli curve`.
pub fn curve(args: &CurveArgs) -> Result<ExitCode> {
    let (r, constants, report) = solve(&args.recipe)?;
    let (id, from_g, to_g) = input::parse_dose_range(&args.dose, &r.library)?;
    if !(2..=100_000).contains(&args.points) {
        anyhow::bail!("--points {} is outside 2–100000", args.points);
    }
    let doser = Doser::new(&r.library, &constants, &report.batch, &id)?;
    let c = doser.curve_between(from_g, to_g, args.points);
    let warn = hazard::assemble(
        &r.library,
        &constants,
        &report.batch,
        Some(&report.solution),
        Some(&id),
    );
    if args.csv {
        let mut w = csv::Writer::from_writer(Vec::new());
        w.write_record(["dose_g", "ph", "buffer_capacity"])?;
        for p in &c.points {
            w.write_record([
                p.dose_g.to_string(),
                p.ph.to_string(),
                p.buffer_capacity.to_string(),
            ])?;
        }
        let bytes = w.into_inner().context("writing CSV")?;
        print_stdout(&String::from_utf8_lossy(&bytes))?;
    } else if args.recipe.json {
        let v = json!({
            "adjuster": id,
            "points": c.points.iter().map(|p| json!({"dose_g": p.dose_g, "ph": p.ph, "buffer_capacity": p.buffer_capacity})).collect::<Vec<_>>(),
            "equivalence_points": c.equivalence.iter().map(|e| json!({"dose_g": e.dose_g, "ph": e.ph})).collect::<Vec<_>>(),
            "cautions": cautions_json(&warn),
        });
        print_stdout(&format!("{}\n", serde_json::to_string_pretty(&v)?))?;
    } else {
        let mut t = format!("{:>12} {:>8} {:>14}\n", "dose_g", "ph", "buffer_cap");
        for p in &c.points {
            t += &format!(
                "{:>12.4} {:>8.3} {:>14.5e}\n",
                p.dose_g, p.ph, p.buffer_capacity
            );
        }
        for e in &c.equivalence {
            t += &format!("equivalence point near {:.4} g, pH {:.2}\n", e.dose_g, e.ph);
        }
        t += &cautions_text(&warn);
        print_stdout(&t)?;
    }
    Ok(ExitCode::SUCCESS)
}

/// `saltwise-cli dose`.
pub fn dose(args: &DoseArgs) -> Result<ExitCode> {
    let (r, constants, report) = solve(&args.recipe)?;
    let target = input::target_ph(args.target_ph)?;
    let doser = Doser::new(&r.library, &constants, &report.batch, &args.adjuster)?;
    let d = doser.to_target(target)?;
    let warn = hazard::assemble(
        &r.library,
        &constants,
        &report.batch,
        Some(&report.solution),
        Some(&args.adjuster),
    );
    if args.recipe.json {
        let v = json!({
            "adjuster": args.adjuster,
            "target_ph": args.target_ph,
            "start_ph": report.solution.ph,
            "amount_g": d.amount_g,
            "percent_of_batch": d.percent_of_batch,
            "ph_reached": d.ph_reached,
            "cautions": cautions_json(&warn),
        });
        print_stdout(&format!("{}\n", serde_json::to_string_pretty(&v)?))?;
    } else {
        let mut t = format!(
            "add {:.4} g of {} ({:.4} % of the {:.2} g batch): pH {:.3} → {:.3}\n",
            d.amount_g,
            args.adjuster,
            d.percent_of_batch,
            report.batch.total_mass_g,
            report.solution.ph,
            d.ph_reached
        );
        t += &cautions_text(&warn);
        print_stdout(&t)?;
    }
    Ok(ExitCode::SUCCESS)
}

/// `saltwise-cli library`.
pub fn library(args: &LibraryArgs) -> Result<ExitCode> {
    let lib = Library::built_in()?;
    if args.json {
        let v = json!({
            "ingredients": lib.entries().iter().map(|e| json!({
                "id": e.ingredient.id,
                "name": e.ingredient.name,
                "formula": e.ingredient.formula,
                "molar_mass": e.molar_mass_g_per_mol,
                "assay": e.ingredient.assay,
                "releases": e.ingredient.releases.iter().map(|r| match r {
                    Release::Ion { id, count } => json!({"ion": id, "count": count}),
                    Release::System { id, count, form } => json!({"system": id, "count": count, "form": form}),
                }).collect::<Vec<_>>(),
                "hazards": e.ingredient.hazards.iter().map(|h| format!("{h:?}")).collect::<Vec<_>>(),
                "note": e.ingredient.note,
            })).collect::<Vec<_>>(),
            "systems": lib.systems().iter().map(|s| json!({
                "id": s.id,
                "name": s.name,
                "charge_of_fully_protonated": s.charge_of_fully_protonated,
                "forms": form_names(s),
                "pka": s.pka,
                "dh_kj_mol": s.dh_kj_mol,
                "dcp_j_mol_k": s.dcp_j_mol_k,
                "pka_ionic_strength": s.pka_ionic_strength,
                "pka_ionic_strengths": (0..s.pka.len()).map(|k| s.ionic_strength_of_step(k)).collect::<Vec<_>>(),
                "source": s.source,
            })).collect::<Vec<_>>(),
            "ions": lib.ions().iter().map(|i| json!({"id": i.id, "symbol": i.symbol, "charge": i.charge})).collect::<Vec<_>>(),
        });
        print_stdout(&format!("{}\n", serde_json::to_string_pretty(&v)?))?;
        return Ok(ExitCode::SUCCESS);
    }
    let mut t = String::from("ingredients\n");
    for e in lib.entries() {
        t += &format!(
            "  {:<36} {:<22} {:>9.3} g/mol  assay {:>5.1} %  {}\n",
            e.ingredient.id,
            e.ingredient.formula,
            e.molar_mass_g_per_mol,
            e.ingredient.assay * 100.0,
            e.ingredient.name
        );
    }
    t += "\nsystems (pKa at 25 °C; ΔH° kJ/mol)\n";
    for s in lib.systems() {
        let pka: Vec<String> = s.pka.iter().map(|p| format!("{p}")).collect();
        let dh: Vec<String> = s.dh_kj_mol.iter().map(|p| format!("{p}")).collect();
        t += &format!(
            "  {:<18} pKa {:<28} ΔH° {:<24} {}\n",
            s.id,
            pka.join(", "),
            dh.join(", "),
            s.source
        );
    }
    print_stdout(&t)?;
    Ok(ExitCode::SUCCESS)
}

/// `saltwise-cli water`.
pub fn water(args: &WaterArgs) -> Result<ExitCode> {
    use saltwise_chem::solver::{activity, water};
    let t = args.temp;
    if !t.is_finite() || !(0.0..=100.0).contains(&t) {
        anyhow::bail!("--temp {t} °C is outside 0–100 °C, the range of the water model");
    }
    let (pkw, rho, eps, a) = (
        water::pkw(t),
        water::density_kg_m3(t),
        water::dielectric_constant(t),
        activity::debye_huckel_a(t),
    );
    if args.json {
        let v = json!({"temperature_c": t, "pkw": pkw, "density_kg_m3": rho, "dielectric_constant": eps, "davies_a": a});
        print_stdout(&format!("{}\n", serde_json::to_string_pretty(&v)?))?;
    } else {
        print_stdout(&format!(
            "{t} °C: pKw {pkw:.4} (IAPWS R11-07), neutral pH {:.4}, density {rho:.3} kg/m³, dielectric constant {eps:.3}, Davies A {a:.4}\n",
            pkw / 2.0
        ))?;
    }
    Ok(ExitCode::SUCCESS)
}

/// The complexes, saturation indices and estimated activities of a report, as text.
fn speciation_text(sp: &saltwise_chem::solver::Speciation) -> String {
    let mut t = String::new();
    if !sp.complexes.is_empty() {
        t += "\ncomplexes\n";
        for c in &sp.complexes {
            t += &format!(
                "  {:<32} {:<10} {:<20} {:>12.4e} mol/kg water\n",
                c.id, c.metal, c.ligand, c.molality
            );
        }
    }
    if !sp.saturation.is_empty() {
        t += "\nsaturation index (log IAP/Ksp; above 0 the solid can form)\n";
        for x in &sp.saturation {
            t += &format!("  {:<20} {:>+8.2}\n", x.solid, x.saturation_index);
        }
    }
    let fallback = sp.fallback_ions();
    if !fallback.is_empty() {
        t += &format!(
            "\nactivity estimated from the charge (no Pitzer parameters): {}\n",
            fallback.join(", ")
        );
    }
    t
}
