//! A canal section for a flow, with its checks, and the nearest section
//! that passes when a check fails; the capacity of an existing section.

use serde::{Deserialize, Serialize};

use super::freeboard::usbr_freeboard_m;
use super::geometry::{Prism, Shape};
use super::lacey::{REGIME_SIDE_SLOPE_H_PER_V, regime_section};
use super::manning::{MANNING_K_SI, manning_discharge_m3s, normal_depth_m};
use super::roughness::Lining;
use super::velocity::{MAX_FROUDE, froude_number, max_permissible_velocity_ms};
use super::{SectionError, check_prism, positive};

/// How the bed width is set.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub enum Width {
    /// A given bed width (m).
    BedWidthM(f64),
    /// A bed-width-to-depth ratio b / y.
    Ratio(f64),
}

/// How the section is found.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub enum Method {
    /// Normal depth by Manning (1891).
    Manning,
    /// Lacey (1930) regime method with this silt factor.
    LaceyRegime {
        /// Lacey's silt factor f.
        silt_factor: f64,
    },
}

/// What to design: flow, slope, roughness, shape and the limits to check.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DesignRequest {
    /// Flow to carry (m³/s).
    pub flow_m3s: f64,
    /// Bed slope (m/m). With the regime method this is the ground slope
    /// the regime slope is compared with.
    pub bed_slope: f64,
    /// Manning n.
    pub manning_n: f64,
    /// Section shape (the regime method always gives a ½:1 trapezoid).
    pub shape: Shape,
    /// Side slope z (H per V); ignored for a rectangle.
    pub side_slope_h_per_v: f64,
    /// Bed width, given or by ratio; ignored for a triangle.
    pub width: Width,
    /// Freeboard (m); `None` for the USBR rule.
    pub freeboard_m: Option<f64>,
    /// Lining or soil: sets the maximum velocity and what a proposal may
    /// change. `None` checks no maximum velocity.
    pub lining: Option<Lining>,
    /// Water carries colloidal silts (the higher Fortier–Scobey column).
    pub colloidal_silt: bool,
    /// Minimum non-silting velocity (m/s); 0 checks none.
    pub min_velocity_ms: f64,
    /// Method.
    pub method: Method,
}

/// Which check.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum CheckKind {
    /// Velocity at or below the material's maximum permissible velocity.
    MaxVelocity,
    /// Velocity at or above the minimum non-silting velocity.
    MinVelocity,
    /// Froude number at or below [`MAX_FROUDE`].
    Froude,
    /// Existing section: required flow within its capacity.
    Capacity,
    /// Existing section: bank above the water by at least the freeboard rule.
    Freeboard,
    /// Regime method: ground slope equal to the regime slope.
    RegimeSlope,
}

impl CheckKind {
    /// Short name used in `checks` columns and `key=value` output.
    #[must_use]
    pub fn as_str(self) -> &'static str {
        match self {
            CheckKind::MaxVelocity => "max_velocity",
            CheckKind::MinVelocity => "min_velocity",
            CheckKind::Froude => "froude",
            CheckKind::Capacity => "capacity",
            CheckKind::Freeboard => "freeboard",
            CheckKind::RegimeSlope => "regime_slope",
        }
    }
}

/// One check: value, limit, pass or fail, and where the limit comes from.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Check {
    /// Which check.
    pub kind: CheckKind,
    /// The section's value.
    pub value: f64,
    /// The limit.
    pub limit: f64,
    /// True when the value is within the limit.
    pub pass: bool,
    /// Source of the limit.
    pub source: &'static str,
}

