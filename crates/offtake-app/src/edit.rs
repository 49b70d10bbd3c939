//! Undoable edits of the project document.
//!
//! Every change to the [`Project`] is a [`DocEdit`]. Applying one returns its
//! inverse (see [`crate::history`]):
//!
//! - field edits replace **one record** (a canal, a block, a planting, the
//!   scheme info, the weather source or the options) and their inverse is
//!   the same replacement with the old record — a small snapshot of the
//!   touched item only;
//! - [`DocEdit::Remove`] takes an item out *with everything below it* (a
//!   canal takes its sub-canals, their blocks and those blocks' plantings)
//!   and its inverse is [`DocEdit::Insert`] of exactly those records at their
//!   old positions; the inverse of an insert is the remove of its top item.
//!
//! Re-parenting (move) is a record replacement with a new parent id.

use offtake_core::project::{Block, Canal, Options, Planting, Project, SchemeInfo, WeatherSource};
use thiserror::Error;

pub use crate::command::ItemRef;
use crate::history::Edit;

/// Records taken out of (or to be put into) the document, each with its
/// position in its list.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Subtree {
    /// Canals with their indices in `Project::canals` (ascending).
    pub canals: Vec<(usize, Canal)>,
    /// Blocks with their indices in `Project::blocks` (ascending).
    pub blocks: Vec<(usize, Block)>,
    /// Plantings with their indices in `Project::plantings` (ascending).
    pub plantings: Vec<(usize, Planting)>,
}

impl Subtree {
    /// The item at the top of the subtree: the canal whose parent is not in
    /// the subtree, else the first block, else the first planting.
    pub fn top(&self) -> Option<ItemRef> {
        let ids: Vec<&str> = self.canals.iter().map(|(_, c)| c.id.as_str()).collect();
        if let Some((_, c)) = self
            .canals
            .iter()
            .find(|(_, c)| c.parent.as_deref().is_none_or(|p| !ids.contains(&p)))
        {
            return Some(ItemRef::Canal(c.id.clone()));
        }
        if let Some((_, b)) = self.blocks.first() {
            return Some(ItemRef::Block(b.id.clone()));
        }
        self.plantings
            .first()
            .map(|(_, p)| ItemRef::Planting(p.id.clone()))
    }
}

/// An undoable change to the project.
#[derive(Debug, Clone, PartialEq)]
pub enum DocEdit {
    /// Replace the scheme name and notes.
    SetScheme(SchemeInfo),
    /// Replace the weather source.
    SetWeather(WeatherSource),
    /// Replace the options.
    SetOptions(Options),
    /// Replace the list of scenarios.
    SetScenarios(Vec<offtake_core::project::Scenario>),
    /// Replace the canal whose id is `id` (the new record may change the
    /// name, parent, efficiencies; its id must stay `id`).
    SetCanal {
        /// Id of the canal to replace.
        id: String,
        /// The new record.
        canal: Box<Canal>,
    },
    /// Replace the block whose id is `id`.
    SetBlock {
        /// Id of the block to replace.
        id: String,
        /// The new record.
        block: Box<Block>,
    },
    /// Replace the planting whose id is `id`.
    SetPlanting {
        /// Id of the planting to replace.
        id: String,
        /// The new record.
        planting: Box<Planting>,
    },
    /// Insert records at their positions (add an item, or undo a remove).
    Insert(Box<Subtree>),
    /// Remove an item with everything below it.
    Remove(ItemRef),
    /// Replace the project's own crops (the crop library editor).
    SetUserCrops(Vec<offtake_core::crop::Crop>),
    /// Replace the project's own soils (the soil library editor).
    SetUserSoils(Vec<offtake_core::soil::Soil>),
    /// Give several plantings of the base plan another crop in one step:
    /// `(planting id, crop id)` pairs (the crop library editor's "Use for
    /// all plantings of …"). The inverse gives each planting its old crop
    /// back; nothing changes when any planting is missing.
    SetPlantingCrops(Vec<(String, String)>),
    /// Give several blocks another delivery mode in one step: `(block id,
    /// mode)` pairs (the scheme inspector's offer to serve an on-demand
    /// project by rotation within the block). The inverse restores each
    /// block's old mode; nothing changes when any block is missing.
    SetBlockDeliveries(Vec<(String, offtake_core::project::DeliveryMode)>),
    // --- scenario editor (crate::scenario_editor) ---
    /// Replace the scenario named `name` with a new record (its overrides,
    /// weather change, description; a new name renames it). The inverse is
    /// the same replacement with the old record: the base plan is untouched.
    SetScenario {
        /// Name of the scenario to replace.
        name: String,
        /// The new record.
        scenario: Box<offtake_core::project::Scenario>,
    },
}

