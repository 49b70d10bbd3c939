//! One table of limits: for every numeric input of a project, its physical
//! range, the range usual in practice, its unit, its label and where the
//! ranges come from; and the rules for ids.
//!
//! * **Physical range** — a value outside it cannot describe a real scheme,
//!   or would make a later step of the computation overflow (a date beyond
//!   the calendar, a flow of 10³⁰⁷ l/s). Validation reports it as an
//!   **error** and the project is not computed.
//! * **Usual range** — what schemes have in practice. A value outside it is
//!   computed, with a **warning** naming the value and the usual range.
//!
//! Validation of projects and scenarios ([`crate::project::validate`]) reads
//! this table, and so do the app's forms, so a range is written once.
//!
//! Physical bounds are chosen so that no value inside them overflows a later
//! step: efficiencies and operating hours of at least 1 % and half an hour
//! keep every flow within a factor of 10⁴ per level of the canal tree; day
//! counts of at most a year keep every date inside the weather record's
//! neighbourhood; areas up to 10⁷ ha keep volumes far from `f64::MAX`.
//! Where a bound is ours and not a published value it says "common
//! practice"; values recalled and not checked against the printed page say
//! "from memory".

use std::fmt;

/// One end of a range.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Bound {
    /// The end value itself is allowed.
    Inclusive(f64),
    /// Values must lie strictly beyond it.
    Exclusive(f64),
}

impl Bound {
    /// The end value.
    pub const fn value(self) -> f64 {
        match self {
            Self::Inclusive(v) | Self::Exclusive(v) => v,
        }
    }
}

/// A number for messages: plain for everyday magnitudes, in exponent form
/// for tiny and huge ones (`1e-300`, not three hundred zeros).
pub struct Num(pub f64);

impl fmt::Display for Num {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let v = self.0;
        let a = v.abs();
        if v.is_finite() && a != 0.0 && !(1e-4..1e6).contains(&a) {
            write!(f, "{v:e}")
        } else {
            write!(f, "{v}")
        }
    }
}

/// A closed, open or half-open range of numbers.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Range {
    /// Lower end.
    pub min: Bound,
    /// Upper end.
    pub max: Bound,
}

impl Range {
    /// `[min, max]`.
    pub const fn closed(min: f64, max: f64) -> Self {
        Self {
            min: Bound::Inclusive(min),
            max: Bound::Inclusive(max),
        }
    }

    /// `(min, max]`.
    pub const fn open_closed(min: f64, max: f64) -> Self {
        Self {
            min: Bound::Exclusive(min),
            max: Bound::Inclusive(max),
        }
    }

    /// `(min, max)`.
    pub const fn open(min: f64, max: f64) -> Self {
        Self {
            min: Bound::Exclusive(min),
            max: Bound::Exclusive(max),
        }
    }

    /// Whether `v` is a finite number inside the range.
    pub fn contains(&self, v: f64) -> bool {
        let above = match self.min {
            Bound::Inclusive(m) => v >= m,
            Bound::Exclusive(m) => v > m,
        };
        let below = match self.max {
            Bound::Inclusive(m) => v <= m,
            Bound::Exclusive(m) => v < m,
        };
        v.is_finite() && above && below
    }
}

impl fmt::Display for Range {
    /// `0.01 to 1`, `more than 0 and at most 100`, `between 0 and 100
    /// (both excluded)`.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match (self.min, self.max) {
            (Bound::Inclusive(a), Bound::Inclusive(b)) => write!(f, "{} to {}", Num(a), Num(b)),
            (Bound::Exclusive(a), Bound::Inclusive(b)) => {
                write!(f, "more than {} and at most {}", Num(a), Num(b))
            }
            (Bound::Inclusive(a), Bound::Exclusive(b)) => {
                write!(f, "at least {} and less than {}", Num(a), Num(b))
            }
            (Bound::Exclusive(a), Bound::Exclusive(b)) => {
                write!(f, "more than {} and less than {}", Num(a), Num(b))
            }
        }
    }
}

/// Where a value falls against its limit.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Verdict {
    /// Inside the usual range.
    Usual,
    /// Inside the physical range but outside the usual one: a warning.
    Unusual,
    /// Outside the physical range (or not a finite number): an error.
    Impossible,
}

