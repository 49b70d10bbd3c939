//! `offtake planting --weather FILE.csv --lat DEG --elevation M
//! [--wind-height M] --crop ID --plant YYYY-MM-DD [--every-year] [--soil ID]
//! [--strategy refill|interval|depth|deficit|rainfed] [--dual-kc]
//! [--wetting surface|sprinkler|furrow|drip] [--kc-ini-table] [--out FILE.csv]`
//!
//! Reads the weather file through the common importer, computes ET₀ (FAO-56
//! Penman–Monteith with the missing-data procedures), u2 from the wind height
//! (FAO-56 eq. 47) and RHmin (measured, else FAO-56 eq. 63 from the dewpoint,
//! else eq. 64 from Tmin), runs the planting (`offtake_core::planting`) and
//! prints the totals of each season. `--out` writes the daily table of every
//! season as CSV: `date,et0_mm,kc,etc_mm,etc_adj_mm,rain_mm,peff_mm,
//! irrigation_mm,runoff_mm,deep_perc_mm,depletion_mm,taw_mm,raw_mm,ks,season`
//! (depletion at the end of the day; `season` is the year of the season's
//! first planting date). With `--dual-kc` (FAO-56 dual coefficient Kcb + Ke
//! with the soil evaporation layer; `--wetting` gives the FAO-56 Table 20
//! fraction wetted by irrigation, default sprinkler) two columns follow:
//! `kcb,ke` (`kc` is then Kcb + Ke).
//!
//! The balance needs every day: a missing day, a day whose ET₀ cannot be
//! computed, or a blank rain stops the command with `file:line:column`.

use std::collections::HashMap;
use std::fmt::Write as _;
use std::path::PathBuf;

use anyhow::{Context, Result, bail};
use chrono::{Datelike, NaiveDate};
use clap::Args as ClapArgs;
use offtake_core::balance::Strategy;
use offtake_core::crop::climate::{rhmin_from_dewpoint_pct, rhmin_from_tmin_pct};
use offtake_core::et0::wind::wind_2m_ms;
use offtake_core::et0::{Et0Context, Et0Options};
use offtake_core::gapfill::{GapFillOptions, repair_for_daily_balance};
use offtake_core::planting::{
    CoefficientMode, KcIniRule, PlantingSpec, PlantingWarning, PlantingWeather, SeasonSummary,
    Wetting, run_planting, season_detail,
};
use offtake_io::library::Libraries;
use offtake_io::weather::SourceLocation;

use crate::cmd_weather_check::{DateFormatArg, read_series, site_from_args, write_atomically};

/// Header of the daily table written by `--out` (a stable contract).
pub const DAILY_HEADER: &str = "date,et0_mm,kc,etc_mm,etc_adj_mm,rain_mm,peff_mm,irrigation_mm,runoff_mm,deep_perc_mm,depletion_mm,taw_mm,raw_mm,ks,season";

/// Columns appended to [`DAILY_HEADER`] with `--dual-kc`.
pub const DUAL_COLUMNS: &str = "kcb,ke";

/// Arguments of `offtake planting`.
#[derive(Debug, ClapArgs)]
pub struct Args {
    /// Weather CSV file.
    #[arg(long)]
    pub weather: PathBuf,
    /// Station latitude in decimal degrees (north positive).
    #[arg(long, allow_hyphen_values = true)]
    pub lat: f64,
    /// Station elevation above sea level (m).
    #[arg(long, allow_hyphen_values = true)]
    pub elevation: f64,
    /// Wind measurement height above the ground (m); default: the mapping's
    /// stated height, else 2 m.
    #[arg(long)]
    pub wind_height: Option<f64>,
    /// Crop id in the crop library (e.g. maize-grain).
    #[arg(long)]
    pub crop: String,
    /// Planting date, YYYY-MM-DD.
    #[arg(long)]
    pub plant: String,
    /// Repeat the planting date (month and day) in every year of the record.
    #[arg(long)]
    pub every_year: bool,
    /// Soil id in the soil library.
    #[arg(long, default_value = "loam")]
    pub soil: String,
    /// Irrigation strategy: refill (at 100 % of RAW), interval, depth, deficit, rainfed.
    #[arg(long, default_value = "refill")]
    pub strategy: String,
    /// Use the FAO-56 dual crop coefficient (Kcb + Ke, soil evaporation
    /// layer) instead of the single Kc; adds the columns kcb,ke to --out.
    #[arg(long)]
    pub dual_kc: bool,
    /// Fraction of the surface wetted by irrigation (FAO-56 Table 20):
    /// surface, sprinkler, furrow, furrow-wide-bed, alternate-furrow, drip.
    /// Used for Kc ini from the wetting interval (FAO-56 eq. 60–61) and, with
    /// --dual-kc, for the soil evaporation layer. Default sprinkler.
    #[arg(long)]
    pub wetting: Option<String>,
    /// Keep the Table 12 Kc ini instead of deriving it from the wetting
    /// events of each initial stage (FAO-56 eq. 59–61).
    #[arg(long)]
    pub kc_ini_table: bool,
    /// Output CSV file for the daily table (written atomically).
    #[arg(long)]
    pub out: Option<PathBuf>,
    /// Column mapping file (RON) for files not using Offtake's column names.
    #[arg(long)]
    pub mapping: Option<PathBuf>,
    /// Date format when the file's dates are day/month or month/day ordered.
    #[arg(long, value_enum)]
    pub date_format: Option<DateFormatArg>,
}