/// Why an edit did not fit the document.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
#[non_exhaustive]
pub enum EditError {
    /// The item is not in the project.
    #[error("{0} is not in the project")]
    Missing(String),
    /// A record's id does not match the id it replaces.
    #[error("the new record has id {found:?}, expected {expected:?}")]
    IdChanged {
        /// Id of the item being replaced.
        expected: String,
        /// Id of the new record.
        found: String,
    },
    /// An inserted record's id is already used.
    #[error("id {0:?} is already used")]
    DuplicateId(String),
    /// Nothing to insert.
    #[error("nothing to insert")]
    Empty,
}

fn replace<T: Clone>(
    list: &mut [T],
    id: &str,
    new: T,
    id_of: impl Fn(&T) -> &str,
) -> Result<T, EditError> {
    if id_of(&new) != id {
        return Err(EditError::IdChanged {
            expected: id.to_owned(),
            found: id_of(&new).to_owned(),
        });
    }
    let slot = list
        .iter_mut()
        .find(|x| id_of(x) == id)
        .ok_or_else(|| EditError::Missing(id.to_owned()))?;
    Ok(std::mem::replace(slot, new))
}

/// Takes the items at `indices` (ascending) out of `list`, keeping their indices.
fn take_indices<T>(list: &mut Vec<T>, indices: &[usize]) -> Vec<(usize, T)> {
    let mut out: Vec<(usize, T)> = indices.iter().rev().map(|&i| (i, list.remove(i))).collect();
    out.reverse();
    out
}

/// Inserts items at their recorded indices (ascending order restores them).
fn put_back<T>(list: &mut Vec<T>, items: Vec<(usize, T)>) {
    for (i, item) in items {
        let i = i.min(list.len());
        list.insert(i, item);
    }
}

/// Removes `item` and everything below it; returns what was removed.
fn remove(doc: &mut Project, item: &ItemRef) -> Result<Subtree, EditError> {
    let (canal_ids, block_ids, planting_ids): (Vec<String>, Vec<String>, Vec<String>) = match item {
        ItemRef::Canal(id) => {
            if doc.canal(id).is_none() {
                return Err(EditError::Missing(format!("canal {id:?}")));
            }
            let canals: Vec<String> = doc
                .canals_below(id)
                .into_iter()
                .map(str::to_owned)
                .collect();
            let blocks: Vec<String> = doc
                .blocks
                .iter()
                .filter(|b| canals.contains(&b.canal))
                .map(|b| b.id.clone())
                .collect();
            let plantings = doc
                .plantings
                .iter()
                .filter(|p| blocks.contains(&p.block))
                .map(|p| p.id.clone())
                .collect();
            (canals, blocks, plantings)
        }
        ItemRef::Block(id) => {
            if doc.block(id).is_none() {
                return Err(EditError::Missing(format!("block {id:?}")));
            }
            let plantings = doc
                .plantings
                .iter()
                .filter(|p| &p.block == id)
                .map(|p| p.id.clone())
                .collect();
            (Vec::new(), vec![id.clone()], plantings)
        }
        ItemRef::Planting(id) => {
            if doc.planting(id).is_none() {
                return Err(EditError::Missing(format!("planting {id:?}")));
            }
            (Vec::new(), Vec::new(), vec![id.clone()])
        }
    };
    let idx = |ids: &[String], all: Vec<&str>| -> Vec<usize> {
        all.iter()
            .enumerate()
            .filter(|(_, id)| ids.iter().any(|x| x == *id))
            .map(|(i, _)| i)
            .collect()
    };
    let ci = idx(
        &canal_ids,
        doc.canals.iter().map(|c| c.id.as_str()).collect(),
    );
    let bi = idx(
        &block_ids,
        doc.blocks.iter().map(|b| b.id.as_str()).collect(),
    );
    let pi = idx(
        &planting_ids,
        doc.plantings.iter().map(|p| p.id.as_str()).collect(),
    );
    Ok(Subtree {
        canals: take_indices(&mut doc.canals, &ci),
        blocks: take_indices(&mut doc.blocks, &bi),
        plantings: take_indices(&mut doc.plantings, &pi),
    })
}