/// The limits of one numeric input.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Limit {
    /// The field as the project file names it (e.g. `application_efficiency`).
    pub field: &'static str,
    /// The label shown to users (e.g. "Application efficiency Ea").
    pub label: &'static str,
    /// Unit in the file (e.g. "fraction", "ha", "mm/day"); `""` for a count
    /// or a pure number.
    pub unit: &'static str,
    /// Outside: an error.
    pub physical: Range,
    /// Outside (but physical): a warning.
    pub usual: Range,
    /// Source of the ranges, or "common practice".
    pub source: &'static str,
}

impl Limit {
    /// Where `value` falls.
    pub fn verdict(&self, value: f64) -> Verdict {
        if !self.physical.contains(value) {
            Verdict::Impossible
        } else if self.usual.contains(value) {
            Verdict::Usual
        } else {
            Verdict::Unusual
        }
    }

    /// The unit as a suffix for messages (`" ha"`, or nothing).
    pub fn unit_suffix(&self) -> String {
        if self.unit.is_empty() {
            String::new()
        } else {
            format!(" {}", self.unit)
        }
    }

    /// The physical range in words with its unit ("0.01 to 1 fraction").
    pub fn physical_text(&self) -> String {
        format!("{}{}", self.physical, self.unit_suffix())
    }

    /// The usual range in words with its unit.
    pub fn usual_text(&self) -> String {
        format!("{}{}", self.usual, self.unit_suffix())
    }

    /// The error text of a form field holding `value` outside the physical
    /// range ("must be 0.01 to 1 fraction"), or `None` inside it.
    pub fn form_error(&self, value: f64) -> Option<String> {
        (self.verdict(value) == Verdict::Impossible)
            .then(|| format!("{} must be {}", self.label, self.physical_text()))
    }
}

const EFFICIENCY_PHYSICAL: Range = Range::closed(0.01, 1.0);

/// Conveyance efficiency Ec of a canal reach.
pub const CONVEYANCE_EFFICIENCY: Limit = Limit {
    field: "conveyance_efficiency",
    label: "Conveyance efficiency Ec",
    unit: "fraction",
    physical: EFFICIENCY_PHYSICAL,
    usual: Range::closed(0.6, 0.95),
    source: "usual: FAO Irrigation Water Management Training Manual No. 4 (Brouwer, Prins & Heibloem 1989), conveyance efficiencies 60 % (long earthen canals in sand) to 95 % (lined canals), from memory; the physical floor of 1 % (common practice) keeps the gross requirement within 100 times the net at each level",
};

/// Field-canal efficiency Eb of a block.
pub const FIELD_CANAL_EFFICIENCY: Limit = Limit {
    field: "field_canal_efficiency",
    label: "Field-canal efficiency Eb",
    unit: "fraction",
    physical: EFFICIENCY_PHYSICAL,
    usual: Range::closed(0.65, 0.95),
    source: "usual: FAO-24 (Doorenbos & Pruitt 1977) after Bos & Nugteren (1974), field-canal efficiencies 0.7 to 0.9, from memory, widened by 0.05 either side (common practice); the physical floor of 1 % (common practice) keeps the gross requirement within 100 times the net at each level",
};

/// Field application efficiency Ea of a block's irrigation method.
pub const APPLICATION_EFFICIENCY: Limit = Limit {
    field: "application_efficiency",
    label: "Application efficiency Ea",
    unit: "fraction",
    physical: EFFICIENCY_PHYSICAL,
    usual: Range::closed(0.3, 0.95),
    source: "usual: FAO-24 (Doorenbos & Pruitt 1977) after Bos & Nugteren (1974), from 0.32 (rice) to 0.95 (localized), from memory; the physical floor of 1 % (common practice) keeps the gross requirement within 100 times the net at each level",
};

/// Paddy field efficiency (operational losses only).
pub const PADDY_FIELD_EFFICIENCY: Limit = Limit {
    field: "paddy field_efficiency",
    label: "Paddy field efficiency",
    unit: "fraction",
    physical: EFFICIENCY_PHYSICAL,
    usual: Range::closed(0.8, 0.95),
    source: "usual: common practice for an efficiency of operational losses only (the paddy NIR already holds percolation; see PaddyInputs); physical floor as for Ea",
};