/// A section at its flow: dimensions, hydraulics and checks.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SectionResult {
    /// Method used (Manning or regime).
    pub method: Method,
    /// The prism (shape, bed width, side slope).
    pub prism: Prism,
    /// Flow (m³/s).
    pub flow_m3s: f64,
    /// Water depth at the flow (m).
    pub water_depth_m: f64,
    /// Freeboard (m).
    pub freeboard_m: f64,
    /// Where the freeboard comes from.
    pub freeboard_source: &'static str,
    /// Flow area (m²).
    pub area_m2: f64,
    /// Wetted perimeter (m).
    pub wetted_perimeter_m: f64,
    /// Width at the water surface (m).
    pub top_width_m: f64,
    /// Width at the top of the banks (water depth + freeboard) (m).
    pub bank_top_width_m: f64,
    /// Hydraulic radius (m).
    pub hydraulic_radius_m: f64,
    /// Mean velocity Q / A (m/s).
    pub velocity_ms: f64,
    /// Froude number.
    pub froude: f64,
    /// Manning n.
    pub manning_n: f64,
    /// Bed slope (m/m): the given slope, or the regime slope.
    pub bed_slope: f64,
    /// Regime method only: the ground slope given.
    pub ground_slope: Option<f64>,
    /// The checks.
    pub checks: Vec<Check>,
}

impl SectionResult {
    /// True when every check passes.
    #[must_use]
    pub fn passes(&self) -> bool {
        self.checks.iter().all(|c| c.pass)
    }

    /// Short text listing failed checks (`max_velocity 1.02>0.76; froude
    /// …`); empty when all pass.
    #[must_use]
    pub fn failed_text(&self) -> String {
        self.checks
            .iter()
            .filter(|c| !c.pass)
            .map(|c| {
                let op = match c.kind {
                    CheckKind::MinVelocity | CheckKind::Freeboard => "<",
                    CheckKind::RegimeSlope => "!=",
                    _ => ">",
                };
                format!("{} {:.3}{op}{:.3}", c.kind.as_str(), c.value, c.limit)
            })
            .collect::<Vec<_>>()
            .join("; ")
    }
}

fn validate(req: &DesignRequest) -> Result<(), SectionError> {
    positive("flow (m³/s)", req.flow_m3s)?;
    positive("bed slope (m/m)", req.bed_slope)?;
    positive("Manning n", req.manning_n)?;
    super::non_negative("side slope (H per V)", req.side_slope_h_per_v)?;
    super::non_negative("minimum velocity (m/s)", req.min_velocity_ms)?;
    if let Some(f) = req.freeboard_m {
        super::non_negative("freeboard (m)", f)?;
    }
    match req.width {
        Width::BedWidthM(b) => super::non_negative("bed width (m)", b)?,
        Width::Ratio(r) => super::non_negative("bed-width-to-depth ratio", r)?,
    }
    Ok(())
}

/// Depth for a bed-width-to-depth ratio r in closed form: with b = r y,
/// A = (r + z) y² and P = (r + 2√(1+z²)) y, so Manning gives
/// y = [Q n (r + 2√(1+z²))^(2/3) / (√S (r + z)^(5/3))]^(3/8).
fn depth_for_ratio(q: f64, n: f64, s: f64, r: f64, z: f64) -> f64 {
    let side = 2.0 * (1.0 + z * z).sqrt();
    (q * n * (r + side).powf(2.0 / 3.0) / (s.sqrt() * (r + z).powf(5.0 / 3.0))).powf(3.0 / 8.0)
}

