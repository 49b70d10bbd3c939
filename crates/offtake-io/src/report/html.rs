//! Small HTML builders of the report: escaping, tables, sections, figure
//! numbering, and the one inline style sheet (screen and print).

use std::fmt::Write as _;

/// Text made safe inside HTML elements and attribute values.
pub fn esc(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
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

/// A table cell: text, whether it is a number (right-aligned), and an
/// optional class (e.g. the cells a test reads back).
#[derive(Debug, Clone, Default)]
pub struct Td {
    /// Cell text (escaped when written).
    pub text: String,
    /// Right-aligned number.
    pub numeric: bool,
    /// Extra attributes, already escaped (`class="q" data-node="x"`).
    pub attrs: String,
}

impl Td {
    /// A text cell.
    pub fn text(s: impl Into<String>) -> Self {
        Self {
            text: s.into(),
            ..Self::default()
        }
    }

    /// A number cell (right-aligned).
    pub fn num(s: impl Into<String>) -> Self {
        Self {
            text: s.into(),
            numeric: true,
            ..Self::default()
        }
    }

    /// The same cell with extra attributes.
    #[must_use]
    pub fn with_attrs(mut self, attrs: String) -> Self {
        self.attrs = attrs;
        self
    }
}

/// The document being written, with its table and figure counters.
#[derive(Debug, Default)]
pub struct Doc {
    /// The body so far.
    pub body: String,
    tables: usize,
    figures: usize,
    sections: usize,
    /// Section titles, in order (for the contents list).
    pub toc: Vec<(String, String)>,
}

impl Doc {
    /// Opens a section: it starts a new printed page.
    pub fn section(&mut self, id: &str, title: &str) {
        if self.sections > 0 {
            self.body.push_str("</section>\n");
        }
        self.sections += 1;
        let n = self.sections;
        let _ = writeln!(
            self.body,
            "<section class=\"report-section\" id=\"{}\"><h2>{n}. {}</h2>",
            esc(id),
            esc(title)
        );
        self.toc.push((id.to_owned(), format!("{n}. {title}")));
    }

    /// Number of sections opened.
    pub fn sections(&self) -> usize {
        self.sections
    }

    /// Closes the last section.
    pub fn finish(&mut self) {
        if self.sections > 0 {
            self.body.push_str("</section>\n");
        }
    }

    /// A sub-heading.
    pub fn h3(&mut self, title: &str) {
        let _ = writeln!(self.body, "<h3>{}</h3>", esc(title));
    }

    /// A paragraph of plain text.
    pub fn p(&mut self, text: &str) {
        let _ = writeln!(self.body, "<p>{}</p>", esc(text));
    }

    /// A paragraph with a class (`note`, `caution`).
    pub fn p_class(&mut self, class: &str, text: &str) {
        let _ = writeln!(self.body, "<p class=\"{class}\">{}</p>", esc(text));
    }

    /// A numbered table with a caption; `headers` carry their units.
    pub fn table(&mut self, caption: &str, headers: &[&str], rows: &[Vec<Td>]) {
        self.tables += 1;
        let _ = write!(
            self.body,
            "<table><caption>Table {}. {}</caption><thead><tr>",
            self.tables,
            esc(caption)
        );
        for h in headers {
            let _ = write!(self.body, "<th>{}</th>", esc(h));
        }
        self.body.push_str("</tr></thead><tbody>\n");
        for row in rows {
            self.body.push_str("<tr>");
            for c in row {
                // Extra attributes that carry their own class replace the
                // default one (an element has one class attribute).
                let class = if c.numeric && !c.attrs.contains("class=") {
                    " class=\"n\""
                } else {
                    ""
                };
                let extra = if c.attrs.is_empty() {
                    String::new()
                } else {
                    format!(" {}", c.attrs)
                };
                let _ = write!(self.body, "<td{class}{extra}>{}</td>", esc(&c.text));
            }
            self.body.push_str("</tr>\n");
        }
        self.body.push_str("</tbody></table>\n");
    }

    /// A numbered figure: inline SVG and its caption.
    pub fn figure(&mut self, svg: &str, caption: &str) {
        self.figures += 1;
        let _ = writeln!(
            self.body,
            "<figure>{svg}<figcaption>Figure {}. {}</figcaption></figure>",
            self.figures,
            esc(caption)
        );
    }

    /// A definition list of label–value pairs.
    pub fn facts(&mut self, items: &[(&str, String)]) {
        self.body.push_str("<dl class=\"facts\">");
        for (k, v) in items {
            let _ = write!(self.body, "<dt>{}</dt><dd>{}</dd>", esc(k), esc(v));
        }
        self.body.push_str("</dl>\n");
    }
}

/// The style sheet. Content is at most 182 mm wide, which fits A4
/// (210 mm) and Letter (216 mm) with 14 mm side margins; the page size is
/// left to the printer (A4 or Letter). Every section starts a page, table
/// rows and figures are not split, table headers repeat on each page.
pub const CSS: &str = r#"
@page { margin: 14mm 14mm 16mm 14mm; }
* { box-sizing: border-box; }
html { font-family: "DejaVu Sans", "Liberation Sans", Arial, sans-serif; font-size: 9.5pt; color: #111; }
body { margin: 0 auto; max-width: 182mm; padding: 0; }
h1 { font-size: 18pt; margin: 0 0 2mm 0; }
h2 { font-size: 14pt; margin: 0 0 3mm 0; border-bottom: 0.4mm solid #0072B2; padding-bottom: 1mm; }
h3 { font-size: 11pt; margin: 4mm 0 1.5mm 0; break-after: avoid; }
p { margin: 1mm 0 2mm 0; line-height: 1.35; }
p.note { font-size: 8.5pt; color: #333; }
p.caution { border-left: 1.2mm solid #D55E00; padding: 1mm 2mm; background: #fff4ec; }
table { border-collapse: collapse; width: auto; max-width: 100%; margin: 1mm 0 4mm 0; font-size: 8pt; }
caption { caption-side: top; text-align: left; font-weight: bold; font-size: 8.5pt; padding-bottom: 1mm; }
th, td { border: 0.2mm solid #999; padding: 0.6mm 1.2mm; vertical-align: top; }
th { background: #e8eef4; font-weight: bold; text-align: left; }
td.n { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
tr { break-inside: avoid; page-break-inside: avoid; }
thead { display: table-header-group; }
div.keep { break-inside: avoid; page-break-inside: avoid; }
figure { margin: 2mm 0 5mm 0; break-inside: avoid; page-break-inside: avoid; }
figure svg { width: 100%; height: auto; display: block; }
figcaption { font-size: 8.5pt; font-weight: bold; margin-top: 1mm; }
dl.facts { display: grid; grid-template-columns: 48mm 1fr; gap: 0.6mm 3mm; margin: 1mm 0 3mm 0; }
dl.facts dt { font-weight: bold; }
dl.facts dd { margin: 0; }
section.report-section { break-before: page; page-break-before: always; }
section.report-section:first-of-type { break-before: auto; page-break-before: auto; }
.title { margin-bottom: 4mm; }
.subtitle { color: #333; }
ol.toc { columns: 2; font-size: 9pt; margin: 1mm 0 3mm 0; }
@media screen {
  body { padding: 8mm 0; }
  section.report-section { border-top: 1px dashed #bbb; padding-top: 6mm; margin-top: 8mm; }
  section.report-section:first-of-type { border-top: none; margin-top: 0; }
}
"#;