/// Hours per day a canal runs.
pub const OPERATING_HOURS: Limit = Limit {
    field: "operating_hours_per_day",
    label: "Operating hours",
    unit: "h/day",
    physical: Range::closed(0.5, 24.0),
    usual: Range::closed(6.0, 24.0),
    source: "common practice: a day has 24 hours; below half an hour a day the required capacity (design flow × 24 ÷ hours) exceeds 48 times the design flow",
};

/// Existing capacity of a canal reach.
pub const EXISTING_CAPACITY_M3S: Limit = Limit {
    field: "existing_capacity_m3s",
    label: "Existing capacity",
    unit: "m³/s",
    physical: Range::open_closed(0.0, 5000.0),
    usual: Range::closed(0.005, 500.0),
    source: "common practice: the largest irrigation canals carry a few hundred m³/s; a field channel a few l/s; a capacity of 0 is no canal (leave the capacity out when it is not known)",
};

/// Area of a block.
pub const BLOCK_AREA_HA: Limit = Limit {
    field: "area_ha",
    label: "Block area",
    unit: "ha",
    physical: Range::open_closed(0.0, 1.0e7),
    usual: Range::closed(0.1, 5000.0),
    source: "common practice: one outlet commands from a fraction of a hectare to a few thousand hectares; 10⁷ ha (100,000 km²) is larger than any irrigated region served by one outlet",
};

/// A planting's area in hectares.
pub const PLANTING_AREA_HA: Limit = Limit {
    field: "area (ha)",
    label: "Planting area",
    unit: "ha",
    physical: Range::open_closed(0.0, 1.0e7),
    usual: Range::closed(0.01, 5000.0),
    source: "common practice, as the block area",
};

/// A planting's area as a share of its block.
pub const PLANTING_AREA_PCT: Limit = Limit {
    field: "area (% of block)",
    label: "Planting area",
    unit: "% of block",
    physical: Range::open_closed(0.0, 100.0),
    usual: Range::closed(0.5, 100.0),
    source: "common practice: a share of a block",
};

/// Days over which a planting is spread.
pub const SPREAD_DAYS: Limit = Limit {
    field: "spread_days",
    label: "Planting spread",
    unit: "days",
    physical: Range::closed(0.0, 365.0),
    usual: Range::closed(0.0, 60.0),
    source: "common practice: planting windows of a few days to two months; a cropping plan repeats every year",
};

/// Season length given on a planting (override of the crop library).
pub const SEASON_LENGTH_DAYS: Limit = Limit {
    field: "season_length_days",
    label: "Season length",
    unit: "days",
    physical: Range::closed(4.0, 365.0),
    usual: Range::closed(30.0, 365.0),
    source: "usual: FAO-56 (Allen et al. 1998) Table 11 season totals, about 35 days (radish) to a year (perennials); physical: the four FAO-56 stages need a day each, and a cropping plan repeats every year",
};

/// Refill trigger as a share of RAW.
pub const TRIGGER_PCT_OF_RAW: Limit = Limit {
    field: "strategy.trigger_pct_of_raw",
    label: "Refill trigger",
    unit: "% of RAW",
    physical: Range::open_closed(0.0, 100.0),
    usual: Range::closed(50.0, 100.0),
    source: "physical: FAO-56 (Allen et al. 1998) Ch. 8, no stress while depletion ≤ RAW (eq. 84); usual: common practice",
};

/// Days between irrigations of an interval schedule.
pub const INTERVAL_DAYS: Limit = Limit {
    field: "strategy.days",
    label: "Irrigation interval",
    unit: "days",
    physical: Range::closed(1.0, 365.0),
    usual: Range::closed(1.0, 30.0),
    source: "common practice",
};

/// Net depth of a fixed-depth schedule.
pub const NET_DEPTH_MM: Limit = Limit {
    field: "strategy.net_mm",
    label: "Net depth per irrigation",
    unit: "mm",
    physical: Range::open_closed(0.0, 1000.0),
    usual: Range::closed(5.0, 150.0),
    source: "common practice: a root zone holds at most a few hundred mm (FAO-56 Table 19 TAW × Table 22 Zr)",
};

