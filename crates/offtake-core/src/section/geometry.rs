//! Geometry of prismatic canal sections: flow area, wetted perimeter, top
//! width, hydraulic radius and hydraulic depth at a water depth.
//!
//! # Units
//! Lengths in metres, areas in m²; the side slope `z` is horizontal per
//! vertical (z H : 1 V). Formulas as tabulated in Chow (1959),
//! *Open-Channel Hydraulics*, Table 2-1 (geometric elements of channel
//! sections).

use serde::{Deserialize, Serialize};

/// Shape of a canal's cross-section.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum Shape {
    /// Flat bed and two equal sloping sides.
    #[default]
    Trapezoidal,
    /// Flat bed and vertical sides (side slope 0).
    Rectangular,
    /// Two equal sloping sides meeting at a point (bed width 0).
    Triangular,
}

impl Shape {
    /// The name used in files and on the command line.
    #[must_use]
    pub fn as_str(self) -> &'static str {
        match self {
            Shape::Trapezoidal => "trapezoidal",
            Shape::Rectangular => "rectangular",
            Shape::Triangular => "triangular",
        }
    }

    /// Parses `trapezoidal`, `rectangular` or `triangular`.
    #[must_use]
    pub fn parse(text: &str) -> Option<Shape> {
        match text.trim().to_ascii_lowercase().as_str() {
            "trapezoidal" => Some(Shape::Trapezoidal),
            "rectangular" => Some(Shape::Rectangular),
            "triangular" => Some(Shape::Triangular),
            _ => None,
        }
    }
}

/// A prismatic section without its water depth: bed width and side slope
/// as the shape uses them (a rectangle has side slope 0, a triangle bed
/// width 0).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Prism {
    /// Shape of the section.
    pub shape: Shape,
    /// Bed width (m); 0 for a triangle.
    pub bed_width_m: f64,
    /// Side slope z (horizontal per vertical); 0 for a rectangle.
    pub side_slope_h_per_v: f64,
}

impl Prism {
    /// A section of `shape`; the bed width is ignored for a triangle and the
    /// side slope for a rectangle.
    #[must_use]
    pub fn new(shape: Shape, bed_width_m: f64, side_slope_h_per_v: f64) -> Prism {
        let (b, z) = match shape {
            Shape::Trapezoidal => (bed_width_m, side_slope_h_per_v),
            Shape::Rectangular => (bed_width_m, 0.0),
            Shape::Triangular => (0.0, side_slope_h_per_v),
        };
        Prism {
            shape,
            bed_width_m: b,
            side_slope_h_per_v: z,
        }
    }

    /// Flow area A = (b + z y) y (m²); Chow 1959 Table 2-1.
    #[must_use]
    pub fn area_m2(&self, depth_m: f64) -> f64 {
        (self.bed_width_m + self.side_slope_h_per_v * depth_m) * depth_m
    }

    /// Wetted perimeter P = b + 2 y √(1 + z²) (m); Chow 1959 Table 2-1.
    #[must_use]
    pub fn wetted_perimeter_m(&self, depth_m: f64) -> f64 {
        let z = self.side_slope_h_per_v;
        self.bed_width_m + 2.0 * depth_m * (1.0 + z * z).sqrt()
    }

    /// Top width T = b + 2 z y (m); Chow 1959 Table 2-1.
    #[must_use]
    pub fn top_width_m(&self, depth_m: f64) -> f64 {
        self.bed_width_m + 2.0 * self.side_slope_h_per_v * depth_m
    }

    /// Hydraulic radius R = A / P (m); Chow 1959 Table 2-1.
    #[must_use]
    pub fn hydraulic_radius_m(&self, depth_m: f64) -> f64 {
        self.area_m2(depth_m) / self.wetted_perimeter_m(depth_m)
    }

    /// Hydraulic depth D = A / T (m); Chow 1959 Table 2-1.
    #[must_use]
    pub fn hydraulic_depth_m(&self, depth_m: f64) -> f64 {
        self.area_m2(depth_m) / self.top_width_m(depth_m)
    }
}
