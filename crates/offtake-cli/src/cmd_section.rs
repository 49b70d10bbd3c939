//! `offtake section`: one canal section, headless.
//!
//! `offtake section --flow-m3s Q --slope S --n N [--side-slope Z]
//! [--bed-width M | --width-ratio R] [--shape trapezoidal|rectangular|triangular]
//! [--freeboard M] [--method manning|regime --silt-factor F]`
//! prints the normal depth and the section's quantities as `key=value`
//! lines. Impossible input (slope ≤ 0, n ≤ 0, flow ≤ 0, …) exits non-zero
//! with the reason.

use std::fmt::Write as _;

use anyhow::{Context, Result, bail};
use clap::ValueEnum;
use offtake_core::section::velocity::MIN_NON_SILTING_VELOCITY_MS;
use offtake_core::section::{
    DesignRequest, Lining, Method, SectionResult, Shape, Width, design_section, propose,
};

/// Default bed-width-to-depth ratio when neither a bed width nor a ratio is
/// given (common practice for small and medium irrigation canals).
pub const DEFAULT_WIDTH_RATIO: f64 = 2.0;

/// Default side slope without a lining (1½ H : 1 V, firm earth; Chow 1959
/// Table 7-2, from memory).
pub const DEFAULT_SIDE_SLOPE: f64 = 1.5;

#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum ShapeArg {
    Trapezoidal,
    Rectangular,
    Triangular,
}

#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum MethodArg {
    Manning,
    Regime,
}

#[derive(Debug, clap::Args)]
pub struct Args {
    /// Flow the section must carry (m³/s).
    #[arg(long = "flow-m3s", value_name = "Q", allow_negative_numbers = true)]
    flow_m3s: f64,
    /// Bed slope (m/m). With --method regime: the ground slope, compared
    /// with the regime slope.
    #[arg(long, value_name = "S", allow_negative_numbers = true)]
    slope: f64,
    /// Manning n (s m^-1/3). Required for --method manning.
    #[arg(long, value_name = "N", allow_negative_numbers = true)]
    n: Option<f64>,
    /// Side slope, horizontal per vertical (default: the lining's, else 1.5).
    #[arg(long = "side-slope", value_name = "Z", allow_negative_numbers = true)]
    side_slope: Option<f64>,
    /// Bed width (m).
    #[arg(
        long = "bed-width",
        value_name = "M",
        conflicts_with = "width_ratio",
        allow_negative_numbers = true
    )]
    bed_width: Option<f64>,
    /// Bed-width-to-depth ratio b/y (default 2).
    #[arg(long = "width-ratio", value_name = "R", allow_negative_numbers = true)]
    width_ratio: Option<f64>,
    /// Section shape.
    #[arg(long, value_enum, default_value = "trapezoidal")]
    shape: ShapeArg,
    /// Freeboard (m); default: the USBR rule F = √(C y) converted to metres.
    #[arg(long, value_name = "M", allow_negative_numbers = true)]
    freeboard: Option<f64>,
    /// Manning normal depth, or Lacey's regime method for unlined alluvial canals.
    #[arg(long, value_enum, default_value = "manning")]
    method: MethodArg,
    /// Lacey's silt factor f (with --method regime).
    #[arg(long = "silt-factor", value_name = "F", allow_negative_numbers = true)]
    silt_factor: Option<f64>,
    /// Lining or soil, for the maximum-velocity check and proposals (concrete,
    /// brick-masonry, stone-masonry, earth-fine-sand, earth-sandy-loam,
    /// earth-silt-loam, earth-firm-loam, earth-stiff-clay, earth-fine-gravel,
    /// earth-coarse-gravel). Without it no maximum velocity is checked.
    #[arg(long, value_name = "ID")]
    lining: Option<String>,
    /// Minimum non-silting velocity (m/s); 0 skips the check.
    #[arg(long = "min-velocity-ms", value_name = "V", default_value_t = MIN_NON_SILTING_VELOCITY_MS)]
    min_velocity_ms: f64,
    /// Water carrying colloidal silts (Fortier and Scobey's second column).
    #[arg(long = "colloidal-silt")]
    colloidal_silt: bool,
}

fn request(args: &Args) -> Result<DesignRequest> {
    let lining = match &args.lining {
        None => None,
        Some(id) => Some(Lining::parse(id).with_context(|| {
            format!(
                "--lining {id}: not a known lining; expected one of {}",
                offtake_core::section::LININGS.map(Lining::id).join(", ")
            )
        })?),
    };
    let method = match args.method {
        MethodArg::Manning => Method::Manning,
        MethodArg::Regime => {
            let Some(f) = args.silt_factor else {
                bail!(
                    "--method regime needs --silt-factor F (Lacey's silt factor, e.g. 1.0 for medium silt)"
                );
            };
            if !(f.is_finite() && f > 0.0) {
                bail!("--silt-factor must be a positive number, got {f}");
            }
            Method::LaceyRegime { silt_factor: f }
        }
    };
    let manning_n = match (args.n, method) {
        (Some(n), _) => n,
        (None, Method::LaceyRegime { .. }) => 0.0225,
        (None, Method::Manning) => bail!("--n N (Manning n) is required with --method manning"),
    };
    if matches!(method, Method::LaceyRegime { .. })
        && (args.bed_width.is_some() || args.width_ratio.is_some() || args.side_slope.is_some())
    {
        bail!(
            "--method regime sets the bed width and side slope itself (½:1); leave out --bed-width, --width-ratio and --side-slope"
        );
    }
    let shape = match args.shape {
        ShapeArg::Trapezoidal => Shape::Trapezoidal,
        ShapeArg::Rectangular => Shape::Rectangular,
        ShapeArg::Triangular => Shape::Triangular,
    };
    let side_slope = args
        .side_slope
        .unwrap_or_else(|| lining.map_or(DEFAULT_SIDE_SLOPE, Lining::side_slope_h_per_v));
    let width = match (args.bed_width, args.width_ratio) {
        (Some(b), _) => Width::BedWidthM(b),
        (None, Some(r)) => Width::Ratio(r),
        (None, None) => Width::Ratio(DEFAULT_WIDTH_RATIO),
    };
    Ok(DesignRequest {
        flow_m3s: args.flow_m3s,
        bed_slope: args.slope,
        manning_n,
        shape,
        side_slope_h_per_v: side_slope,
        width,
        freeboard_m: args.freeboard,
        lining,
        colloidal_silt: args.colloidal_silt,
        min_velocity_ms: args.min_velocity_ms,
        method,
    })
}