/// Deficit trigger as a share of TAW.
pub const TRIGGER_PCT_OF_TAW: Limit = Limit {
    field: "strategy.trigger_pct_of_taw",
    label: "Deficit trigger",
    unit: "% of TAW",
    physical: Range::open(0.0, 100.0),
    usual: Range::closed(30.0, 90.0),
    source: "physical: a share of TAW (FAO-56 eq. 82) below TAW itself, where Ks reaches 0 (eq. 84) and the crop wilts; usual: common practice",
};

/// Share of the depletion replaced at each deficit irrigation.
pub const REFILL_PCT_OF_DEPLETION: Limit = Limit {
    field: "strategy.refill_pct_of_depletion",
    label: "Refill share",
    unit: "% of depletion",
    physical: Range::open_closed(0.0, 100.0),
    usual: Range::closed(50.0, 100.0),
    source: "common practice",
};

/// Paddy bund height.
pub const BUND_HEIGHT_MM: Limit = Limit {
    field: "paddy bund_height_mm",
    label: "Bund height",
    unit: "mm",
    physical: Range::open_closed(0.0, 1000.0),
    usual: Range::closed(100.0, 400.0),
    source: "common practice",
};

/// Paddy pond depth kept by irrigation.
pub const TARGET_PONDING_MM: Limit = Limit {
    field: "paddy target_ponding_mm",
    label: "Pond depth",
    unit: "mm",
    physical: Range::closed(0.0, 1000.0),
    usual: Range::closed(20.0, 200.0),
    source: "usual: FAO-56 (Allen et al. 1998) Table 14 note, 0.10–0.20 m in the initial stage; a standing layer of 50–100 mm through the season (FAO Training Manuals 3 and 4, from memory); physical: at most the bund height",
};

/// Paddy seepage and percolation.
pub const PERCOLATION_SEEPAGE_MM_DAY: Limit = Limit {
    field: "paddy percolation_seepage_mm_day",
    label: "Seepage and percolation",
    unit: "mm/day",
    physical: Range::closed(0.0, 100.0),
    usual: Range::closed(1.0, 10.0),
    source: "usual: about 1–2 mm/day on heavy clay to 6–10 mm/day on sandy soils (FAO Training Manuals 3 and 4, from memory); 3–6 mm/day (Sri Lanka Department of Agriculture, rice water management)",
};

/// Paddy land-preparation depth.
pub const LAND_PREPARATION_MM: Limit = Limit {
    field: "paddy land_preparation_mm",
    label: "Land preparation water",
    unit: "mm",
    physical: Range::closed(0.0, 2000.0),
    usual: Range::closed(100.0, 350.0),
    source: "usual: about 200 mm to saturate the puddled layer, 150–250 mm commonly quoted for presaturation (FAO Training Manuals 3 and 4, from memory), plus the water layer",
};

/// Paddy land-preparation duration.
pub const LAND_PREPARATION_DAYS: Limit = Limit {
    field: "paddy land_preparation_days",
    label: "Land preparation",
    unit: "days",
    physical: Range::closed(1.0, 120.0),
    usual: Range::closed(7.0, 60.0),
    source: "usual: preparation starts about one, sometimes two, months before transplanting (FAO Training Manual No. 4, Brouwer et al. 1989, Ch. 4); physical: 120 days (common practice) keeps preparation and season within the weather record's years",
};

/// Paddy nursery share of the planted area.
pub const NURSERY_SHARE: Limit = Limit {
    field: "paddy nursery_share",
    label: "Nursery share",
    unit: "fraction",
    physical: Range::closed(0.0, 1.0),
    usual: Range::closed(0.0, 0.15),
    source: "usual: the nursery is usually 5–10 % of the area to be planted (FAO Training Manual No. 4, Brouwer et al. 1989, Ch. 4)",
};

/// Days a paddy nursery is kept.
pub const NURSERY_DAYS: Limit = Limit {
    field: "paddy nursery_days",
    label: "Nursery",
    unit: "days",
    physical: Range::closed(1.0, 120.0),
    usual: Range::closed(10.0, 45.0),
    source: "common practice (seedlings are transplanted a few weeks old, from memory); physical as land preparation",
};

