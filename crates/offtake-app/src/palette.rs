//! Colours: a colour-blind-safe qualitative palette and a stable colour per id.
//!
//! Source: Okabe, M. and Ito, K. (2008), "Color Universal Design (CUD) — How
//! to make figures and presentations that are friendly to colorblind people",
//! J*FLY, <https://jfly.uni-koeln.de/color/> (eight colours; black is left out
//! here because it vanishes on the dark theme). Hex values as published there
//! (from memory; checked against the commonly reproduced table).
//!
//! A crop (or block) keeps its colour everywhere: the colour is picked from
//! the palette by a stable hash of its id, never by its position in a list.
//! Design and capacity lines are told apart by dash as well as colour
//! ([`DESIGN_FLOW_STYLE`], [`CAPACITY_STYLE`]).

use egui::Color32;
use egui_plot::LineStyle;

/// Okabe–Ito (2008) qualitative colours without black, in their published order.
pub const OKABE_ITO: [Color32; 7] = [
    Color32::from_rgb(0xE6, 0x9F, 0x00), // orange
    Color32::from_rgb(0x56, 0xB4, 0xE9), // sky blue
    Color32::from_rgb(0x00, 0x9E, 0x73), // bluish green
    Color32::from_rgb(0xF0, 0xE4, 0x42), // yellow
    Color32::from_rgb(0x00, 0x72, 0xB2), // blue
    Color32::from_rgb(0xD5, 0x5E, 0x00), // vermillion
    Color32::from_rgb(0xCC, 0x79, 0xA7), // reddish purple
];

/// Colour of a design-flow line: vermillion.
pub const DESIGN_FLOW: Color32 = OKABE_ITO[5];
/// Dash of a design-flow line (long dashes).
pub const DESIGN_FLOW_STYLE: LineStyle = LineStyle::Dashed { length: 10.0 };
/// Colour of an existing-capacity line: blue.
pub const CAPACITY: Color32 = OKABE_ITO[4];
/// Dash of an existing-capacity line (dots).
pub const CAPACITY_STYLE: LineStyle = LineStyle::Dotted { spacing: 6.0 };

/// FNV-1a 64-bit hash: stable across runs, platforms and Rust versions,
/// unlike `std`'s hasher. Fowler, Noll and Vo, "FNV hash" (IETF draft
/// draft-eastlake-fnv), offset basis and prime as published there.
fn fnv1a_64(bytes: &[u8]) -> u64 {
    const OFFSET_BASIS: u64 = 0xcbf2_9ce4_8422_2325;
    const PRIME: u64 = 0x0000_0100_0000_01b3;
    bytes
        .iter()
        .fold(OFFSET_BASIS, |h, &b| (h ^ u64::from(b)).wrapping_mul(PRIME))
}

/// The stable colour of a crop, block or scenario id.
pub fn colour_for_id(id: &str) -> Color32 {
    let index = (fnv1a_64(id.as_bytes()) % OKABE_ITO.len() as u64) as usize;
    OKABE_ITO[index]
}

#[cfg(test)]
mod tests {
    use super::{OKABE_ITO, colour_for_id, fnv1a_64};

    #[test]
    fn fnv1a_matches_published_test_vectors() {
        // Test vectors of the FNV reference (draft-eastlake-fnv, FNV-1a 64).
        assert_eq!(fnv1a_64(b""), 0xcbf2_9ce4_8422_2325);
        assert_eq!(fnv1a_64(b"a"), 0xaf63_dc4c_8601_ec8c);
    }

    #[test]
    fn colour_is_stable_and_from_palette() {
        let a = colour_for_id("maize");
        assert_eq!(a, colour_for_id("maize"));
        assert!(OKABE_ITO.contains(&a));
    }
}
