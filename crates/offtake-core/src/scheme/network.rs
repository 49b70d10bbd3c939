//! The canal tree: canals with their parents and reach efficiencies, and the
//! blocks that take water from them.
//!
//! A [`Network`] is built once from plain [`Canal`] and [`Block`] records and
//! validated as a whole: every problem found is listed in one
//! [`SchemeError::Invalid`], never just the first.
//!
//! # Efficiencies (DESIGN.md, "Definitions we hold to")
//!
//! - field application efficiency Ea: root-zone storage ÷ water at the field;
//! - field-canal efficiency Eb: water at the fields ÷ water at the block outlet;
//! - conveyance efficiency Ec of each canal reach: water leaving the reach ÷
//!   water entering it at its head.
//!
//! The distribution efficiency is Eb × the product of the Ec along the path,
//! so the tree never divides by a lumped distribution efficiency as well.

use std::collections::{HashMap, HashSet};
use std::fmt;

use serde::{Deserialize, Serialize};

use super::SchemeError;

/// One canal of the tree (main, branch, distributary or minor).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Canal {
    /// Identifier, unique within the scheme; blocks and child canals refer to it.
    pub id: String,
    /// Display name.
    pub name: String,
    /// Identifier of the canal this one takes from; `None` for a main canal
    /// taking from the headworks.
    pub parent: Option<String>,
    /// Conveyance efficiency Ec of this canal's reach, a fraction in (0, 1].
    pub conveyance_efficiency: f64,
    /// Existing capacity at the canal head (m³/s), if known.
    pub existing_capacity_m3s: Option<f64>,
    /// Hours of operation per day, in (0, 24].
    pub hours_per_day: f64,
}

/// One block: the area served by one outlet on a canal.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Block {
    /// Block name, unique within the scheme.
    pub name: String,
    /// Identifier of the canal the block's outlet takes from.
    pub canal: String,
    /// Commanded area of the block (ha), > 0.
    pub area_ha: f64,
    /// Field application efficiency Ea, a fraction in (0, 1].
    pub application_efficiency: f64,
    /// Field-canal efficiency Eb, a fraction in (0, 1].
    pub field_canal_efficiency: f64,
}

/// A node of the demand tree: the headworks or one canal (its head).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize, Deserialize)]
pub enum Node {
    /// The headworks: the sum of the main canals' demands.
    Headworks,
    /// A canal, by its index in [`Network::canals`].
    Canal(usize),
}

/// One problem found while validating a network or demand input.
#[derive(Debug, Clone, PartialEq)]
#[non_exhaustive]
pub enum NetworkProblem {
    /// Two canals share an identifier.
    DuplicateCanal {
        /// The repeated identifier.
        id: String,
    },
    /// Two blocks share a name.
    DuplicateBlock {
        /// The repeated name.
        name: String,
    },
    /// A canal names a parent that does not exist.
    MissingParent {
        /// The canal.
        canal: String,
        /// The parent it names.
        parent: String,
    },
    /// Canals whose parents form a loop (a canal may not feed itself).
    Cycle {
        /// The canals in the loop, in parent order.
        canals: Vec<String>,
    },
    /// A block takes from a canal that does not exist.
    BlockOnMissingCanal {
        /// The block.
        block: String,
        /// The canal it names.
        canal: String,
    },
    /// An efficiency outside (0, 1] or not a number.
    EfficiencyOutOfRange {
        /// Which efficiency ("Ec", "Ea", "Eb").
        kind: &'static str,
        /// The canal or block that carries it.
        item: String,
        /// The value found.
        value: f64,
    },
    /// Hours of operation outside (0, 24].
    HoursOutOfRange {
        /// The canal.
        canal: String,
        /// The value found.
        value: f64,
    },
    /// An existing capacity that is not a positive finite number.
    CapacityNotPositive {
        /// The canal.
        canal: String,
        /// The value found (m³/s).
        value: f64,
    },
    /// A block area that is not a positive finite number.
    AreaNotPositive {
        /// The block.
        block: String,
        /// The value found (ha).
        value: f64,
    },
    /// The scheme has no canal.
    NoCanals,
    /// A requirement series names a block that does not exist.
    SeriesOnMissingBlock {
        /// The block name given.
        block: String,
    },
    /// A requirement series has the wrong number of days.
    SeriesLength {
        /// The block of the series.
        block: String,
        /// The crop label of the series.
        crop: String,
        /// Days expected.
        expected: usize,
        /// Days found.
        found: usize,
    },
    /// A requirement value that is negative or not finite.
    BadRequirement {
        /// The block of the series.
        block: String,
        /// The crop label of the series.
        crop: String,
        /// Day index (0 = start date).
        day: usize,
        /// The value found (m³/day).
        value: f64,
    },
}

