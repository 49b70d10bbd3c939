//! Colours: a colour-blind-safe qualitative palette and a stable colour per id.
//!
//! Source: Okabe, M. and Ito, K. (2008), "Color Universal Design (CUD) — How
//! to make figures and presentations that are friendly to colorblind people",
//! J*FLY, <https://jfly.uni-koeln.de/color/> (eight colours; black is left out
//! here because it vanishes on the dark theme). Hex values as published there
//! (from memory; checked against the commonly reproduced table).
//!
//! A crop (or block) keeps its colour everywhere: [`Colours`] gives each id of
//! a set (the project's crops, the scheme's blocks) a slot picked by a stable
//! hash of the id, moving to the next free slot when two ids would share one,
//! so no two series of a plot share a colour while the set has at most
//! [`PALETTE_SLOTS`] ids. The assignment depends on the set, never on the
//! order of a list.
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

/// Slots of the extended palette: the seven Okabe–Ito colours, then the
/// same seven lightened, then darkened (our own extension for sets larger
/// than the published palette; the hue stays the reader's first cue).
pub const PALETTE_SLOTS: usize = 3 * OKABE_ITO.len();

/// The base-palette slot an id hashes to.
fn home_slot(id: &str) -> usize {
    (fnv1a_64(id.as_bytes()) % OKABE_ITO.len() as u64) as usize
}

fn slot_colour(slot: usize) -> Color32 {
    let n = OKABE_ITO.len();
    let base = OKABE_ITO[slot % n];
    match (slot / n) % 3 {
        0 => base,
        1 => base.lerp_to_gamma(Color32::WHITE, 0.45),
        _ => base.lerp_to_gamma(Color32::BLACK, 0.4),
    }
}

/// Distinct, stable colours for a set of ids (crops, blocks, canals, seasons).
#[derive(Debug, Clone, Default)]
pub struct Colours {
    by_id: std::collections::HashMap<String, Color32>,
}

impl Colours {
    /// Assigns colours to `ids` (duplicates ignored). Ids are taken in sorted
    /// order; each takes the slot of its hash in the base palette or the
    /// next free one, then the lightened and darkened tiers; beyond
    /// [`PALETTE_SLOTS`] ids colours repeat.
    pub fn for_ids<I, S>(ids: I) -> Self
    where
        I: IntoIterator<Item = S>,
        S: AsRef<str>,
    {
        let mut sorted: Vec<String> = ids.into_iter().map(|s| s.as_ref().to_owned()).collect();
        sorted.sort();
        sorted.dedup();
        let n = OKABE_ITO.len();
        let mut taken = [false; PALETTE_SLOTS];
        let mut by_id = std::collections::HashMap::with_capacity(sorted.len());
        for id in sorted {
            let home = home_slot(&id);
            let free = (0..PALETTE_SLOTS)
                .map(|k| (k / n) * n + (home + k) % n)
                .find(|&slot| !taken[slot]);
            let slot = free.unwrap_or(home);
            if let Some(t) = taken.get_mut(slot) {
                *t = true;
            }
            by_id.insert(id, slot_colour(slot));
        }
        Self { by_id }
    }

    /// The colour of `id`; an id outside the set gets its hash's base colour.
    pub fn of(&self, id: &str) -> Color32 {
        self.by_id
            .get(id)
            .copied()
            .unwrap_or_else(|| OKABE_ITO[home_slot(id)])
    }
}

#[cfg(test)]
mod tests {
    use super::{Colours, OKABE_ITO, PALETTE_SLOTS, fnv1a_64};

    #[test]
    fn fnv1a_matches_published_test_vectors() {
        // Test vectors of the FNV reference (draft-eastlake-fnv, FNV-1a 64).
        assert_eq!(fnv1a_64(b""), 0xcbf2_9ce4_8422_2325);
        assert_eq!(fnv1a_64(b"a"), 0xaf63_dc4c_8601_ec8c);
    }

    #[test]
    fn colours_are_stable_distinct_and_independent_of_order() {
        let crops = [
            "cotton",
            "dry-bean",
            "maize-grain",
            "onion-dry",
            "potato",
            "rice-paddy",
            "sorghum-grain",
            "tomato",
            "wheat-spring",
        ];
        let a = Colours::for_ids(crops);
        let mut reversed = crops;
        reversed.reverse();
        let b = Colours::for_ids(reversed);
        let mut seen = std::collections::HashSet::new();
        for c in crops {
            assert_eq!(a.of(c), b.of(c), "{c}: same colour whatever the order");
            assert!(seen.insert(a.of(c).to_array()), "{c}: colour already used");
        }
        // A set within the published palette uses only its colours.
        let small = Colours::for_ids(["cotton", "tomato", "potato"]);
        assert!(OKABE_ITO.contains(&small.of("cotton")));
    }

    #[test]
    fn every_slot_is_used_before_colours_repeat() {
        let ids: Vec<String> = (0..PALETTE_SLOTS).map(|i| format!("block-{i}")).collect();
        let c = Colours::for_ids(&ids);
        let distinct: std::collections::HashSet<[u8; 4]> =
            ids.iter().map(|id| c.of(id).to_array()).collect();
        assert_eq!(distinct.len(), PALETTE_SLOTS);
    }
}