fn insert(doc: &mut Project, sub: Subtree) -> Result<ItemRef, EditError> {
    let top = sub.top().ok_or(EditError::Empty)?;
    for (_, c) in &sub.canals {
        if doc.canal(&c.id).is_some() {
            return Err(EditError::DuplicateId(c.id.clone()));
        }
    }
    for (_, b) in &sub.blocks {
        if doc.block(&b.id).is_some() {
            return Err(EditError::DuplicateId(b.id.clone()));
        }
    }
    for (_, p) in &sub.plantings {
        if doc.planting(&p.id).is_some() {
            return Err(EditError::DuplicateId(p.id.clone()));
        }
    }
    put_back(&mut doc.canals, sub.canals);
    put_back(&mut doc.blocks, sub.blocks);
    put_back(&mut doc.plantings, sub.plantings);
    Ok(top)
}

impl Edit<Project> for DocEdit {
    type Error = EditError;

    fn apply(self, doc: &mut Project) -> Result<Self, EditError> {
        Ok(match self {
            DocEdit::SetScheme(s) => DocEdit::SetScheme(std::mem::replace(&mut doc.scheme, s)),
            DocEdit::SetWeather(w) => DocEdit::SetWeather(std::mem::replace(&mut doc.weather, w)),
            DocEdit::SetOptions(o) => DocEdit::SetOptions(std::mem::replace(&mut doc.options, o)),
            DocEdit::SetScenarios(s) => {
                DocEdit::SetScenarios(std::mem::replace(&mut doc.scenarios, s))
            }
            DocEdit::SetCanal { id, canal } => {
                let old = replace(&mut doc.canals, &id, *canal, |c| c.id.as_str())?;
                DocEdit::SetCanal {
                    id,
                    canal: Box::new(old),
                }
            }
            DocEdit::SetBlock { id, block } => {
                let old = replace(&mut doc.blocks, &id, *block, |b| b.id.as_str())?;
                DocEdit::SetBlock {
                    id,
                    block: Box::new(old),
                }
            }
            DocEdit::SetPlanting { id, planting } => {
                let old = replace(&mut doc.plantings, &id, *planting, |p| p.id.as_str())?;
                DocEdit::SetPlanting {
                    id,
                    planting: Box::new(old),
                }
            }
            DocEdit::Insert(sub) => DocEdit::Remove(insert(doc, *sub)?),
            DocEdit::Remove(item) => DocEdit::Insert(Box::new(remove(doc, &item)?)),
            DocEdit::SetUserCrops(c) => {
                DocEdit::SetUserCrops(std::mem::replace(&mut doc.user_crops, c))
            }
            DocEdit::SetUserSoils(s) => {
                DocEdit::SetUserSoils(std::mem::replace(&mut doc.user_soils, s))
            }
            DocEdit::SetScenario { name, scenario } => set_scenario(doc, &name, *scenario)?,
            DocEdit::SetPlantingCrops(pairs) => set_planting_crops(doc, pairs)?,
            DocEdit::SetBlockDeliveries(pairs) => set_block_deliveries(doc, pairs)?,
        })
    }