impl fmt::Display for NetworkProblem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::DuplicateCanal { id } => write!(f, "canal id `{id}` is used more than once"),
            Self::DuplicateBlock { name } => {
                write!(f, "block name `{name}` is used more than once")
            }
            Self::MissingParent { canal, parent } => {
                write!(f, "canal `{canal}`: parent canal `{parent}` does not exist")
            }
            Self::Cycle { canals } => write!(
                f,
                "canals form a loop (each takes from the next): {}",
                canals.join(" -> ")
            ),
            Self::BlockOnMissingCanal { block, canal } => {
                write!(f, "block `{block}`: canal `{canal}` does not exist")
            }
            Self::EfficiencyOutOfRange { kind, item, value } => write!(
                f,
                "`{item}`: efficiency {kind} = {value}, expected a fraction in (0, 1]"
            ),
            Self::HoursOutOfRange { canal, value } => write!(
                f,
                "canal `{canal}`: hours of operation = {value}, expected a value in (0, 24]"
            ),
            Self::CapacityNotPositive { canal, value } => write!(
                f,
                "canal `{canal}`: existing capacity = {value} m³/s, expected a positive number"
            ),
            Self::AreaNotPositive { block, value } => {
                write!(
                    f,
                    "block `{block}`: area = {value} ha, expected a positive number"
                )
            }
            Self::NoCanals => write!(f, "the scheme has no canal"),
            Self::SeriesOnMissingBlock { block } => {
                write!(
                    f,
                    "requirement series for block `{block}`, which does not exist"
                )
            }
            Self::SeriesLength {
                block,
                crop,
                expected,
                found,
            } => write!(
                f,
                "block `{block}`, crop `{crop}`: requirement series has {found} days, expected {expected}"
            ),
            Self::BadRequirement {
                block,
                crop,
                day,
                value,
            } => write!(
                f,
                "block `{block}`, crop `{crop}`, day {day}: requirement = {value} m³/day, expected a finite value >= 0"
            ),
        }
    }
}

fn efficiency_ok(value: f64) -> bool {
    value.is_finite() && value > 0.0 && value <= 1.0
}

/// A validated canal tree with its blocks.
#[derive(Debug, Clone)]
pub struct Network {
    canals: Vec<Canal>,
    blocks: Vec<Block>,
    /// Parent canal index of each canal (`None` for main canals).
    parent: Vec<Option<usize>>,
    /// Canal index of each block.
    block_canal: Vec<usize>,
    /// Canals ordered so every canal comes after all canals that take from it.
    upward_order: Vec<usize>,
    /// Commanded area below each canal (ha).
    canal_area_ha: Vec<f64>,
    /// Canal index by id and block index by name: lookups stay O(1) in
    /// schemes of thousands of blocks.
    canal_by_id: HashMap<String, usize>,
    block_by_name: HashMap<String, usize>,
    /// Seepage model of each canal that replaces its fixed Ec (see
    /// [`CanalSeepage`]); `None` keeps the fixed Ec.
    seepage: Vec<Option<CanalSeepage>>,
}