/// Days before harvest when a paddy is drained.
pub const DRAIN_DAYS_BEFORE_HARVEST: Limit = Limit {
    field: "paddy drain_days_before_harvest",
    label: "Drained before harvest",
    unit: "days",
    physical: Range::closed(0.0, 365.0),
    usual: Range::closed(0.0, 30.0),
    source: "common practice",
};

/// Fraction of the surface wetted (dual Kc).
pub const WETTED_FRACTION: Limit = Limit {
    field: "coefficients wetted_fraction",
    label: "Wetted fraction fw",
    unit: "fraction",
    physical: Range::open_closed(0.0, 1.0),
    usual: Range::closed(0.3, 1.0),
    source: "FAO-56 (Allen et al. 1998) Table 20: from 0.3 (trickle) to 1.0 (basin, border, sprinkler), from memory",
};

/// Station latitude.
pub const LATITUDE_DEG: Limit = Limit {
    field: "latitude_deg",
    label: "Latitude",
    unit: "°",
    physical: Range::closed(-90.0, 90.0),
    usual: Range::closed(-55.0, 60.0),
    source: "common practice: irrigated agriculture lies between about 55° S and 60° N",
};

/// Station elevation.
pub const ELEVATION_M: Limit = Limit {
    field: "elevation_m",
    label: "Elevation",
    unit: "m",
    physical: Range::closed(-450.0, 9000.0),
    usual: Range::closed(-100.0, 4500.0),
    source: "common practice: the lowest land is about 430 m below sea level, the highest summit under 9,000 m (the ET0 station check, et0::Et0Context, uses the same bounds)",
};

/// Height of the wind measurement.
pub const WIND_HEIGHT_M: Limit = Limit {
    field: "wind_height_m",
    label: "Wind height",
    unit: "m",
    physical: Range::closed(0.5, 100.0),
    usual: Range::closed(1.5, 10.0),
    source: "usual: FAO-56 (Allen et al. 1998) standard height 2 m (p. 56), weather stations 2 m or 10 m; physical: FAO-56 eq. 47 needs 67.8 z > 5.42, and below half a metre the crop itself shelters the sensor (common practice)",
};

/// Reservoir surface area in one month.
pub const RESERVOIR_AREA_HA: Limit = Limit {
    field: "surface_area_ha",
    label: "Reservoir surface area",
    unit: "ha",
    physical: Range::closed(0.0, 1.0e7),
    usual: Range::closed(0.0, 200_000.0),
    source: "common practice: the largest reservoirs cover under 10⁶ ha",
};

/// Reservoir water temperature in one month.
pub const WATER_TEMPERATURE_C: Limit = Limit {
    field: "water_temperature_c",
    label: "Water temperature",
    unit: "°C",
    physical: Range::closed(-5.0, 50.0),
    usual: Range::closed(0.0, 35.0),
    source: "common practice",
};

/// Non-exceedance probability of the design flow.
pub const DESIGN_PROBABILITY_PCT: Limit = Limit {
    field: "design_probability_pct",
    label: "Design probability",
    unit: "%",
    physical: Range::open(0.0, 100.0),
    usual: Range::closed(50.0, 95.0),
    source: "usual: 80 % is the usual design dependability (DESIGN.md), 75–90 % common practice; physical: a probability strictly between 0 and 100 (Weibull positions m/(n+1))",
};

/// First month of the irrigation year.
pub const YEAR_START_MONTH: Limit = Limit {
    field: "irrigation_year_start_month",
    label: "Irrigation year starts in month",
    unit: "",
    physical: Range::closed(1.0, 12.0),
    usual: Range::closed(1.0, 12.0),
    source: "a month number",
};

/// Length of a rotation cycle.
pub const ROTATION_PERIOD_DAYS: Limit = Limit {
    field: "rotation_period_days",
    label: "Rotation period",
    unit: "days",
    physical: Range::closed(1.0, 365.0),
    usual: Range::closed(2.0, 21.0),
    source: "common practice: rotation cycles of a few days to three weeks",
};

/// Fixed share of rain taken as effective.
pub const FIXED_EFFECTIVE_RAIN_PCT: Limit = Limit {
    field: "effective_rain",
    label: "Effective rain (fixed %)",
    unit: "%",
    physical: Range::closed(0.0, 100.0),
    usual: Range::closed(50.0, 90.0),
    source: "common practice: a fixed 70–80 % is often used",
};