/// Daily series aligned from the first day of the file.
struct Series {
    start: NaiveDate,
    et0: Vec<f64>,
    rain: Vec<f64>,
    u2: Vec<f64>,
    rhmin: Vec<f64>,
    /// Mean temperature of the record's coldest month (°C), for the season
    /// plausibility check.
    coldest_month_c: Option<f64>,
}

fn read_weather(args: &Args) -> Result<Series> {
    let imported = read_series(&args.weather, args.mapping.as_deref(), args.date_format)?;
    for w in &imported.warnings {
        eprintln!("{w}");
    }
    let wind_height = args.wind_height.or(imported.wind_height_m);
    let site = site_from_args(Some(args.lat), Some(args.elevation), wind_height)?
        .context("station site")?;
    let context = Et0Context::new(&site, &Et0Options::default()).context("station site")?;
    let file = args.weather.display().to_string();
    let at = |line: u64| SourceLocation {
        file: file.clone(),
        line,
        column: 1,
    };
    if imported.days.is_empty() {
        bail!("{}: no data rows", at(2));
    }
    // Line of each imported date, for messages about days that were read.
    let line_of: HashMap<NaiveDate, u64> = imported
        .days
        .iter()
        .map(|d| d.date)
        .zip(imported.lines.iter().copied())
        .collect();
    // The water balance needs every day: impossible days are blanked and, with
    // the absent dates, filled as the engine does (interpolation up to 3 days,
    // FAO-56 missing-data procedures beyond); each is reported.
    // Values beyond the station limits (the series' day-of-year climatology
    // ± 5 standard deviations, as `offtake run` does by default) are treated
    // as missing and filled like gaps.
    let screened = offtake_core::station_limits::screen_station_limits(
        &imported.days,
        &offtake_core::station_limits::StationLimits::default(),
        GapFillOptions::default().climatology_half_window_days,
    )
    .context("station limits")?;
    for o in &screened.out_of_limits {
        let line = line_of.get(&o.date).copied().unwrap_or(1);
        eprintln!(
            "{}: warning: {}: {} = {} is outside {:.1} to {:.1} ({}); treated as missing and filled",
            at(line),
            o.date,
            o.variable,
            o.value,
            o.low,
            o.high,
            o.source.label()
        );
    }
    let repaired = repair_for_daily_balance(&screened.days, &GapFillOptions::default(), |d| {
        context.et0_mm_day(d).map(|_| ()).map_err(|e| e.to_string())
    })
    .context("filling the gaps of the weather record")?;
    for (date, reason) in &repaired.rejected {
        let line = line_of.get(date).copied().unwrap_or(1);
        eprintln!(
            "{}: warning: {date}: {reason}; the day is treated as missing and filled",
            at(line)
        );
    }
    if repaired.inserted_days > 0 || repaired.filled_days > 0 {
        eprintln!(
            "{file}: warning: {} absent date(s) added and values filled on {} day(s) (linear interpolation up to 3 days, FAO-56 missing-data procedures beyond)",
            repaired.inserted_days, repaired.filled_days
        );
    }
    let days = &repaired.filled.days;
    let start = days[0].date;
    let n = days.len();
    let mut s = Series {
        start,
        et0: Vec::with_capacity(n),
        rain: Vec::with_capacity(n),
        u2: Vec::with_capacity(n),
        rhmin: Vec::with_capacity(n),
        coldest_month_c: offtake_core::project::plausibility::coldest_month_mean_c(days),
    };
    let mut blank_rain: Vec<NaiveDate> = Vec::new();
    for day in days {
        let where_ = line_of
            .get(&day.date)
            .map_or_else(|| format!("{file} (filled day)"), |&l| at(l).to_string());
        let et0 = context
            .et0_mm_day(day)
            .map_err(|e| anyhow::anyhow!("{where_}: {}: ET0 cannot be computed: {e}", day.date))?;
        let rain = match day.rain_mm {
            Some(r) if r.is_finite() && r >= 0.0 => r,
            Some(r) => bail!(
                "{where_}: {}: rain_mm found {r}; expected a depth of 0 mm or more",
                day.date
            ),
            None => {
                blank_rain.push(day.date);
                0.0
            }
        };
        let u2 = match day.wind_ms {
            Some(w) => wind_2m_ms(w, site.wind_height_m).unwrap_or(f64::NAN),
            None => f64::NAN,
        };
        let rhmin = match (day.rhmin_pct, day.tdew_c, day.tmin_c, day.tmax_c) {
            (Some(rh), _, _, _) => rh,
            (None, Some(td), _, Some(tx)) => rhmin_from_dewpoint_pct(td, tx).unwrap_or(f64::NAN),
            (None, None, Some(tn), Some(tx)) => {
                rhmin_from_tmin_pct(tn, tx, false).unwrap_or(f64::NAN)
            }
            _ => f64::NAN,
        };
        s.et0.push(et0);
        s.rain.push(rain);
        s.u2.push(u2);
        s.rhmin.push(rhmin);
    }
    if let Some(first) = blank_rain.first() {
        let place = line_of
            .get(first)
            .map_or_else(|| format!("{file} (filled day)"), |&l| at(l).to_string());
        eprintln!(
            "{place}: warning: rain_mm blank on {first}, taken as 0 mm ({} day(s) in all); rain is never interpolated",
            blank_rain.len()
        );
    }
    Ok(s)
}

