//! `offtake report` on the invented demo scheme: a self-contained HTML file
//! with every section, whose printed design flows are those of
//! `design_values.csv`; and the same report rendered by headless Chromium
//! to PDF (A4 and Letter) and PNG: at least one page per section, no table
//! wider than the page.
//!
//! The browser test needs Debian's `chromium` (`.ci/run` installs it).
//! Without it the test says so and passes on a developer machine, and fails
//! under CI (`CI` set).

#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::path::{Path, PathBuf};
use std::process::Command;

use offtake_io::report::SECTION_IDS;
use offtake_io::results::fmt_sig3;

const DEMO: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../demo-projects/demo-scheme/scheme.ron"
);

fn offtake() -> Command {
    Command::new(env!("CARGO_BIN_EXE_offtake"))
}

/// Runs `offtake run` and `offtake report` into `dir`; returns the report
/// text and the design values (node → design flow, low, high) of the CSV.
/// A node's design flow and the bounds of its interval (l/s).
type DesignRow = (String, f64, Option<f64>, Option<f64>);

fn demo_report(dir: &Path) -> (String, Vec<DesignRow>) {
    let run = offtake()
        .args(["run", DEMO, "--out"])
        .arg(dir)
        .output()
        .unwrap();
    assert!(
        run.status.success(),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    let report = dir.join("report.html");
    let out = offtake()
        .args(["report", DEMO, "--out"])
        .arg(&report)
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(String::from_utf8_lossy(&out.stdout).contains("Design report of"));
    let csv = std::fs::read_to_string(dir.join("design_values.csv")).unwrap();
    let mut lines = csv.lines();
    let header: Vec<&str> = lines.next().unwrap().split(',').collect();
    let col = |name: &str| header.iter().position(|h| *h == name).unwrap();
    let (node, flow, low, high) = (
        col("node"),
        col("design_flow_ls"),
        col("design_flow_low_ls"),
        col("design_flow_high_ls"),
    );
    let values = lines
        .map(|l| {
            let cells: Vec<&str> = l.split(',').collect();
            (
                cells[node].to_owned(),
                cells[flow].parse().unwrap(),
                cells[low].parse().ok(),
                cells[high].parse().ok(),
            )
        })
        .collect();
    (std::fs::read_to_string(report).unwrap(), values)
}

/// Text of the cell `<td class="n CLASS" data-node="NODE">TEXT</td>`.
fn cell(html: &str, class: &str, node: &str) -> Option<String> {
    let key = format!("class=\"n {class}\" data-node=\"{node}\">");
    let start = html.find(&key)? + key.len();
    let end = html[start..].find("</td>")? + start;
    Some(html[start..end].to_owned())
}

/// Every design flow and bound printed in the report equals the CSV's, to
/// the report's 3 significant figures.
fn assert_design_flows_match(html: &str, csv: &[DesignRow]) {
    assert_eq!(csv.len(), 6, "five canals and the headworks");
    for (node, flow, low, high) in csv {
        assert_eq!(
            cell(html, "q-design", node).as_deref(),
            Some(fmt_sig3(*flow).as_str()),
            "design flow of {node}"
        );
        let text = |v: &Option<f64>, open: &str| v.map_or_else(|| open.to_owned(), fmt_sig3);
        assert_eq!(
            cell(html, "q-low", node).unwrap(),
            text(low, "below smallest of record"),
            "{node}"
        );
        assert_eq!(
            cell(html, "q-high", node).unwrap(),
            text(high, "above largest of record"),
            "{node}"
        );
        // The interval holds the design flow.
        assert!(low.is_none_or(|l| l <= *flow) && high.is_none_or(|h| *flow <= h));
    }
}

#[test]
fn report_is_self_contained_with_every_section() {
    let dir = tempfile::tempdir().unwrap();
    let (html, csv) = demo_report(dir.path());
    for id in SECTION_IDS {
        assert!(
            html.contains(&format!("<section class=\"report-section\" id=\"{id}\">")),
            "section {id}"
        );
    }
    // Nothing is fetched: no scripts, links, images or URLs other than the
    // SVG namespace name (which is never fetched).
    let stripped = html.replace("xmlns=\"http://www.w3.org/2000/svg\"", "");
    for bad in [
        "<script", "<link", "<img", "src=", "url(", "http://", "https://", "@import",
    ] {
        assert!(!stripped.contains(bad), "the report holds {bad}");
    }
    assert!(html.contains("Figure 1.") && html.contains("Table 1."));
    assert!(html.contains("@page") && html.contains("break-before: page"));
    assert!(html.contains("within the uncertainty of the record"));
    assert!(html.contains("Hahn"));
    assert!(html.contains("SHA-256"));
    assert_design_flows_match(&html, &csv);
}

/// Chromium, if installed.
fn chromium() -> Option<PathBuf> {
    if let Some(p) = std::env::var_os("CHROMIUM") {
        return Some(PathBuf::from(p));
    }
    ["/usr/bin/chromium", "/usr/bin/chromium-browser"]
        .into_iter()
        .map(PathBuf::from)
        .find(|p| p.exists())
}

/// A headless Chromium command with the flags this machine needs (no
/// sandbox as root, no background network, a fresh profile).
fn browser(exe: &Path, profile: &Path) -> Command {
    let mut c = Command::new(exe);
    c.args([
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--no-pdf-header-footer",
    ])
    .arg(format!("--user-data-dir={}", profile.display()));
    c
}

/// Pages of a PDF written by Chromium: its page objects (`/Type /Page`,
/// not `/Pages`).
fn pdf_pages(pdf: &[u8]) -> usize {
    let text = String::from_utf8_lossy(pdf);
    text.match_indices("/Type /Page")
        .filter(|(i, _)| !text[i + 11..].starts_with('s'))
        .count()
}

/// Measures each table against the report's content width in the browser
/// and writes the widest overflow into the page (read back by --dump-dom).
const WIDTH_CHECK: &str = r"<script>
(function () {
  var body = document.body.getBoundingClientRect();
  var worst = 0, count = 0;
  document.querySelectorAll('table').forEach(function (t) {
    count += 1;
    var r = t.getBoundingClientRect();
    var over = Math.max(r.right - body.right, body.left - r.left, t.scrollWidth - t.clientWidth);
    if (over > worst) { worst = over; }
  });
  var p = document.createElement('pre');
  p.id = 'width-check';
  p.textContent = 'tables=' + count + ' body=' + body.width.toFixed(1) + ' overflow=' + worst.toFixed(2);
  document.body.appendChild(p);
})();
</script>";

#[test]
fn report_renders_in_chromium() {
    let Some(exe) = chromium() else {
        assert!(
            std::env::var_os("CI").is_none(),
            "chromium is not installed; .ci/run installs Debian's chromium for this test"
        );
        eprintln!("skipped: chromium is not installed (apt-get install chromium)");
        return;
    };
    let dir = tempfile::tempdir().unwrap();
    let (html, csv) = demo_report(dir.path());
    let keep = PathBuf::from(env!("CARGO_TARGET_TMPDIR")).join("report");
    std::fs::create_dir_all(&keep).unwrap();

    for (paper, css) in [("a4", "A4"), ("letter", "letter")] {
        let page = dir.path().join(format!("report-{paper}.html"));
        std::fs::write(
            &page,
            html.replace("</style>", &format!("@page {{ size: {css}; }}</style>")),
        )
        .unwrap();
        let pdf = keep.join(format!("report-{paper}.pdf"));
        let profile = tempfile::tempdir().unwrap();
        let out = browser(&exe, profile.path())
            .arg(format!("--print-to-pdf={}", pdf.display()))
            .arg(format!("file://{}", page.display()))
            .output()
            .unwrap();
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        let pages = pdf_pages(&std::fs::read(&pdf).unwrap());
        // Each section starts a page, so at least one page per section.
        assert!(
            pages >= SECTION_IDS.len(),
            "{paper}: {pages} pages for {} sections",
            SECTION_IDS.len()
        );
        eprintln!("{paper}: {pages} pages, {}", pdf.display());
    }

    // The DOM as the browser laid it out: design flows as printed, and no
    // table wider than the content width (182 mm, inside A4 and Letter).
    let page = dir.path().join("report-check.html");
    std::fs::write(
        &page,
        html.replace("</body>", &format!("{WIDTH_CHECK}</body>")),
    )
    .unwrap();
    let profile = tempfile::tempdir().unwrap();
    let out = browser(&exe, profile.path())
        .args(["--window-size=1000,1400", "--dump-dom"])
        .arg(format!("file://{}", page.display()))
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let dom = String::from_utf8_lossy(&out.stdout);
    assert_design_flows_match(&dom, &csv);
    let check = dom
        .split("<pre id=\"width-check\">")
        .nth(1)
        .and_then(|s| s.split("</pre>").next())
        .expect("the width check ran");
    let field = |k: &str| -> f64 {
        check
            .split_whitespace()
            .find_map(|w| w.strip_prefix(k))
            .unwrap()
            .parse()
            .unwrap()
    };
    assert!(field("tables=") >= 10.0, "{check}");
    // 182 mm at 96 px per inch.
    assert!(
        (field("body=") - 182.0 / 25.4 * 96.0).abs() < 1.0,
        "{check}"
    );
    assert!(
        field("overflow=") <= 0.5,
        "a table is wider than the page: {check}"
    );

    // A PNG of the first pages as laid out on screen (A4 width).
    let png = keep.join("report-first-pages.png");
    let profile = tempfile::tempdir().unwrap();
    let out = browser(&exe, profile.path())
        .args(["--window-size=794,2246", "--hide-scrollbars"])
        .arg(format!("--screenshot={}", png.display()))
        .arg(format!(
            "file://{}",
            dir.path().join("report-a4.html").display()
        ))
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let bytes = std::fs::read(&png).unwrap();
    assert_eq!(&bytes[..8], b"\x89PNG\r\n\x1a\n");
    assert!(bytes.len() > 20_000, "the screenshot is nearly empty");
    eprintln!("PNG of the first pages: {}", png.display());
}

/// An absurd confidence level is refused with the option's name and the
/// accepted range, and nothing is written.
#[test]
fn absurd_confidence_level_is_an_error() {
    let dir = tempfile::tempdir().unwrap();
    let weather = Path::new(DEMO)
        .parent()
        .unwrap()
        .join("../demo-weather/weather.csv");
    let text = std::fs::read_to_string(DEMO).unwrap();
    for level in ["0.0", "1e9"] {
        let project = text
            .replacen(
                "design_basis: TenDay,",
                &format!("design_basis: TenDay, design_confidence_pct: {level},"),
                1,
            )
            .replace(
                "\"../demo-weather/weather.csv\"",
                &format!("{:?}", weather.display().to_string()),
            );
        let path = dir.path().join("absurd.ron");
        std::fs::write(&path, project).unwrap();
        let out_file = dir.path().join("absurd.html");
        let out = offtake()
            .arg("report")
            .arg(&path)
            .arg("--out")
            .arg(&out_file)
            .output()
            .unwrap();
        assert!(!out.status.success(), "level {level} accepted");
        let err = String::from_utf8_lossy(&out.stderr);
        assert!(err.contains("design_confidence_pct"), "{err}");
        assert!(err.contains("from 50 to 99.99"), "{err}");
        assert!(!out_file.exists());
    }
}