    fn label(&self) -> String {
        match self {
            DocEdit::SetScheme(_) => "edit scheme".to_owned(),
            DocEdit::SetWeather(_) => "edit weather source".to_owned(),
            DocEdit::SetOptions(_) => "edit options".to_owned(),
            DocEdit::SetScenarios(_) => "edit scenarios".to_owned(),
            DocEdit::SetCanal { canal, .. } => format!("edit canal {}", canal.name),
            DocEdit::SetBlock { block, .. } => format!("edit block {}", block.name),
            DocEdit::SetPlanting { planting, .. } => format!("edit planting {}", planting.crop),
            DocEdit::Insert(sub) => match sub.top() {
                Some(ItemRef::Canal(_)) => "add canal".to_owned(),
                Some(ItemRef::Block(_)) => "add block".to_owned(),
                Some(ItemRef::Planting(_)) => "add planting".to_owned(),
                None => "insert".to_owned(),
            },
            DocEdit::Remove(item) => match item {
                ItemRef::Canal(id) => format!("delete canal {id}"),
                ItemRef::Block(id) => format!("delete block {id}"),
                ItemRef::Planting(id) => format!("delete planting {id}"),
            },
            DocEdit::SetUserCrops(_) => "edit my crops".to_owned(),
            DocEdit::SetUserSoils(_) => "edit my soils".to_owned(),
            DocEdit::SetScenario { name, .. } => format!("edit scenario {name}"),
            DocEdit::SetBlockDeliveries(pairs) => {
                format!("change the delivery of {} blocks", pairs.len())
            }
            DocEdit::SetPlantingCrops(pairs) => match pairs.first() {
                Some((_, crop)) if pairs.iter().all(|(_, c)| c == crop) => {
                    format!("grow {crop} on {} plantings", pairs.len())
                }
                _ => format!("change the crop of {} plantings", pairs.len()),
            },
        }
    }
}

/// Replaces the scenario `name` with `new`; returns the inverse edit.
fn set_scenario(
    doc: &mut Project,
    name: &str,
    new: offtake_core::project::Scenario,
) -> Result<DocEdit, EditError> {
    if new.name != name && doc.scenario(&new.name).is_some() {
        return Err(EditError::DuplicateId(new.name));
    }
    let slot = doc
        .scenarios
        .iter_mut()
        .find(|s| s.name == name)
        .ok_or_else(|| EditError::Missing(format!("scenario {name:?}")))?;
    let new_name = new.name.clone();
    let old = std::mem::replace(slot, new);
    Ok(DocEdit::SetScenario {
        name: new_name,
        scenario: Box::new(old),
    })
}

/// Sets the crop of each listed planting; returns the edit that restores
/// the old crops. Checks every id first, so a missing planting changes nothing.
fn set_planting_crops(
    doc: &mut Project,
    pairs: Vec<(String, String)>,
) -> Result<DocEdit, EditError> {
    if let Some((id, _)) = pairs.iter().find(|(id, _)| doc.planting(id).is_none()) {
        return Err(EditError::Missing(format!("planting {id:?}")));
    }
    let mut old = Vec::with_capacity(pairs.len());
    for (id, crop) in pairs {
        if let Some(p) = doc.plantings.iter_mut().find(|p| p.id == id) {
            old.push((id, std::mem::replace(&mut p.crop, crop)));
        }
    }
    // Undo in the reverse order (a planting listed twice ends as it began).
    old.reverse();
    Ok(DocEdit::SetPlantingCrops(old))
}

fn set_block_deliveries(
    doc: &mut Project,
    pairs: Vec<(String, offtake_core::project::DeliveryMode)>,
) -> Result<DocEdit, EditError> {
    if let Some((id, _)) = pairs.iter().find(|(id, _)| doc.block(id).is_none()) {
        return Err(EditError::Missing(format!("block {id:?}")));
    }
    let mut old = Vec::with_capacity(pairs.len());
    for (id, mode) in pairs {
        if let Some(b) = doc.blocks.iter_mut().find(|b| b.id == id) {
            old.push((id, std::mem::replace(&mut b.delivery, mode)));
        }
    }
    old.reverse();
    Ok(DocEdit::SetBlockDeliveries(old))
}

/// A fresh id with `prefix` not used by any canal, block or planting.
pub fn fresh_id(doc: &Project, prefix: &str) -> String {
    let used =
        |id: &str| doc.canal(id).is_some() || doc.block(id).is_some() || doc.planting(id).is_some();
    // Among count + 1 candidates at least one is free.
    let count = doc.canals.len() + doc.blocks.len() + doc.plantings.len();
    (1..=count + 1)
        .map(|n| format!("{prefix}-{n}"))
        .find(|id| !used(id))
        .unwrap_or_else(|| prefix.to_owned())
}