/// Designs the section for `req` and checks it.
///
/// # Errors
/// [`SectionError`] for invalid input (flow, slope or n not positive;
/// negative widths or slopes; a rectangle of ratio 0; a triangle with
/// vertical sides) or when no depth carries the flow.
pub fn design_section(req: &DesignRequest) -> Result<SectionResult, SectionError> {
    validate(req)?;
    let (prism, depth, slope, ground) = match req.method {
        Method::Manning => {
            let (prism, depth) = match (req.shape, req.width) {
                (Shape::Triangular, _) => {
                    let p = Prism::new(Shape::Triangular, 0.0, req.side_slope_h_per_v);
                    check_prism(&p)?;
                    (
                        p,
                        normal_depth_m(
                            &p,
                            req.flow_m3s,
                            req.bed_slope,
                            req.manning_n,
                            MANNING_K_SI,
                        )?,
                    )
                }
                (shape, Width::BedWidthM(b)) => {
                    let p = Prism::new(shape, b, req.side_slope_h_per_v);
                    check_prism(&p)?;
                    (
                        p,
                        normal_depth_m(
                            &p,
                            req.flow_m3s,
                            req.bed_slope,
                            req.manning_n,
                            MANNING_K_SI,
                        )?,
                    )
                }
                (shape, Width::Ratio(r)) => {
                    let probe = Prism::new(shape, r, req.side_slope_h_per_v);
                    check_prism(&probe)?;
                    let z = probe.side_slope_h_per_v;
                    let y = depth_for_ratio(req.flow_m3s, req.manning_n, req.bed_slope, r, z);
                    (Prism::new(shape, r * y, z), y)
                }
            };
            (prism, depth, req.bed_slope, None)
        }
        Method::LaceyRegime { silt_factor } => {
            let reg = regime_section(req.flow_m3s, silt_factor)?;
            let p = Prism::new(
                Shape::Trapezoidal,
                reg.bed_width_m,
                REGIME_SIDE_SLOPE_H_PER_V,
            );
            (p, reg.depth_m, reg.slope, Some(req.bed_slope))
        }
    };
    let (freeboard, fb_source) = match req.freeboard_m {
        Some(f) => (f, "given"),
        None => (
            usbr_freeboard_m(depth, req.flow_m3s),
            "USBR F = sqrt(C y), as in Chow 1959 (from memory)",
        ),
    };
    let n = match req.method {
        Method::Manning => req.manning_n,
        // The regime section's own roughness is implied by its velocity;
        // report the n that makes Manning agree with it.
        Method::LaceyRegime { .. } => {
            prism.area_m2(depth) * prism.hydraulic_radius_m(depth).powf(2.0 / 3.0) * slope.sqrt()
                / req.flow_m3s
        }
    };
    let mut result = build(
        req.method,
        prism,
        req.flow_m3s,
        depth,
        freeboard,
        fb_source,
        n,
        slope,
    );
    result.ground_slope = ground;
    result.checks = velocity_checks(&result, req);
    if let Some(g) = ground {
        result.checks.push(Check {
            kind: CheckKind::RegimeSlope,
            value: g,
            limit: slope,
            pass: (g - slope).abs() <= 0.1 * slope,
            source: "Lacey 1930 regime slope (within 10 %: common practice)",
        });
    }
    Ok(result)
}

#[expect(
    clippy::too_many_arguments,
    reason = "one plain constructor of the result record"
)]
fn build(
    method: Method,
    prism: Prism,
    flow_m3s: f64,
    depth: f64,
    freeboard: f64,
    fb_source: &'static str,
    n: f64,
    slope: f64,
) -> SectionResult {
    let area = prism.area_m2(depth);
    let velocity = flow_m3s / area;
    SectionResult {
        method,
        prism,
        flow_m3s,
        water_depth_m: depth,
        freeboard_m: freeboard,
        freeboard_source: fb_source,
        area_m2: area,
        wetted_perimeter_m: prism.wetted_perimeter_m(depth),
        top_width_m: prism.top_width_m(depth),
        bank_top_width_m: prism.top_width_m(depth + freeboard),
        hydraulic_radius_m: prism.hydraulic_radius_m(depth),
        velocity_ms: velocity,
        froude: froude_number(velocity, prism.hydraulic_depth_m(depth)),
        manning_n: n,
        bed_slope: slope,
        ground_slope: None,
        checks: Vec::new(),
    }
}

fn velocity_checks(r: &SectionResult, req: &DesignRequest) -> Vec<Check> {
    let mut checks = Vec::new();
    if let Some(lining) = req.lining {
        let (vmax, source) = max_permissible_velocity_ms(lining, req.colloidal_silt);
        checks.push(Check {
            kind: CheckKind::MaxVelocity,
            value: r.velocity_ms,
            limit: vmax,
            pass: r.velocity_ms <= vmax,
            source,
        });
    }
    if req.min_velocity_ms > 0.0 {
        checks.push(Check {
            kind: CheckKind::MinVelocity,
            value: r.velocity_ms,
            limit: req.min_velocity_ms,
            pass: r.velocity_ms >= req.min_velocity_ms,
            source: "minimum non-silting velocity, Chow 1959 §7-3 (from memory)",
        });
    }
    checks.push(Check {
        kind: CheckKind::Froude,
        value: r.froude,
        limit: MAX_FROUDE,
        pass: r.froude <= MAX_FROUDE,
        source: "subcritical, away from Fr = 1 (common practice)",
    });
    checks
}

