//! The methods and sources, and the cautions, as plain text: one home for
//! the app's help windows and the design report.

/// The one-line caution shown in the status bar.
pub const CAUTION_LINE: &str = "Planning estimates only — canal and structure designs must be checked by a qualified engineer.";

/// The cautions, one paragraph each.
pub const CAUTIONS: [&str; 5] = [
    "Results of Offtake are planning estimates. They are computed from the weather record, \
     crop and soil parameters and efficiencies you enter, with published methods that carry \
     their own uncertainty.",
    "Canal and structure designs must be checked by a qualified engineer against local codes, \
     measured data (flows, seepage, field efficiencies, soils) and licensed practice before \
     anything is built or operated.",
    "Under-sized canals cost crops: a canal that cannot carry the peak demand leaves the tail \
     blocks short in the weeks that matter most. Over-topped canals flood land and can breach \
     their banks.",
    "Design flows are statistics of the years in the weather record. A short record, a record \
     with many filled days, or a climate that has changed since the record was taken makes them \
     less dependable than their stated probability.",
    "Efficiencies (field application, field canals, conveyance) dominate gross requirements. Use \
     measured values where you have them; the defaults are only starting points.",
];

/// One method entry: what it computes, the method, the source with equation numbers.
pub struct MethodEntry {
    /// What the method computes.
    pub quantity: &'static str,
    /// The method and the equations used.
    pub method: &'static str,
    /// The publication.
    pub source: &'static str,
}

const FAO56: &str = "Allen, R.G., Pereira, L.S., Raes, D. and Smith, M. (1998). Crop evapotranspiration — \
     Guidelines for computing crop water requirements. FAO Irrigation and Drainage Paper 56. FAO, Rome.";