/// Seepage by wetted perimeter replacing a canal's fixed conveyance
/// efficiency: each day the inflow Q_in solves Q_in = Q_out + rate ×
/// P(y_n(Q_in)) × L / 86 400 to 0.1 % ([`crate::section::seepage`]), the
/// flows being those while the canal runs (daily mean × 24 ÷ hours), so the
/// day's efficiency Q_out ÷ Q_in falls at low flow.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CanalSeepage {
    /// The canal's section (shape, bed width, side slope).
    pub prism: crate::section::Prism,
    /// Manning n.
    pub manning_n: f64,
    /// Bed slope (m/m).
    pub bed_slope: f64,
    /// Seepage rate (m³ per m² of wetted area per day).
    pub rate_m3_m2_day: f64,
    /// Reach length (m).
    pub length_m: f64,
}

impl Network {
    /// Validates canals and blocks and builds the tree.
    ///
    /// # Errors
    /// [`SchemeError::Invalid`] listing every problem: duplicate ids or names,
    /// missing parents, loops, blocks on missing canals, efficiencies outside
    /// (0, 1], hours outside (0, 24], non-positive capacities or areas.
    pub fn new(canals: Vec<Canal>, blocks: Vec<Block>) -> Result<Self, SchemeError> {
        let mut problems = Vec::new();
        if canals.is_empty() {
            problems.push(NetworkProblem::NoCanals);
        }
        let mut index: HashMap<&str, usize> = HashMap::new();
        for (i, c) in canals.iter().enumerate() {
            if index.insert(c.id.as_str(), i).is_some() {
                problems.push(NetworkProblem::DuplicateCanal { id: c.id.clone() });
            }
            if !efficiency_ok(c.conveyance_efficiency) {
                problems.push(NetworkProblem::EfficiencyOutOfRange {
                    kind: "Ec",
                    item: c.id.clone(),
                    value: c.conveyance_efficiency,
                });
            }
            if !(c.hours_per_day.is_finite() && c.hours_per_day > 0.0 && c.hours_per_day <= 24.0) {
                problems.push(NetworkProblem::HoursOutOfRange {
                    canal: c.id.clone(),
                    value: c.hours_per_day,
                });
            }
            if let Some(cap) = c.existing_capacity_m3s
                && !(cap.is_finite() && cap > 0.0)
            {
                problems.push(NetworkProblem::CapacityNotPositive {
                    canal: c.id.clone(),
                    value: cap,
                });
            }
        }
        let mut parent = vec![None; canals.len()];
        for (i, c) in canals.iter().enumerate() {
            if let Some(p) = &c.parent {
                match index.get(p.as_str()) {
                    Some(&pi) => parent[i] = Some(pi),
                    None => problems.push(NetworkProblem::MissingParent {
                        canal: c.id.clone(),
                        parent: p.clone(),
                    }),
                }
            }
        }
        // Loops: walk up from each canal; colour 0 = unvisited, 1 = on the
        // current walk, 2 = known to reach a root (or a reported loop).
        let mut colour = vec![0u8; canals.len()];
        for start in 0..canals.len() {
            let mut walk = Vec::new();
            let mut at = Some(start);
            while let Some(i) = at {
                match colour[i] {
                    0 => {
                        colour[i] = 1;
                        walk.push(i);
                        at = parent[i];
                    }
                    1 => {
                        let from = walk.iter().position(|&w| w == i).unwrap_or(0);
                        problems.push(NetworkProblem::Cycle {
                            canals: walk[from..].iter().map(|&w| canals[w].id.clone()).collect(),
                        });
                        break;
                    }
                    _ => break,
                }
            }
            for w in walk {
                colour[w] = 2;
            }
        }
        let mut names: HashSet<&str> = HashSet::new();
        let mut block_canal = Vec::with_capacity(blocks.len());
        for b in &blocks {
            if !names.insert(b.name.as_str()) {
                problems.push(NetworkProblem::DuplicateBlock {
                    name: b.name.clone(),
                });
            }
            if let Some(&ci) = index.get(b.canal.as_str()) {
                block_canal.push(ci);
            } else {
                block_canal.push(0);
                problems.push(NetworkProblem::BlockOnMissingCanal {
                    block: b.name.clone(),
                    canal: b.canal.clone(),
                });
            }
            if !(b.area_ha.is_finite() && b.area_ha > 0.0) {
                problems.push(NetworkProblem::AreaNotPositive {
                    block: b.name.clone(),
                    value: b.area_ha,
                });
            }
            for (kind, value) in [
                ("Ea", b.application_efficiency),
                ("Eb", b.field_canal_efficiency),
            ] {
                if !efficiency_ok(value) {
                    problems.push(NetworkProblem::EfficiencyOutOfRange {
                        kind,
                        item: b.name.clone(),
                        value,
                    });
                }
            }
        }
        if !problems.is_empty() {
            return Err(SchemeError::Invalid(problems));
        }
        // Upward order: depth-first post-order over children lists.
        let mut children: Vec<Vec<usize>> = vec![Vec::new(); canals.len()];
        let mut roots = Vec::new();
        for (i, p) in parent.iter().enumerate() {
            match p {
                Some(p) => children[*p].push(i),
                None => roots.push(i),
            }
        }
        let mut upward_order = Vec::with_capacity(canals.len());
        let mut stack: Vec<(usize, bool)> = roots.iter().rev().map(|&r| (r, false)).collect();
        while let Some((i, expanded)) = stack.pop() {
            if expanded {
                upward_order.push(i);
            } else {
                stack.push((i, true));
                for &c in children[i].iter().rev() {
                    stack.push((c, false));
                }
            }
        }
        let mut canal_area_ha = vec![0.0; canals.len()];
        for (b, &c) in blocks.iter().zip(&block_canal) {
            canal_area_ha[c] += b.area_ha;
        }
        for &i in &upward_order {
            if let Some(p) = parent[i] {
                canal_area_ha[p] += canal_area_ha[i];
            }
        }
        let canal_by_id = canals
            .iter()
            .enumerate()
            .map(|(i, c)| (c.id.clone(), i))
            .collect();
        let block_by_name = blocks
            .iter()
            .enumerate()
            .map(|(i, b)| (b.name.clone(), i))
            .collect();
        let n_seepage = canals.len();
        Ok(Self {
            canals,
            blocks,
            parent,
            block_canal,
            upward_order,
            canal_area_ha,
            canal_by_id,
            block_by_name,
            seepage: vec![None; n_seepage],
        })
    }