/// Available supply flow at a node.
pub const AVAILABLE_FLOW_M3S: Limit = Limit {
    field: "flow (m³/s)",
    label: "Available flow",
    unit: "m³/s",
    physical: Range::closed(0.0, 5000.0),
    usual: Range::closed(0.0, 500.0),
    source: "common practice, as the canal capacity",
};

/// Longest gap filled by interpolation.
pub const MAX_INTERPOLATION_DAYS: Limit = Limit {
    field: "gap_filling.max_interpolation_days",
    label: "Longest gap interpolated",
    unit: "days",
    physical: Range::closed(0.0, 366.0),
    usual: Range::closed(0.0, 7.0),
    source: "common practice: linear interpolation is trusted for gaps of a few days",
};

/// Cycle of a rotation within the block, or of continuous flow (days).
pub const DELIVERY_CYCLE_DAYS: Limit = Limit {
    field: "delivery.cycle_days",
    label: "Delivery cycle",
    unit: "days",
    physical: Range::closed(1.0, 30.0),
    usual: Range::closed(4.0, 15.0),
    source: "physical: at most a month (DESIGN.md \"Delivery\"); usual: turns every 4 to 15 days under surface irrigation (common practice)",
};

/// Smallest depletion worth a turn of a rotation within the block (mm).
pub const MIN_TURN_DEPTH_MM: Limit = Limit {
    field: "delivery.min_depth_mm",
    label: "Smallest turn",
    unit: "mm",
    physical: Range::closed(0.0, 500.0),
    usual: Range::closed(0.0, 50.0),
    source: "common practice: a surface turn applies at least a few centimetres; more than TAW would never be reached",
};

/// Stream size of a block's outlet (l/s).
pub const OUTLET_STREAM_SIZE_LS: Limit = Limit {
    field: "outlet_stream_size_ls",
    label: "Outlet stream size",
    unit: "l/s",
    physical: Range::open_closed(0.0, 100_000.0),
    usual: Range::closed(5.0, 5_000.0),
    source: "physical: a positive flow up to 100 m³/s; usual: farm and block outlets of 5 l/s to 5 m³/s (common practice)",
};

/// Every limit of the table (for the help page and tests).
pub const ALL: &[&Limit] = &[
    &CONVEYANCE_EFFICIENCY,
    &FIELD_CANAL_EFFICIENCY,
    &APPLICATION_EFFICIENCY,
    &PADDY_FIELD_EFFICIENCY,
    &OPERATING_HOURS,
    &EXISTING_CAPACITY_M3S,
    &BLOCK_AREA_HA,
    &PLANTING_AREA_HA,
    &PLANTING_AREA_PCT,
    &SPREAD_DAYS,
    &SEASON_LENGTH_DAYS,
    &TRIGGER_PCT_OF_RAW,
    &INTERVAL_DAYS,
    &NET_DEPTH_MM,
    &TRIGGER_PCT_OF_TAW,
    &REFILL_PCT_OF_DEPLETION,
    &BUND_HEIGHT_MM,
    &TARGET_PONDING_MM,
    &PERCOLATION_SEEPAGE_MM_DAY,
    &LAND_PREPARATION_MM,
    &LAND_PREPARATION_DAYS,
    &NURSERY_SHARE,
    &NURSERY_DAYS,
    &DRAIN_DAYS_BEFORE_HARVEST,
    &WETTED_FRACTION,
    &LATITUDE_DEG,
    &ELEVATION_M,
    &WIND_HEIGHT_M,
    &RESERVOIR_AREA_HA,
    &WATER_TEMPERATURE_C,
    &DESIGN_PROBABILITY_PCT,
    &YEAR_START_MONTH,
    &ROTATION_PERIOD_DAYS,
    &FIXED_EFFECTIVE_RAIN_PCT,
    &AVAILABLE_FLOW_M3S,
    &MAX_INTERPOLATION_DAYS,
    &DELIVERY_CYCLE_DAYS,
    &MIN_TURN_DEPTH_MM,
    &OUTLET_STREAM_SIZE_LS,
];

/// Longest id (canal, block, planting) or scenario name, in characters.
/// Ids are written into every row of the result tables; 64 characters hold
/// any name an engineer gives an outlet (common practice) and keep a
/// 10,000-block project's tables within their usual size.
pub const ID_MAX_CHARS: usize = 64;

