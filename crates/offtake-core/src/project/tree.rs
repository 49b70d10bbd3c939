//! Walking the canal tree: children, the path to the headworks, commanded
//! areas and an order in which demand can be summed from the leaves up.
//!
//! Every helper is safe on a broken tree (missing parents, cycles): it never
//! loops forever and reports the break as a [`TreeError`]. A project that
//! passes validation has no such breaks.

use std::collections::{HashMap, HashSet};

use thiserror::Error;

use super::{Block, Canal, Project};

/// A break in the canal tree.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
#[non_exhaustive]
pub enum TreeError {
    /// No canal has this id.
    #[error("no canal with id {0:?}")]
    UnknownCanal(String),
    /// No block has this id.
    #[error("no block with id {0:?}")]
    UnknownBlock(String),
    /// A canal's parent does not exist.
    #[error("canal {canal:?} takes from {parent:?}, which is not a canal of the project")]
    MissingParent {
        /// The canal.
        canal: String,
        /// Its missing parent.
        parent: String,
    },
    /// Following parents comes back to a canal already seen.
    #[error("the canal tree has a cycle: {}", canals.join(" → "))]
    Cycle {
        /// The canals on the cycle, in parent order, first repeated last.
        canals: Vec<String>,
    },
}

impl Project {
    /// Canals taking water at the headworks (no parent).
    pub fn root_canals(&self) -> Vec<&Canal> {
        self.canals.iter().filter(|c| c.parent.is_none()).collect()
    }

    /// Canals taking water from `canal_id`, in file order.
    pub fn child_canals(&self, canal_id: &str) -> Vec<&Canal> {
        self.canals
            .iter()
            .filter(|c| c.parent.as_deref() == Some(canal_id))
            .collect()
    }

    /// Blocks whose outlet is on `canal_id`, in file order.
    pub fn blocks_on(&self, canal_id: &str) -> Vec<&Block> {
        self.blocks.iter().filter(|b| b.canal == canal_id).collect()
    }

    /// The canals from `canal_id` up to its root canal, starting with
    /// `canal_id` itself and ending with the canal at the headworks.
    ///
    /// # Errors
    /// [`TreeError`] if the canal or a parent is missing, or on a cycle.
    pub fn path_to_headworks(&self, canal_id: &str) -> Result<Vec<&Canal>, TreeError> {
        let mut path: Vec<&Canal> = Vec::new();
        let mut seen = HashSet::new();
        let mut current = self
            .canal(canal_id)
            .ok_or_else(|| TreeError::UnknownCanal(canal_id.to_owned()))?;
        loop {
            if !seen.insert(current.id.as_str()) {
                let start = path.iter().position(|c| c.id == current.id).unwrap_or(0);
                let mut canals: Vec<String> = path[start..].iter().map(|c| c.id.clone()).collect();
                canals.push(current.id.clone());
                return Err(TreeError::Cycle { canals });
            }
            path.push(current);
            match &current.parent {
                None => return Ok(path),
                Some(parent) => {
                    current = self.canal(parent).ok_or_else(|| TreeError::MissingParent {
                        canal: current.id.clone(),
                        parent: parent.clone(),
                    })?;
                }
            }
        }
    }

    /// Product of the conveyance efficiencies Ec of the reaches from the
    /// block's canal up to the headworks: water reaching the block outlet ÷
    /// water released at the headworks for it.
    ///
    /// # Errors
    /// [`TreeError`] on a broken tree or a missing block or canal.
    pub fn conveyance_to_headworks(&self, block_id: &str) -> Result<f64, TreeError> {
        let block = self
            .block(block_id)
            .ok_or_else(|| TreeError::UnknownBlock(block_id.to_owned()))?;
        Ok(self
            .path_to_headworks(&block.canal)?
            .iter()
            .map(|c| c.conveyance_efficiency)
            .product())
    }

    /// Canal ids ordered so that every canal comes after all the canals that
    /// take from it (leaves first, roots last): the order in which demand is
    /// summed up the tree.
    ///
    /// # Errors
    /// [`TreeError`] on a missing parent or a cycle.
    pub fn canals_leaves_first(&self) -> Result<Vec<&str>, TreeError> {
        let mut depth: HashMap<&str, usize> = HashMap::new();
        for c in &self.canals {
            let path = self.path_to_headworks(&c.id)?;
            depth.insert(c.id.as_str(), path.len());
        }
        let mut ids: Vec<&str> = self.canals.iter().map(|c| c.id.as_str()).collect();
        // Stable sort: deeper canals first, file order among equals.
        ids.sort_by_key(|id| std::cmp::Reverse(depth.get(id).copied().unwrap_or(0)));
        Ok(ids)
    }

    /// Area commanded below `canal_id` in hectares: the blocks on it and on
    /// every canal below it.
    ///
    /// # Errors
    /// [`TreeError::UnknownCanal`] if the canal is missing; a cycle below the
    /// canal is cut (each canal counted once).
    pub fn commanded_area_ha(&self, canal_id: &str) -> Result<f64, TreeError> {
        if self.canal(canal_id).is_none() {
            return Err(TreeError::UnknownCanal(canal_id.to_owned()));
        }
        Ok(self
            .canals_below(canal_id)
            .iter()
            .flat_map(|c| self.blocks_on(c))
            .map(|b| b.area_ha)
            .sum())
    }

    /// Area commanded by the whole scheme (every block on a canal that
    /// reaches the headworks), hectares.
    pub fn scheme_area_ha(&self) -> f64 {
        self.blocks
            .iter()
            .filter(|b| self.path_to_headworks(&b.canal).is_ok())
            .map(|b| b.area_ha)
            .sum()
    }

    /// `canal_id` and every canal below it (each once, cycle-safe),
    /// breadth-first.
    pub fn canals_below<'a>(&'a self, canal_id: &'a str) -> Vec<&'a str> {
        let mut out = vec![canal_id];
        let mut seen: HashSet<&str> = HashSet::from([canal_id]);
        let mut i = 0;
        while i < out.len() {
            for child in self.child_canals(out[i]) {
                if seen.insert(child.id.as_str()) {
                    out.push(child.id.as_str());
                }
            }
            i += 1;
        }
        out
    }
}