    /// Lets seepage by wetted perimeter replace canal `canal`'s fixed Ec
    /// (`None` restores the fixed Ec). Out-of-range indices are ignored.
    pub fn set_seepage(&mut self, canal: usize, seepage: Option<CanalSeepage>) {
        if let Some(slot) = self.seepage.get_mut(canal) {
            *slot = seepage;
        }
    }

    /// The seepage model replacing canal `canal`'s fixed Ec, if any.
    pub fn seepage(&self, canal: usize) -> Option<&CanalSeepage> {
        self.seepage.get(canal).and_then(Option::as_ref)
    }

    /// The canals, in the order given.
    pub fn canals(&self) -> &[Canal] {
        &self.canals
    }

    /// The blocks, in the order given.
    pub fn blocks(&self) -> &[Block] {
        &self.blocks
    }

    /// Index of a canal by its identifier.
    pub fn canal_index(&self, id: &str) -> Option<usize> {
        self.canal_by_id.get(id).copied()
    }

    /// Index of a block by its name.
    pub fn block_index(&self, name: &str) -> Option<usize> {
        self.block_by_name.get(name).copied()
    }

    /// Parent canal index of canal `canal` (`None` for a main canal).
    pub fn parent(&self, canal: usize) -> Option<usize> {
        self.parent[canal]
    }

    /// Canal index that block `block` takes from.
    pub fn block_canal(&self, block: usize) -> usize {
        self.block_canal[block]
    }

    /// Canal indices ordered so that each canal comes after every canal below it.
    pub fn upward_order(&self) -> &[usize] {
        &self.upward_order
    }