/// A section that passes every check, and what was changed to get it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Proposal {
    /// What changed, in words (`wider: bed width 2.40 m`, …).
    pub change: String,
    /// The request that gives it.
    #[serde(skip)]
    pub request: DesignRequest,
    /// The passing section.
    pub section: SectionResult,
}

/// The nearest section that passes every check when `result` (designed
/// from `req`) fails one: wider or narrower beds, flatter side slopes, and
/// last a concrete lining, scored by how far each is from the request.
/// `None` when `result` passes, for the regime method (whose section is
/// fixed by the flow and silt), or when no candidate passes.
#[must_use]
pub fn propose(req: &DesignRequest, result: &SectionResult) -> Option<Proposal> {
    if result.passes() || !matches!(req.method, Method::Manning) {
        return None;
    }
    let ratio0 = if result.water_depth_m > 0.0 {
        result.prism.bed_width_m / result.water_depth_m
    } else {
        0.0
    };
    let z0 = result.prism.side_slope_h_per_v;
    let shape0 = req.shape;
    let mut best: Option<(f64, Proposal)> = None;
    let ratios: Vec<f64> = (0..=60).map(|i| 0.25 * f64::from(i)).collect();
    let slopes: Vec<f64> = if shape0 == Shape::Rectangular {
        vec![0.0]
    } else {
        (0..=8)
            .map(|i| 0.5 * f64::from(i))
            .filter(|z| *z >= z0 - 1e-9)
            .collect()
    };
    let mut linings = vec![req.lining];
    if req.lining.is_some_and(|l| !l.is_lined()) {
        linings.push(Some(Lining::Concrete));
    }
    for lining in linings {
        let lining_changed = lining != req.lining;
        for &z in &slopes {
            for &r in &ratios {
                let shape = if shape0 == Shape::Triangular && r > 0.0 {
                    Shape::Trapezoidal
                } else {
                    shape0
                };
                if shape == Shape::Rectangular && r <= 0.0 {
                    continue;
                }
                if shape == Shape::Trapezoidal && r <= 0.0 && z <= 0.0 {
                    continue;
                }
                let cand = DesignRequest {
                    shape,
                    side_slope_h_per_v: z,
                    width: Width::Ratio(r),
                    lining,
                    manning_n: if lining_changed {
                        lining.map_or(req.manning_n, Lining::manning_n)
                    } else {
                        req.manning_n
                    },
                    ..*req
                };
                let Ok(sec) = design_section(&cand) else {
                    continue;
                };
                if !sec.passes() {
                    continue;
                }
                let score = (ratio_distance(r, ratio0))
                    + (z - z0).abs()
                    + if lining_changed { 10.0 } else { 0.0 };
                if best.as_ref().is_none_or(|(s, _)| score < *s) {
                    let change = describe(&sec, ratio0, z0, lining_changed, lining);
                    best = Some((
                        score,
                        Proposal {
                            change,
                            request: cand,
                            section: sec,
                        },
                    ));
                }
            }
        }
    }
    best.map(|(_, p)| p)
}

fn ratio_distance(r: f64, r0: f64) -> f64 {
    ((r + 0.5) / (r0 + 0.5)).ln().abs()
}

fn describe(
    sec: &SectionResult,
    ratio0: f64,
    z0: f64,
    lined: bool,
    lining: Option<Lining>,
) -> String {
    let mut parts = Vec::new();
    let ratio = sec.prism.bed_width_m / sec.water_depth_m;
    if lined {
        parts.push(format!(
            "lined: {} (n {:.3})",
            lining.map_or("lined", Lining::label),
            sec.manning_n
        ));
    }
    if ratio > ratio0 + 1e-6 {
        parts.push(format!("wider: bed width {:.2} m", sec.prism.bed_width_m));
    } else if ratio < ratio0 - 1e-6 {
        parts.push(format!(
            "narrower: bed width {:.2} m",
            sec.prism.bed_width_m
        ));
    }
    if sec.prism.side_slope_h_per_v > z0 + 1e-6 {
        parts.push(format!(
            "flatter side slope {:.1}:1",
            sec.prism.side_slope_h_per_v
        ));
    }
    if parts.is_empty() {
        parts.push("same section".into());
    }
    parts.join(", ")
}