/// Why an id is refused.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum IdProblem {
    /// Empty or only spaces.
    Empty,
    /// Longer than [`ID_MAX_CHARS`] characters (the count given).
    TooLong(usize),
    /// Holds a control character (a line break, a tab, …).
    ControlCharacter,
    /// Starts or ends with a space.
    OuterSpace,
}

impl fmt::Display for IdProblem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::Empty => f.write_str("is empty"),
            Self::TooLong(n) => write!(
                f,
                "is {n} characters long; at most {ID_MAX_CHARS} are allowed"
            ),
            Self::ControlCharacter => {
                f.write_str("holds a control character (line break, tab…); use letters, digits, spaces and punctuation")
            }
            Self::OuterSpace => f.write_str("starts or ends with a space"),
        }
    }
}

/// The problem of an id, if any: not empty, at most [`ID_MAX_CHARS`]
/// characters, no control characters, no leading or trailing space.
pub fn check_id(id: &str) -> Option<IdProblem> {
    if id.trim().is_empty() {
        return Some(IdProblem::Empty);
    }
    let n = id.chars().count();
    if n > ID_MAX_CHARS {
        return Some(IdProblem::TooLong(n));
    }
    if id.chars().any(char::is_control) {
        return Some(IdProblem::ControlCharacter);
    }
    if id.trim() != id {
        return Some(IdProblem::OuterSpace);
    }
    None
}

#[cfg(test)]
#[allow(clippy::float_cmp, reason = "range ends are compared as written")]
mod tests {
    use super::*;

    #[test]
    fn every_usual_range_lies_inside_its_physical_range() {
        for l in ALL {
            for end in [l.usual.min.value(), l.usual.max.value()] {
                let inside = l.physical.contains(end)
                    || end == l.physical.min.value()
                    || end == l.physical.max.value();
                assert!(inside, "{}: usual end {end} outside physical", l.field);
            }
            assert!(!l.label.is_empty() && !l.source.is_empty(), "{}", l.field);
        }
    }

    #[test]
    fn verdicts_at_the_ends_of_a_range() {
        let l = APPLICATION_EFFICIENCY;
        assert_eq!(l.verdict(0.01), Verdict::Unusual);
        assert_eq!(l.verdict(0.009_999), Verdict::Impossible);
        assert_eq!(l.verdict(1.0), Verdict::Unusual);
        assert_eq!(l.verdict(1.000_001), Verdict::Impossible);
        assert_eq!(l.verdict(0.3), Verdict::Usual);
        assert_eq!(l.verdict(0.95), Verdict::Usual);
        assert_eq!(l.verdict(f64::NAN), Verdict::Impossible);
        assert_eq!(l.verdict(1e-300), Verdict::Impossible);
        let p = DESIGN_PROBABILITY_PCT;
        assert_eq!(p.verdict(0.0), Verdict::Impossible);
        assert_eq!(p.verdict(100.0), Verdict::Impossible);
        assert_eq!(p.verdict(99.9), Verdict::Unusual);
        assert_eq!(p.verdict(80.0), Verdict::Usual);
    }

    #[test]
    fn range_words() {
        assert_eq!(Range::closed(0.01, 1.0).to_string(), "0.01 to 1");
        assert_eq!(
            Range::open(0.0, 100.0).to_string(),
            "more than 0 and less than 100"
        );
        assert_eq!(
            APPLICATION_EFFICIENCY.form_error(0.0).as_deref(),
            Some("Application efficiency Ea must be 0.01 to 1 fraction")
        );
    }

    #[test]
    fn ids() {
        assert_eq!(check_id("B-12 left"), None);
        assert_eq!(check_id(""), Some(IdProblem::Empty));
        assert_eq!(check_id("   "), Some(IdProblem::Empty));
        assert_eq!(check_id(&"x".repeat(64)), None);
        assert_eq!(check_id(&"x".repeat(65)), Some(IdProblem::TooLong(65)));
        assert_eq!(check_id(&"é".repeat(64)), None);
        assert_eq!(check_id("a\nb"), Some(IdProblem::ControlCharacter));
        assert_eq!(check_id(" a"), Some(IdProblem::OuterSpace));
    }
}