/// The `key=value` lines of a section (without the trailing caution).
pub fn section_lines(out: &mut String, prefix: &str, s: &SectionResult) {
    let kv = |out: &mut String, k: &str, v: String| {
        let _ = writeln!(out, "{prefix}{k}={v}");
    };
    kv(out, "shape", s.prism.shape.as_str().to_string());
    kv(out, "flow_m3s", format!("{:.6}", s.flow_m3s));
    kv(out, "water_depth_m", format!("{:.4}", s.water_depth_m));
    kv(out, "bed_width_m", format!("{:.4}", s.prism.bed_width_m));
    kv(
        out,
        "side_slope_h_per_v",
        format!("{:.3}", s.prism.side_slope_h_per_v),
    );
    kv(out, "freeboard_m", format!("{:.4}", s.freeboard_m));
    kv(out, "freeboard_source", s.freeboard_source.to_string());
    kv(
        out,
        "total_depth_m",
        format!("{:.4}", s.water_depth_m + s.freeboard_m),
    );
    kv(out, "top_width_m", format!("{:.4}", s.top_width_m));
    kv(
        out,
        "bank_top_width_m",
        format!("{:.4}", s.bank_top_width_m),
    );
    kv(out, "area_m2", format!("{:.4}", s.area_m2));
    kv(
        out,
        "wetted_perimeter_m",
        format!("{:.4}", s.wetted_perimeter_m),
    );
    kv(
        out,
        "hydraulic_radius_m",
        format!("{:.4}", s.hydraulic_radius_m),
    );
    kv(out, "velocity_ms", format!("{:.4}", s.velocity_ms));
    kv(out, "froude", format!("{:.3}", s.froude));
    kv(out, "manning_n", format!("{:.4}", s.manning_n));
    kv(out, "bed_slope", format!("{:.7}", s.bed_slope));
    for c in &s.checks {
        let k = c.kind.as_str();
        kv(
            out,
            &format!("check_{k}"),
            if c.pass { "pass" } else { "fail" }.to_string(),
        );
        kv(out, &format!("check_{k}_value"), format!("{:.4}", c.value));
        kv(out, &format!("check_{k}_limit"), format!("{:.4}", c.limit));
        kv(out, &format!("check_{k}_source"), c.source.to_string());
    }
    kv(out, "checks", s.failed_text());
}

/// The regime slope against the ground slope, in words.
pub fn regime_verdict(regime_slope: f64, ground_slope: f64) -> String {
    if ground_slope > 1.1 * regime_slope {
        format!(
            "the ground is steeper than the regime slope: falls (drops) totalling about {:.2} m per km are needed to hold the bed at the regime slope",
            (ground_slope - regime_slope) * 1000.0
        )
    } else if ground_slope < regime_slope / 1.1 {
        "the ground is flatter than the regime slope: on this alignment the canal cannot be in regime and will silt; it needs another alignment, less silt at the head, or a section designed by Manning (lined or with silt control)".to_string()
    } else {
        "the ground slope is within 10 % of the regime slope: the canal can follow the ground"
            .to_string()
    }
}

/// The caution printed with every section.
pub const CAUTION: &str = "section sizes are preliminary planning estimates: structures, transitions, sediment, survey and local codes decide the final design, which a qualified engineer must check";

pub fn run(args: &Args) -> Result<()> {
    let req = request(args)?;
    let s = design_section(&req).context("cannot compute the section")?;
    let mut out = String::new();
    let method = match req.method {
        Method::Manning => "manning",
        Method::LaceyRegime { .. } => "regime (Lacey 1930)",
    };
    let _ = writeln!(out, "method={method}");
    section_lines(&mut out, "", &s);
    if let (Method::LaceyRegime { silt_factor }, Some(g)) = (req.method, s.ground_slope) {
        let _ = writeln!(out, "silt_factor={silt_factor:.3}");
        let _ = writeln!(out, "regime_slope={:.7}", s.bed_slope);
        let _ = writeln!(out, "regime_slope_one_in={:.0}", 1.0 / s.bed_slope);
        let _ = writeln!(out, "ground_slope={g:.7}");
        let _ = writeln!(out, "slope_verdict={}", regime_verdict(s.bed_slope, g));
    }
    if req.lining.is_none() {
        let _ = writeln!(
            out,
            "note=no --lining given: the maximum permissible velocity was not checked"
        );
    }
    if !s.passes() {
        match propose(&req, &s) {
            Some(p) => {
                let _ = writeln!(out, "proposal={}", p.change);
                section_lines(&mut out, "proposal_", &p.section);
            }
            None if matches!(req.method, Method::Manning) => {
                let _ = writeln!(
                    out,
                    "proposal=none: no wider, narrower, flatter or lined section of this shape passes at this slope; the slope itself must change (falls or drops, or another alignment)"
                );
            }
            None => {}
        }
    }
    let _ = writeln!(out, "caution={CAUTION}");
    print!("{out}");
    Ok(())
}