/// A section that is built: shape, dimensions, roughness and slope.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct ExistingSection {
    /// Shape, bed width and side slope.
    pub prism: Prism,
    /// Full-supply water depth the canal is run at (m).
    pub full_supply_depth_m: f64,
    /// Bank height above the bed (m), if surveyed.
    pub bank_height_m: Option<f64>,
    /// Manning n.
    pub manning_n: f64,
    /// Bed slope (m/m).
    pub bed_slope: f64,
}

impl ExistingSection {
    /// Capacity by Manning at the full-supply depth (m³/s).
    ///
    /// # Errors
    /// [`SectionError`] for a section whose dimensions, n or slope are not
    /// valid.
    pub fn capacity_m3s(&self) -> Result<f64, SectionError> {
        check_prism(&self.prism)?;
        positive("full-supply depth (m)", self.full_supply_depth_m)?;
        positive("Manning n", self.manning_n)?;
        positive("bed slope (m/m)", self.bed_slope)?;
        if let Some(h) = self.bank_height_m {
            positive("bank height (m)", h)?;
        }
        Ok(manning_discharge_m3s(
            &self.prism,
            self.full_supply_depth_m,
            self.bed_slope,
            self.manning_n,
            MANNING_K_SI,
        ))
    }
}

/// Checks an existing section carrying `flow_m3s`: the water depth at that
/// flow by Manning, the capacity check (flow within the capacity at full
/// supply), the freeboard left by the banks against the USBR rule (when a
/// bank height is given), and the velocity and Froude checks.
///
/// # Errors
/// As [`ExistingSection::capacity_m3s`], and for a flow that is not
/// positive.
pub fn check_existing(
    existing: &ExistingSection,
    flow_m3s: f64,
    lining: Option<Lining>,
    colloidal_silt: bool,
    min_velocity_ms: f64,
) -> Result<SectionResult, SectionError> {
    let capacity = existing.capacity_m3s()?;
    positive("flow (m³/s)", flow_m3s)?;
    let depth = normal_depth_m(
        &existing.prism,
        flow_m3s,
        existing.bed_slope,
        existing.manning_n,
        MANNING_K_SI,
    )?;
    let rule = usbr_freeboard_m(depth, flow_m3s);
    let (freeboard, fb_source) = match existing.bank_height_m {
        Some(h) => (h - depth, "bank height less water depth"),
        None => (rule, "USBR F = sqrt(C y), as in Chow 1959 (from memory)"),
    };
    let mut r = build(
        Method::Manning,
        existing.prism,
        flow_m3s,
        depth,
        freeboard,
        fb_source,
        existing.manning_n,
        existing.bed_slope,
    );
    let req = DesignRequest {
        flow_m3s,
        bed_slope: existing.bed_slope,
        manning_n: existing.manning_n,
        shape: existing.prism.shape,
        side_slope_h_per_v: existing.prism.side_slope_h_per_v,
        width: Width::BedWidthM(existing.prism.bed_width_m),
        freeboard_m: None,
        lining,
        colloidal_silt,
        min_velocity_ms,
        method: Method::Manning,
    };
    let mut checks = vec![Check {
        kind: CheckKind::Capacity,
        value: flow_m3s,
        limit: capacity,
        pass: flow_m3s <= capacity * (1.0 + 1e-9),
        source: "Manning 1891 capacity at full-supply depth",
    }];
    if existing.bank_height_m.is_some() {
        checks.push(Check {
            kind: CheckKind::Freeboard,
            value: freeboard,
            limit: rule,
            pass: freeboard >= rule,
            source: "USBR F = sqrt(C y), as in Chow 1959 (from memory)",
        });
    }
    checks.extend(velocity_checks(&r, &req));
    r.checks = checks;
    Ok(r)
}