/// The methods Offtake uses, in the order of the computation chain.
pub const METHODS: [MethodEntry; 16] = [
    MethodEntry {
        quantity: "Reference evapotranspiration ET₀ (mm/day)",
        method: "FAO-56 Penman–Monteith, eq. 6, with the Chapter 3 auxiliaries: atmospheric pressure \
                 (eq. 7), psychrometric constant (eq. 8), saturation and actual vapour pressure \
                 (eq. 11–19), slope of the vapour pressure curve (eq. 13), extraterrestrial radiation \
                 and daylight hours (eq. 21–25, 34), solar radiation from sunshine (eq. 35) or from \
                 the temperature range (eq. 50), clear-sky radiation (eq. 36–37), net radiation \
                 (eq. 38–40), soil heat flux (eq. 42–44), wind speed at 2 m from another height \
                 (eq. 47). Hourly steps: eq. 53.",
        source: FAO56,
    },
    MethodEntry {
        quantity: "ET₀ from temperature only",
        method: "Hargreaves–Samani, ET₀ = 0.0023 (Tmean + 17.8) (Tmax − Tmin)^0.5 Ra (FAO-56 eq. 52).",
        source: "Hargreaves, G.H. and Samani, Z.A. (1985). Reference crop evapotranspiration from \
                 temperature. Applied Engineering in Agriculture 1(2), 96–99; and FAO-56 eq. 52.",
    },
    MethodEntry {
        quantity: "Standardized reference ET (short and tall crop)",
        method: "ASCE-EWRI standardized reference evapotranspiration equation, daily constants \
                 Cn and Cd for the short (grass) and tall (alfalfa) references.",
        source: "ASCE-EWRI (2005). The ASCE Standardized Reference Evapotranspiration Equation. \
                 Allen, R.G. et al. (eds.), American Society of Civil Engineers, Reston, VA.",
    },
    MethodEntry {
        quantity: "Open-water evaporation (storage reservoirs)",
        method: "Meyer and Rohwer mass-transfer formulas, wind adjusted to their reference height \
                 with the 1/7 power law; Penman open-water equation.",
        source: "Meyer, A.F. (1915). Computing run-off from rainfall and other physical data. \
                 Transactions ASCE 79; Rohwer, C. (1931). Evaporation from free water surfaces. \
                 USDA Technical Bulletin 271.",
    },
    MethodEntry {
        quantity: "Crop evapotranspiration ETc, single coefficient",
        method: "ETc = Kc ET₀ with the four-stage Kc curve (FAO-56 eq. 66); Kc mid and Kc end \
                 adjusted for wind and minimum humidity (eq. 62 and eq. 65); Kc ini from the \
                 wetting interval (Chapter 6).",
        source: FAO56,
    },
    MethodEntry {
        quantity: "Crop evapotranspiration, dual coefficient (option)",
        method: "Kc = Kcb + Ke, basal crop coefficient plus soil evaporation coefficient (FAO-56 \
                 Chapter 7).",
        source: FAO56,
    },
    MethodEntry {
        quantity: "Root-zone water balance and NIR",
        method: "FAO-56 Chapter 8: total and readily available water TAW and RAW, depletion \
                 fraction p adjusted for ETc, water stress coefficient Ks (eq. 84), daily \
                 root-zone depletion balance (eq. 85) with its limits (eq. 86–87), deep \
                 percolation (eq. 88), runoff; paddy rice with land preparation, percolation \
                 and ponding.",
        source: FAO56,
    },
    MethodEntry {
        quantity: "Effective rainfall",
        method: "From the root-zone water balance (default); USDA-SCS method; a fixed percentage; \
                 dependable rain (the depth equalled or exceeded in the chosen share of years).",
        source: "USDA-SCS (1993). Irrigation Water Requirements. National Engineering Handbook, \
                 Part 623, Chapter 2. Soil Conservation Service, Washington DC.",
    },
    MethodEntry {
        quantity: "Yield response to water deficit",
        method: "1 − Ya/Ym = Ky (1 − ETc adj / ETc) (FAO-56 eq. 90) with the yield response \
                 factors Ky of FAO-33.",
        source: "Doorenbos, J. and Kassam, A.H. (1979). Yield response to water. FAO Irrigation \
                 and Drainage Paper 33. FAO, Rome; and FAO-56 eq. 90.",
    },
    MethodEntry {
        quantity: "Leaching requirement",
        method: "Leaching requirement from the salinity of the irrigation water and the crop's \
                 salinity threshold (FAO-29).",
        source: "Ayers, R.S. and Westcot, D.W. (1985). Water quality for agriculture. FAO \
                 Irrigation and Drainage Paper 29 Rev. 1. FAO, Rome.",
    },
    MethodEntry {
        quantity: "Non-exceedance probabilities",
        method: "Weibull plotting positions m/(n+1) of the ranked yearly values, interpolated \
                 between positions; incomplete years at the ends of the record are left out.",
        source: "Weibull, W. (1939). A statistical theory of the strength of materials. \
                 Ingeniörsvetenskapsakademiens Handlingar 151, Stockholm.",
    },
    MethodEntry {
        quantity: "Gross requirement and canal demand",
        method: "Block GIR = NIR ÷ (Ea × Eb), with Ea the field application efficiency and Eb \
                 the field-canal efficiency; a canal's demand = Σ of its children ÷ its \
                 conveyance efficiency Ec. Distribution efficiency is Eb × the Ec's and is \
                 never applied twice. 10-day periods are days 1–10, 11–20 and 21–end of month.",
        source: "Offtake definitions (DESIGN.md), following the efficiency terms of FAO-56 \
                 Chapter 8.",
    },
    MethodEntry {
        quantity: "Design flow, duty, capacity",
        method: "Design flow of a node = the chosen non-exceedance probability (default 80 %) of \
                 the yearly peak 10-day mean flow (Weibull positions); monthly or daily basis \
                 optional. Duty = design flow ÷ area commanded. Required capacity = design \
                 flow × 24 ÷ hours of operation per day.",
        source: "Offtake definitions (DESIGN.md).",
    },
    MethodEntry {
        quantity: "Uncertainty of a design flow",
        method: "Distribution-free confidence interval of the quantile from the order statistics \
                 of the yearly peaks: P(X(l) ≤ x_p ≤ X(u)) = B(u − 1; n, p) − B(l − 1; n, p), \
                 B the binomial distribution function; equal tails of at most (1 − level)/2 \
                 each (90 % by default), so the achieved coverage is at least the nominal level. \
                 A bound that no order statistic reaches is left open (beyond the record).",
        source: "Hahn, G.J. and Meeker, W.Q. (1991). Statistical Intervals: A Guide for \
                 Practitioners. Wiley, New York (chapter 5, distribution-free intervals; \
                 chapter from memory).",
    },
    MethodEntry {
        quantity: "Starting values of new canals and blocks",
        method: "A new canal starts at Ec 90 % and 24 h/day; a new block at surface irrigation \
                 with Ea 60 % and Eb 80 %. They are typical values for a first layout, shown \
                 as such in the inspector, to be replaced by the scheme's own.",
        source: "Common practice; Ea after Brouwer, C. et al. (1989), Irrigation Water \
                 Management: Irrigation Scheduling, FAO Training Manual 4, and the canal \
                 ranges of Bos, M.G. and Nugteren, J. (1974), On irrigation efficiencies, \
                 ILRI Publication 19 (both from memory: check against the printed tables).",
    },
    MethodEntry {
        quantity: "Relative water supply",
        method: "Relative irrigation supply = delivered ÷ irrigation demand; relative water \
                 supply = (irrigation + rain) ÷ (ETc + seepage and percolation).",
        source: "Levine, G. (1982). Relative water supply: an explanatory variable for irrigation \
                 systems. Technical Report No. 6, Cornell University, Ithaca, NY.",
    },
];