    /// Canals taking directly from `node` (main canals for the headworks).
    pub fn child_canals(&self, node: Node) -> Vec<usize> {
        let want = match node {
            Node::Headworks => None,
            Node::Canal(c) => Some(c),
        };
        (0..self.canals.len())
            .filter(|&i| self.parent[i] == want)
            .collect()
    }

    /// Blocks taking directly from canal `canal`.
    pub fn child_blocks(&self, canal: usize) -> Vec<usize> {
        (0..self.blocks.len())
            .filter(|&b| self.block_canal[b] == canal)
            .collect()
    }

    /// Number of nodes (canals + the headworks).
    pub fn node_count(&self) -> usize {
        self.canals.len() + 1
    }

    /// Row index of a node in node × day arrays (canals first, headworks last).
    pub fn node_row(&self, node: Node) -> usize {
        match node {
            Node::Canal(c) => c,
            Node::Headworks => self.canals.len(),
        }
    }

    /// All nodes: canals in given order, then the headworks.
    pub fn nodes(&self) -> Vec<Node> {
        (0..self.canals.len())
            .map(Node::Canal)
            .chain(std::iter::once(Node::Headworks))
            .collect()
    }

    /// Name of a node for reports: the canal id, or `headworks`.
    pub fn node_name(&self, node: Node) -> &str {
        match node {
            Node::Headworks => "headworks",
            Node::Canal(c) => &self.canals[c].id,
        }
    }

    /// Commanded area below a node (ha): the sum of the areas of every block
    /// served through it.
    pub fn commanded_area_ha(&self, node: Node) -> f64 {
        match node {
            Node::Canal(c) => self.canal_area_ha[c],
            Node::Headworks => self.blocks.iter().map(|b| b.area_ha).sum(),
        }
    }

    /// Whether block `block` is served through `node`.
    pub fn block_is_below(&self, block: usize, node: Node) -> bool {
        match node {
            Node::Headworks => true,
            Node::Canal(target) => {
                let mut at = Some(self.block_canal[block]);
                while let Some(c) = at {
                    if c == target {
                        return true;
                    }
                    at = self.parent[c];
                }
                false
            }
        }
    }

    /// Factor turning block `block`'s NIR (m³/day) into its share of the demand
    /// at `node` (m³/day): 1 ÷ (Ea × Eb × Π Ec) over the canals from the
    /// block's canal up to and including `node`'s canal (all canals to the
    /// headworks for [`Node::Headworks`]). `None` when the block is not below
    /// the node.
    pub fn block_factor(&self, block: usize, node: Node) -> Option<f64> {
        let b = &self.blocks[block];
        self.block_factor_with_efficiency(block, node, b.application_efficiency)
    }

    /// As [`Self::block_factor`], with the field application efficiency Ea
    /// of one planting instead of the block's (e.g. a paddy planting whose
    /// efficiency covers operational losses only):
    /// 1 ÷ (Ea × Eb × Π Ec). `None` when the block is not below the node.
    pub fn block_factor_with_efficiency(
        &self,
        block: usize,
        node: Node,
        application_efficiency: f64,
    ) -> Option<f64> {
        let b = &self.blocks[block];
        self.conveyance_factor(block, node)
            .map(|k| k / (application_efficiency * b.field_canal_efficiency))
    }

    /// Factor turning block `block`'s GIR at its outlet (m³/day) into its
    /// share of the demand at `node`: 1 ÷ Π Ec over the canals from the
    /// block's canal up to and including `node`'s canal (all canals to the
    /// headworks for [`Node::Headworks`]). `None` when the block is not
    /// below the node.
    pub fn conveyance_factor(&self, block: usize, node: Node) -> Option<f64> {
        let mut factor = 1.0;
        let mut at = Some(self.block_canal[block]);
        while let Some(c) = at {
            factor /= self.canals[c].conveyance_efficiency;
            if node == Node::Canal(c) {
                return Some(factor);
            }
            at = self.parent[c];
        }
        (node == Node::Headworks).then_some(factor)
    }
}