/// Typical conveyance efficiency of a new canal reach, a starting value to
/// replace with the reach's own (common practice, from memory of the ranges
/// in Bos and Nugteren 1974, "On irrigation efficiencies", ILRI Publ. 19).
/// A new reach at 100 % would hide its losses and understate the demand.
pub const NEW_CANAL_CONVEYANCE_EFFICIENCY: f64 = 0.9;
/// Typical field-canal efficiency of a new block (same source and caveat).
pub const NEW_BLOCK_FIELD_CANAL_EFFICIENCY: f64 = 0.8;
/// Irrigation method name of a new block, until the user names its own.
pub const NEW_BLOCK_METHOD: &str = "Surface (typical values)";
/// Typical application efficiency of surface irrigation for a new block
/// (from memory of Brouwer et al. 1989, FAO Irrigation Water Management
/// Training Manual 4: surface 60 %, sprinkler 75 %, drip 90 %).
pub const NEW_BLOCK_APPLICATION_EFFICIENCY: f64 = 0.6;

/// A new canal record below `parent` (`None`: at the headworks).
///
/// Conveyance efficiency starts at a typical value
/// ([`NEW_CANAL_CONVEYANCE_EFFICIENCY`]) and hours at 24 h/day; the
/// inspector shows both for the user to replace with the reach's own.
pub fn new_canal(doc: &Project, parent: Option<&str>) -> Canal {
    use offtake_core::project::CanalKind;
    let kind = match parent.and_then(|p| doc.canal(p)).map(|c| c.kind) {
        None => CanalKind::Main,
        Some(CanalKind::Main) => CanalKind::Branch,
        Some(CanalKind::Branch) => CanalKind::Distributary,
        Some(CanalKind::Distributary | CanalKind::Minor) => CanalKind::Minor,
    };
    let id = fresh_id(doc, "canal");
    Canal {
        name: format!("New {} canal", kind.label()),
        id,
        parent: parent.map(str::to_owned),
        kind,
        conveyance_efficiency: NEW_CANAL_CONVEYANCE_EFFICIENCY,
        existing_capacity_m3s: None,
        operating_hours_per_day: 24.0,
        section: offtake_core::project::CanalSectionSpec::default(),
    }
}

/// A new block record on `canal`, with no area yet, surface irrigated at
/// typical efficiencies ([`NEW_BLOCK_APPLICATION_EFFICIENCY`],
/// [`NEW_BLOCK_FIELD_CANAL_EFFICIENCY`]) for the user to replace, served by
/// a 7-day rotation within the block with an assumed outlet stream size.
pub fn new_block(doc: &Project, canal: &str) -> Block {
    use offtake_core::project::IrrigationMethod;
    let id = fresh_id(doc, "block");
    Block {
        name: format!("Block {}", id.trim_start_matches("block-")),
        id,
        canal: canal.to_owned(),
        area_ha: 0.0,
        soil: String::new(),
        method: IrrigationMethod {
            name: NEW_BLOCK_METHOD.to_owned(),
            application_efficiency: NEW_BLOCK_APPLICATION_EFFICIENCY,
        },
        field_canal_efficiency: NEW_BLOCK_FIELD_CANAL_EFFICIENCY,
        // A new surface-irrigated block is served by rotation within the
        // block (DESIGN.md "Delivery").
        delivery: offtake_core::project::DeliveryMode::RotationWithinBlock {
            cycle_days: offtake_core::project::DEFAULT_ROTATION_CYCLE_DAYS,
            min_depth_mm: offtake_core::project::DEFAULT_MIN_TURN_DEPTH_MM,
        },
        outlet_stream_size_ls: None,
    }
}

/// A new planting on `block`, covering the whole block, planted on 1 January.
pub fn new_planting(doc: &Project, block: &str) -> Planting {
    use offtake_core::project::{MonthDay, PlantingArea, Strategy};
    Planting {
        id: fresh_id(doc, "planting"),
        block: block.to_owned(),
        crop: String::new(),
        area: PlantingArea::PercentOfBlock(100.0),
        first_planting: MonthDay { month: 1, day: 1 },
        spread_days: 0,
        season: String::new(),
        strategy: Strategy::Refill {
            trigger_pct_of_raw: 100.0,
        },
        season_length_days: None,
        paddy: None,
        coefficients: offtake_core::project::CoefficientChoice::Single,
    }
}

/// An insert edit adding one canal.
pub fn add_canal(canal: Canal) -> DocEdit {
    DocEdit::Insert(Box::new(Subtree {
        canals: vec![(usize::MAX, canal)],
        ..Subtree::default()
    }))
}

/// An insert edit adding one block.
pub fn add_block(block: Block) -> DocEdit {
    DocEdit::Insert(Box::new(Subtree {
        blocks: vec![(usize::MAX, block)],
        ..Subtree::default()
    }))
}