fn parse_date(text: &str) -> Result<NaiveDate> {
    NaiveDate::parse_from_str(text.trim(), "%Y-%m-%d").map_err(|_| {
        anyhow::anyhow!("--plant: found \"{text}\", expected a calendar date YYYY-MM-DD")
    })
}

fn season_line(s: &SeasonSummary) -> String {
    format!(
        "{:>6}  {} to {}  {:>8.1} {:>8.1} {:>7.1} {:>7.1} {:>8.1} {:>5.1} {:>7.1} {:>7.1} {:>6.1}{}",
        s.year,
        s.start,
        s.end,
        s.etc_mm,
        s.etc_adj_mm,
        s.rain_mm,
        s.peff_mm,
        s.nir_mm,
        s.irrigation_count,
        s.deep_perc_mm,
        s.runoff_mm,
        100.0 * s.relative_yield_loss,
        if s.complete {
            ""
        } else {
            "  cut by the record: excluded from statistics"
        }
    )
}

/// Runs the command.
///
/// # Errors
/// An unknown crop, soil or strategy, a bad date, unreadable or incomplete
/// weather, a computation error, or a failed write.
pub fn run(args: &Args) -> Result<()> {
    let libs = Libraries::builtin().context("built-in libraries")?;
    let Some(crop) = libs.crop(&args.crop) else {
        let ids: Vec<&str> = libs.crops.iter().map(|c| c.id.as_str()).collect();
        bail!(
            "--crop: unknown crop id \"{}\"; valid ids: {}",
            args.crop,
            ids.join(", ")
        );
    };
    let Some(soil) = libs.soil(&args.soil) else {
        let ids: Vec<&str> = libs.soils.iter().map(|s| s.id.as_str()).collect();
        bail!(
            "--soil: unknown soil id \"{}\"; valid ids: {}",
            args.soil,
            ids.join(", ")
        );
    };
    let strategy: Strategy = args
        .strategy
        .parse()
        .map_err(|e| anyhow::anyhow!("--strategy: {e}"))?;
    let wetting: Wetting = match &args.wetting {
        Some(w) => w.parse().map_err(|e| anyhow::anyhow!("--wetting: {e}"))?,
        None => Wetting::Sprinkler,
    };
    let coefficients = if args.dual_kc {
        CoefficientMode::Dual { wetting }
    } else {
        CoefficientMode::Single
    };
    let plant = parse_date(&args.plant)?;
    let series = read_weather(args)?;
    if let Some(why) =
        offtake_core::project::plausibility::row_mismatch(crop, args.lat, series.coldest_month_c)
    {
        eprintln!(
            "warning: season plausibility: crop {}: stage lengths are the FAO-56 Table 11 row \"{}\"; {why}. The season may be much longer or shorter at this station: check the stage lengths against local observations or a row for the station's region",
            crop.id, crop.stages_region
        );
    }
    let weather = PlantingWeather {
        start: series.start,
        et0_mm: &series.et0,
        rain_mm: &series.rain,
        wind_2m_ms: &series.u2,
        rhmin_pct: &series.rhmin,
    };
    let spec = PlantingSpec {
        strategy,
        coefficients,
        irrigation_wetting: wetting,
        kc_ini: if args.kc_ini_table {
            KcIniRule::Table12
        } else {
            KcIniRule::FromWetting
        },
        only_year: (!args.every_year).then_some(plant.year()),
        ..PlantingSpec::new(crop, soil, plant.month(), plant.day())
    };
    let result = run_planting(&spec, &weather).context("planting")?;
    if result.seasons.is_empty() {
        bail!(
            "--plant: no season planted on {} falls within the weather record ({} to {})",
            if args.every_year {
                format!("{:02}-{:02} of any year", plant.month(), plant.day())
            } else {
                plant.to_string()
            },
            series.start,
            series.start + chrono::Days::new(series.et0.len() as u64 - 1)
        );
    }
    for w in &result.warnings {
        match w {
            PlantingWarning::SeasonCut { .. } => {}
            other => eprintln!("warning: {other}"),
        }
    }

    let dual_used = args.dual_kc
        && !result
            .warnings
            .iter()
            .any(|w| matches!(w, PlantingWarning::DualCoefficientNotUsed { .. }));
    let mut text = String::new();
    let _ = writeln!(
        text,
        "planting: {} ({}) on {} ({}), strategy {}, {}{}",
        crop.name,
        crop.id,
        soil.name,
        soil.id,
        spec.strategy,
        if args.every_year {
            format!("planted {:02}-{:02} every year", plant.month(), plant.day())
        } else {
            format!("planted {plant}")
        },
        match coefficients {
            CoefficientMode::Dual { .. } if !dual_used => {
                ", single Kc (dual coefficient not used: see the warning)".to_string()
            }
            CoefficientMode::Dual { wetting } => format!(
                ", dual crop coefficient (wetting {wetting}, fw {:.2})",
                wetting.fw()
            ),
            CoefficientMode::Single => String::new(),
        }
    );
    let _ = writeln!(
        text,
        "{:>6}  {:<24}  {:>8} {:>8} {:>7} {:>7} {:>8} {:>5} {:>7} {:>7} {:>6}",
        "season", "dates", "ETc", "ETc adj", "rain", "Peff", "net irr", "irr n", "DP", "RO", "loss"
    );
    let _ = writeln!(
        text,
        "{:>6}  {:<24}  {:>8} {:>8} {:>7} {:>7} {:>8} {:>5} {:>7} {:>7} {:>6}",
        "", "", "mm", "mm", "mm", "mm", "mm", "count", "mm", "mm", "%"
    );
    for s in &result.seasons {
        let _ = writeln!(text, "{}", season_line(s));
    }
    let complete: Vec<&SeasonSummary> = result.seasons.iter().filter(|s| s.complete).collect();
    if !complete.is_empty() {
        let k = complete.len() as f64;
        let mean = |f: fn(&SeasonSummary) -> f64| complete.iter().map(|s| f(s)).sum::<f64>() / k;
        let _ = writeln!(
            text,
            "mean of {} complete season(s): ETc {:.1} mm, net irrigation {:.1} mm, yield loss {:.1} %",
            complete.len(),
            mean(|s| s.etc_mm),
            mean(|s| s.nir_mm),
            100.0 * mean(|s| s.relative_yield_loss)
        );
        if dual_used {
            let _ = writeln!(
                text,
                "mean soil evaporation E = Ke ET0: {:.1} mm per season",
                mean(|s| s.evaporation_mm)
            );
        }
    }
    let _ = writeln!(
        text,
        "Planning estimates: designs must be checked by a qualified engineer."
    );
    print!("{text}");

    if let Some(path) = &args.out {
        let mut csv = String::with_capacity(160 * series.et0.len());
        csv.push_str(DAILY_HEADER);
        if args.dual_kc {
            csv.push(',');
            csv.push_str(DUAL_COLUMNS);
        }
        csv.push('\n');
        for s in &result.seasons {
            let year = s.year;
            let detail = season_detail(&spec, &weather, year).context("daily table")?;
            for (i, d) in detail.days.iter().enumerate() {
                let date = detail.first_date + chrono::Days::new(i as u64);
                let _ = write!(
                    csv,
                    "{date},{:.3},{:.4},{:.3},{:.3},{:.2},{:.3},{:.3},{:.3},{:.3},{:.3},{:.3},{:.3},{:.4},{year}",
                    d.et0_mm,
                    d.kc,
                    d.etc_mm,
                    d.etc_adj_mm,
                    d.rain_mm,
                    d.peff_mm,
                    d.irrigation_mm,
                    d.runoff_mm,
                    d.deep_perc_mm,
                    d.depletion_mm,
                    d.taw_mm,
                    d.raw_mm,
                    d.ks
                );
                if args.dual_kc {
                    // Empty when the crop fell back to the single Kc (warned).
                    match detail.evaporation.get(i) {
                        Some(e) => {
                            let _ = write!(csv, ",{:.4},{:.4}", e.kcb, e.ke);
                        }
                        None => csv.push_str(",,"),
                    }
                }
                csv.push('\n');
            }
        }
        write_atomically(path, csv.as_bytes())?;
        eprintln!("daily table written to {}", path.display());
    }
    Ok(())
}
