//! Static `index.html` pages for run and study folders: charts by relative links, key tables, no scripts, no
//! external addresses, inline CSS only, so a page opens from disk in any browser.

use std::path::{Path, PathBuf};

use super::charts::ChartFiles;
use super::compare::{ComparisonTable, Study};
use super::read::SavedRun;
use super::{write_atomic, OutputError, TOOL_VERSION};

const STYLE: &str = "body{font-family:system-ui,-apple-system,'Segoe UI',Roboto,'Noto Sans','DejaVu Sans',Arial,sans-serif;margin:0;color:#222;background:#fafafa}
main{max-width:1120px;margin:0 auto;padding:1.2em 1.5em 3em}
h1{font-size:1.6em;margin:.3em 0}h2{font-size:1.25em;margin:1.6em 0 .5em;border-bottom:1px solid #ddd;padding-bottom:.2em}
p.sub{color:#555;margin:.2em 0 1em}
table{border-collapse:collapse;margin:.6em 0 1.2em;background:#fff;font-size:.93em}
th,td{border:1px solid #ddd;padding:.3em .6em;text-align:left;vertical-align:top}
td.num{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
th{background:#f0f0f0}
span.diff{color:#666;font-size:.85em;display:block}
figure{margin:1em 0 2em;background:#fff;border:1px solid #e4e4e4;padding:.5em}
figure img{max-width:100%;height:auto;display:block}
figcaption{color:#555;font-size:.9em;margin-top:.3em}
ul.notes li{margin:.2em 0}
footer{color:#777;font-size:.85em;margin-top:3em}
a{color:#1f5fa8}";

/// Escape text for HTML.
pub fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            c => out.push(c),
        }
    }
    out
}

/// Escape a relative link: path segments percent-encoded where needed, `/` as separator.
fn href(rel: &str) -> String {
    let mut out = String::new();
    for b in rel.replace('\\', "/").bytes() {
        if b.is_ascii_alphanumeric() || b"-_./~".contains(&b) {
            out.push(b as char);
        } else {
            out.push_str(&format!("%{b:02X}"));
        }
    }
    out
}

fn page(title: &str, body: &str) -> String {
    page_with_footer(title, body, "from the data files in this folder; redraw with <code>dropcut plot &lt;folder&gt;</code>")
}

/// A page whose footer says "Written by dropcut x.y " followed by `footer` (HTML).
fn page_with_footer(title: &str, body: &str, footer: &str) -> String {
    format!(
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n<title>{}</title>\n<style>\n{STYLE}\n</style>\n</head>\n<body>\n<main>\n{body}<footer>Written by {} {footer}.</footer>\n</main>\n</body>\n</html>\n",
        escape(title),
        escape(TOOL_VERSION)
    )
}

/// One part of an uncertainty page: a heading, the folder of its files relative to the page ("" or "name/"),
/// its band charts and its data files.
#[derive(Debug, Clone)]
pub struct UncertaintySection {
    /// Heading (fuel name, or "all fuels").
    pub heading: String,
    /// Folder of the files relative to the page, ending in '/' (or empty).
    pub prefix: String,
    /// Band charts.
    pub charts: Vec<ChartFiles>,
    /// Data files (names inside the folder).
    pub files: Vec<String>,
}

/// Write `index.html` of an uncertainty folder: the text report (with the screening caution), then per fuel
/// its band charts and links to its data files.
pub fn write_uncertainty_page(dir: &Path, title: &str, report: &str, sections: &[UncertaintySection]) -> Result<PathBuf, OutputError> {
    let mut b = format!("<h1>{}</h1>\n<h2>Report</h2>\n<pre>{}</pre>\n", escape(title), escape(report));
    b.push_str(&format!("<p class=\"sub\">Caution: {}</p>\n", escape(crate::post::CAUTION)));
    for sec in sections {
        b.push_str(&format!("<h2>{}</h2>\n", escape(&sec.heading)));
        b.push_str(&figures(&sec.prefix, &sec.charts));
        if !sec.files.is_empty() {
            b.push_str("<ul>\n");
            for f in &sec.files {
                let rel = format!("{}{f}", sec.prefix);
                b.push_str(&format!("<li><a href=\"{}\">{}</a></li>\n", href(&rel), escape(&rel)));
            }
            b.push_str("</ul>\n");
        }
    }
    let path = dir.join("index.html");
    write_atomic(&path, page_with_footer(title, &b, "from the samples run in this folder (dropcut uncertainty)").as_bytes())?;
    Ok(path)
}

fn file_name(p: &Path) -> String {
    p.file_name().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default()
}

fn figures(prefix: &str, charts: &[ChartFiles]) -> String {
    let mut s = String::new();
    for c in charts {
        let png = href(&format!("{prefix}{}", file_name(&c.png)));
        let svg = href(&format!("{prefix}{}", file_name(&c.svg)));
        s.push_str(&format!(
            "<figure><img src=\"{png}\" alt=\"{}\"><figcaption>{} — <a href=\"{svg}\">SVG</a> · <a href=\"{png}\">PNG</a></figcaption></figure>\n",
            escape(&c.title),
            escape(&c.title)
        ));
    }
    s
}

fn fmt_opt(v: Option<f64>, scale: f64, decimals: usize, unit: &str) -> String {
    match v {
        Some(v) => format!("{:.*} {unit}", decimals, v * scale),
        None => "–".into(),
    }
}

/// Key values of a run as (label, formatted value) pairs, from summary.json.
pub fn run_key_values(run: &SavedRun) -> Vec<(String, String)> {
    let mut rows = vec![];
    let mut push = |label: &str, value: String| rows.push((label.to_string(), value));
    push("fuel", run.fuel_name());
    if let Some(s) = run.summary_text("status") {
        push("status", s);
    }
    if let Some(t) = run.input_number("ambient_temperature_K") {
        push("ambient temperature", format!("{t:.2} K ({:.2} °C)", t - 273.15));
    }
    if let Some(p) = run.input_number("pressure_Pa") {
        push("pressure", format!("{:.4} bar", p / 1e5));
    }
    if let Some(g) = run.summary.get("input").and_then(|i| i.get("ambient_gas")).and_then(|g| g.as_array()) {
        let parts: Vec<String> = g
            .iter()
            .filter_map(|p| {
                let p = p.as_array()?;
                Some(format!("{} {:.4}", p.first()?.as_str()?, p.get(1)?.as_f64()?))
            })
            .collect();
        if !parts.is_empty() {
            push("ambient gas (mole fractions)", parts.join(", "));
        }
    }
    if let Some(d) = run.initial_diameter() {
        push("initial diameter", format!("{:.2} µm", d * 1e6));
    }
    if let Some(t) = run.input_number("droplet_temperature_K") {
        push("initial droplet temperature", format!("{t:.2} K"));
    }
    if let Some(m) = run.summary.get("input").and_then(|i| i.get("motion")) {
        if let (Some(k), Some(v)) = (m.get("kind").and_then(|k| k.as_str()), m.get("velocity").and_then(|v| v.as_f64())) {
            push("relative velocity", format!("{v} m/s ({k})"));
        }
    }
    if let Some(c) = run.summary_text("correlation") {
        push("Nu0/Sh0 correlation", c);
    }
    push("lifetime", fmt_opt(run.summary_number("lifetime_s"), 1e3, 3, "ms"));
    push("t10 / t50 / t90", format!("{} / {} / {}", fmt_opt(run.summary_number("t10_s"), 1e3, 3, "ms"), fmt_opt(run.summary_number("t50_s"), 1e3, 3, "ms"), fmt_opt(run.summary_number("t90_s"), 1e3, 3, "ms")));
    push("end of heat-up", fmt_opt(run.summary_number("heatup_end_s"), 1e3, 3, "ms"));
    push("highest surface temperature", fmt_opt(run.summary_number("max_surface_temperature_K"), 1.0, 1, "K"));
    push("boiling onset", fmt_opt(run.summary_number("boiling_onset_s"), 1e3, 3, "ms"));
    push("end time", fmt_opt(run.summary_number("end_time_s"), 1e3, 3, "ms"));
    push("evaporated at the end", fmt_opt(run.summary_number("final_evaporated_fraction"), 100.0, 2, "%"));
    if let Some(e) = run.summary_number("mass_balance_error") {
        push("mass-balance error", format!("{e:.1e}"));
    }
    rows
}

/// Residue indicators at 0, 50 and 90 % evaporated, from residue.csv (`None` without one).
fn residue_table_html(run: &SavedRun) -> Option<String> {
    let t = run.residue.as_ref()?;
    let x = t.numbers("evaporated_fraction").ok()?;
    let cols: [(&str, &str, f64, f64, usize); 6] = [
        ("bubble_point_K", "bubble point [°C]", 1.0, -273.15, 1),
        ("t50_K", "T50 [°C]", 1.0, -273.15, 1),
        ("flash_point_K", "flash point [°C]", 1.0, -273.15, 1),
        ("kinematic_viscosity_minus20C_m2_s", "viscosity at −20 °C [mm²/s]", 1e6, 0.0, 2),
        ("density_15C_kg_m3", "density at 15 °C [kg/m³]", 1.0, 0.0, 1),
        ("dcn", "DCN [-]", 1.0, 0.0, 1),
    ];
    let present: Vec<_> = cols.iter().filter(|c| t.has(c.0)).collect();
    if present.is_empty() {
        return None;
    }
    let mut s = String::from("<table>\n<tr><th>evaporated</th>");
    for c in &present {
        s.push_str(&format!("<th>{}</th>", escape(c.1)));
    }
    s.push_str("</tr>\n");
    for at in [0.0, 0.5, 0.9] {
        s.push_str(&format!("<tr><td class=\"num\">{:.0} %</td>", at * 100.0));
        for c in &present {
            let v = t.numbers(c.0).ok().and_then(|y| super::read::interpolate_at(&x, &y, at));
            s.push_str(&format!("<td class=\"num\">{}</td>", v.map(|v| format!("{:.*}", c.4, v * c.2 + c.3)).unwrap_or_else(|| "–".into())));
        }
        s.push_str("</tr>\n");
    }
    s.push_str("</table>\n<p class=\"sub\">Screening estimates of the liquid left in the droplet (residue.csv), not certified fuel properties.</p>\n");
    s.push_str(&format!("<p class=\"sub\">Caution: {}</p>\n", escape(crate::post::CAUTION)));
    Some(s)
}

/// Write `index.html` into a run folder: key values, charts, notes and links to the data files.
pub fn write_run_page(run: &SavedRun, charts: &[ChartFiles]) -> Result<PathBuf, OutputError> {
    let fuel = run.fuel_name();
    let mut b = String::new();
    if run.dir.parent().is_some_and(|p| p.join(super::compare::STUDY_FILE).is_file()) {
        b.push_str("<p><a href=\"../index.html\">← all runs of this comparison</a></p>\n");
    }
    b.push_str(&format!("<h1>Droplet run: {}</h1>\n<p class=\"sub\">{}</p>\n", escape(&fuel), escape(&super::charts::run_subtitle(run))));
    b.push_str("<h2>Summary</h2>\n<table>\n");
    for (k, v) in run_key_values(run) {
        b.push_str(&format!("<tr><th>{}</th><td>{}</td></tr>\n", escape(&k), escape(&v)));
    }
    b.push_str("</table>\n");
    if let Some(t) = residue_table_html(run) {
        b.push_str("<h2>Residual liquid</h2>\n");
        b.push_str(&t);
    }
    if !charts.is_empty() {
        b.push_str("<h2>Charts</h2>\n");
        b.push_str(&figures("", charts));
    }
    if run.residue.is_some() && super::charts::is_pure_fuel(run) {
        b.push_str(&format!("<p class=\"sub\">{}</p>\n", escape(super::charts::PURE_FUEL_RESIDUE_NOTE)));
    }
    let notes: Vec<String> = run.summary.get("regime_notes").and_then(|n| n.as_array()).map(|a| a.iter().filter_map(|v| v.as_str().map(String::from)).collect()).unwrap_or_default();
    if !notes.is_empty() {
        b.push_str("<h2>Notes</h2>\n<ul class=\"notes\">\n");
        for n in notes {
            b.push_str(&format!("<li>{}</li>\n", escape(&n)));
        }
        b.push_str("</ul>\n");
    }
    if let Some(comp) = run.summary.get("input").and_then(|i| i.get("composition_mass_fractions")).and_then(|c| c.as_array()) {
        b.push_str("<h2>Composition</h2>\n<table>\n<tr><th>component</th><th>class</th><th>mass %</th></tr>\n");
        for p in comp.iter().filter_map(|p| p.as_array()) {
            let (Some(id), Some(y)) = (p.first().and_then(|v| v.as_str()), p.get(1).and_then(|v| v.as_f64())) else { continue };
            let class = run.components.iter().find(|(c, _)| c == id).map(|(_, k)| k.as_str()).unwrap_or("");
            b.push_str(&format!("<tr><td>{}</td><td>{}</td><td class=\"num\">{:.3}</td></tr>\n", escape(id), escape(class), 100.0 * y));
        }
        b.push_str("</table>\n");
    }
    let est: Vec<String> = run
        .summary
        .get("estimated_properties")
        .and_then(|e| e.as_array())
        .map(|a| {
            a.iter()
                .filter_map(|p| {
                    let p = p.as_array()?;
                    let props: Vec<&str> = p.get(1)?.as_array()?.iter().filter_map(|v| v.as_str()).collect();
                    Some(format!("{}: {}", p.first()?.as_str()?, props.join(", ")))
                })
                .collect()
        })
        .unwrap_or_default();
    if !est.is_empty() {
        b.push_str("<h2>Estimated properties</h2>\n<p>These properties have no published coefficients for the component and were estimated:</p>\n<ul class=\"notes\">\n");
        for e in est {
            b.push_str(&format!("<li>{}</li>\n", escape(&e)));
        }
        b.push_str("</ul>\n");
    }
    b.push_str("<h2>Data files</h2>\n<ul>\n");
    for f in ["history.csv", "summary.json", "residue.csv"] {
        if run.dir.join(f).is_file() {
            b.push_str(&format!("<li><a href=\"{}\">{}</a></li>\n", href(f), escape(f)));
        }
    }
    b.push_str("</ul>\n");
    let path = run.dir.join("index.html");
    write_atomic(&path, page(&format!("dropcut: {fuel}"), &b).as_bytes())?;
    Ok(path)
}

/// Comparison table as HTML: quantities in rows, runs in columns, differences to the first run below values.
pub fn comparison_table_html(t: &ComparisonTable, link_runs: bool) -> String {
    let mut s = String::from("<table>\n<tr><th>quantity</th><th>unit</th>");
    for r in &t.rows {
        if link_runs {
            s.push_str(&format!("<th><a href=\"{}\">{}</a></th>", href(&format!("{}/index.html", r.dir)), escape(&r.label)));
        } else {
            s.push_str(&format!("<th>{}</th>", escape(&r.label)));
        }
    }
    s.push_str("</tr>\n");
    for (m, metric) in t.metrics.iter().enumerate() {
        s.push_str(&format!("<tr><td>{}</td><td>{}</td>", escape(&metric.label), escape(&metric.unit)));
        for (r, row) in t.rows.iter().enumerate() {
            let d = t.format_difference(r, m);
            let diff = if d.is_empty() { String::new() } else { format!("<span class=\"diff\">{}</span>", escape(&d)) };
            s.push_str(&format!("<td class=\"num\">{}{diff}</td>", escape(&metric.format(row.values[m]))));
        }
        s.push_str("</tr>\n");
    }
    s.push_str("</table>\n");
    if t.rows.len() > 1 {
        s.push_str(&format!("<p class=\"sub\">Grey: difference to {} (times in percent, temperatures in K).</p>\n", escape(&t.rows[0].label)));
    }
    if t.shows_flash_point() {
        s.push_str(&format!("<p class=\"sub\">Caution: {}</p>\n", escape(crate::post::CAUTION)));
    }
    s
}

/// Write `index.html` into a study folder: per group the comparison table, the overlay charts and links to the runs.
pub fn write_study_page(dir: &Path, study: &Study, groups: &[(ComparisonTable, Vec<ChartFiles>)]) -> Result<PathBuf, OutputError> {
    let mut b = format!("<h1>{}</h1>\n<p class=\"sub\">{}</p>\n", escape(&study.title), escape(&study.description));
    for (g, (table, charts)) in study.groups.iter().zip(groups) {
        b.push_str(&format!("<h2>{}</h2>\n", escape(&g.title)));
        if !g.description.is_empty() {
            b.push_str(&format!("<p class=\"sub\">{}</p>\n", escape(&g.description)));
        }
        b.push_str(&comparison_table_html(table, true));
        b.push_str(&figures("", charts));
        b.push_str("<p>Runs: ");
        let links: Vec<String> = g.runs.iter().map(|r| format!("<a href=\"{}\">{}</a>", href(&format!("{}/index.html", r.dir)), escape(&r.label))).collect();
        b.push_str(&links.join(" · "));
        b.push_str("</p>\n");
    }
    b.push_str("<h2>Data files</h2>\n<ul>\n");
    for f in ["comparison.csv", "comparison.txt", "study.json"] {
        if dir.join(f).is_file() {
            b.push_str(&format!("<li><a href=\"{}\">{}</a></li>\n", href(f), escape(f)));
        }
    }
    b.push_str("</ul>\n");
    let path = dir.join("index.html");
    write_atomic(&path, page(&study.title, &b).as_bytes())?;
    Ok(path)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn escapes_and_links() {
        assert_eq!(escape("<a & 'b'>"), "&lt;a &amp; &#39;b&#39;&gt;");
        assert_eq!(href("run 1/index.html"), "run%201/index.html");
        assert_eq!(href("a\"b"), "a%22b");
    }

    #[test]
    fn page_has_no_external_addresses_or_scripts() {
        let p = page("t", "<p>x</p>");
        assert!(!p.contains("http"));
        assert!(!p.contains("<script"));
        assert!(p.starts_with("<!DOCTYPE html>"));
    }
}