/// An insert edit adding one planting.
pub fn add_planting(planting: Planting) -> DocEdit {
    DocEdit::Insert(Box::new(Subtree {
        plantings: vec![(usize::MAX, planting)],
        ..Subtree::default()
    }))
}

#[cfg(test)]
mod tests {
    use super::{
        DocEdit, EditError, ItemRef, add_planting, fresh_id, new_block, new_canal, new_planting,
    };
    use crate::history::Edit;
    use offtake_core::project::Project;

    /// An invented tree: main → branch → minor, a block on each, a planting on each block.
    fn tree() -> Project {
        let mut p = Project::default();
        let main = new_canal(&p, None);
        p.canals.push(main.clone());
        let branch = new_canal(&p, Some(&main.id));
        p.canals.push(branch.clone());
        let minor = new_canal(&p, Some(&branch.id));
        p.canals.push(minor.clone());
        for c in [&main, &branch, &minor] {
            let b = new_block(&p, &c.id);
            p.blocks.push(b.clone());
            let pl = new_planting(&p, &b.id);
            p.plantings.push(pl);
        }
        p
    }

    #[test]
    fn removing_a_canal_takes_its_subtree_and_the_inverse_restores_positions() {
        let original = tree();
        let mut p = original.clone();
        let branch = p.canals[1].id.clone();
        let inverse = DocEdit::Remove(ItemRef::Canal(branch.clone()))
            .apply(&mut p)
            .expect("remove");
        assert_eq!(p.canals.len(), 1);
        assert_eq!(p.blocks.len(), 1);
        assert_eq!(p.plantings.len(), 1);
        let again = inverse.apply(&mut p).expect("insert back");
        assert_eq!(p, original);
        assert_eq!(again, DocEdit::Remove(ItemRef::Canal(branch)));
    }

    #[test]
    fn kinds_get_deeper_down_the_tree_and_ids_are_fresh() {
        let p = tree();
        let kinds: Vec<&str> = p.canals.iter().map(|c| c.kind.label()).collect();
        assert_eq!(kinds, ["main", "branch", "distributary"]);
        let id = fresh_id(&p, "canal");
        assert!(p.canal(&id).is_none());
    }

    #[test]
    fn adding_appends_and_duplicate_ids_are_refused() {
        let mut p = tree();
        let block = p.blocks[0].id.clone();
        let pl = new_planting(&p, &block);
        let edit = add_planting(pl.clone());
        let inverse = edit.clone().apply(&mut p).expect("add");
        assert_eq!(p.plantings.last(), Some(&pl));
        assert_eq!(inverse, DocEdit::Remove(ItemRef::Planting(pl.id.clone())));
        assert_eq!(
            edit.apply(&mut p),
            Err(EditError::DuplicateId(pl.id.clone()))
        );
    }

    #[test]
    fn several_plantings_change_crop_in_one_step_and_one_inverse_restores_them() {
        let original = tree();
        let mut p = original.clone();
        let pairs: Vec<(String, String)> = p
            .plantings
            .iter()
            .map(|pl| (pl.id.clone(), "maize-grain-mine".to_owned()))
            .collect();
        let inverse = DocEdit::SetPlantingCrops(pairs).apply(&mut p).expect("set");
        assert!(p.plantings.iter().all(|pl| pl.crop == "maize-grain-mine"));
        inverse.apply(&mut p).expect("undo");
        assert_eq!(p, original);
        // A missing planting: refused, nothing changed.
        let bad = DocEdit::SetPlantingCrops(vec![
            (p.plantings[0].id.clone(), "cotton".to_owned()),
            ("no-such".to_owned(), "cotton".to_owned()),
        ]);
        assert!(matches!(bad.apply(&mut p), Err(EditError::Missing(_))));
        assert_eq!(p, original);
    }

    #[test]
    fn replacing_a_record_refuses_a_changed_id() {
        let mut p = tree();
        let mut c = p.canals[0].clone();
        let id = c.id.clone();
        c.id = "other".into();
        assert!(matches!(
            DocEdit::SetCanal {
                id,
                canal: Box::new(c)
            }
            .apply(&mut p),
            Err(EditError::IdChanged { .. })
        ));
    }
}
