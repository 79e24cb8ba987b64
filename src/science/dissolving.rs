//! How warm or cold a batch gets while a solid dissolves with no heat exchanged with its
//! surroundings: the heat of solution taken up or given off, over the solution's heat
//! capacity (Laliberté's correlation where it has coefficients, else the water-based
//! estimate).

use super::error::ScienceError;
use super::units::positive;
use crate::model::thermo::HeatCapacityFit;

/// Specific isobaric heat capacity of liquid water at 0.1 MPa, J/(g·K), every 10 °C from 0 to
/// 100 °C (100 °C: at saturation), IAPWS-95 values as the CRC Handbook prints them (97th ed.,
/// Section 6, Properties of Water in the Range 0–100 °C); typed from memory, and checked
/// against the `iapws` package's IAPWS-95 in `tests/science_reference.rs`.
const WATER_CP: [f64; 11] = [
    4.2199, 4.1955, 4.1844, 4.1801, 4.1796, 4.1815, 4.1851, 4.1902, 4.1969, 4.2053, 4.2157,
];

/// [`WATER_CP`] at `t_c` by linear interpolation, clamped to 0–100 °C (outside that the
/// value at the nearer end, which [`batch_temperature`]'s callers are told about).
pub fn water_heat_capacity(t_c: f64) -> f64 {
    let x = (t_c / 10.0).clamp(0.0, 10.0);
    let i = (x.floor() as usize).min(9);
    let f = x - i as f64;
    WATER_CP[i] * (1.0 - f) + WATER_CP[i + 1] * f
}

/// The solute's apparent specific heat capacity in solution by Laliberté's correlation
/// (M. Laliberté, J. Chem. Eng. Data 54 (2009) 1725, eq. 11–12):
/// Cp,i = a1·exp(α) + a5·(1 − w_w)^a6, α = a2·t + a3·exp(0.01·t) + a4·(1 − w_w), J/(g·K),
/// t in °C, w_w the mass fraction of water.
pub fn laliberte_solute_cp(fit: &HeatCapacityFit, t_c: f64, w_water: f64) -> f64 {
    let [a1, a2, a3, a4, a5, a6] = fit.a;
    let ws = 1.0 - w_water;
    let alpha = a2 * t_c + a3 * (0.01 * t_c).exp() + a4 * ws;
    a1 * alpha.exp() + a5 * ws.powf(a6)
}

/// How the solution's heat capacity was found.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum HeatCapacityBasis {
    /// Laliberté's mixing rule Cp = w_w·Cp,w + w_s·Cp,s, inside the fit's ranges.
    Laliberte,
    /// Laliberté's correlation used outside its published temperature or composition range.
    LaliberteOutsideRange,
    /// The water-based estimate: the whole solution taken to have water's specific heat
    /// (the usual calorimetry convention; for concentrated salt solutions it overstates Cp,
    /// so it understates the temperature change).
    Water,
}

/// A batch's temperature after dissolving, with no heat exchanged.
#[derive(Debug, Clone, PartialEq)]
pub struct BatchTemperature {
    pub start_c: f64,
    pub end_c: f64,
    /// Heat given off (positive) or taken up (negative) by dissolving, kJ.
    pub heat_released_kj: f64,
    /// The solution's mean specific heat capacity over the change, J/(g·K).
    pub cp: f64,
    pub cp_basis: HeatCapacityBasis,
    /// Mass fraction of solute in the final solution.
    pub w_solute: f64,
}

/// The temperature a batch reaches when `solute_g` grams of a solid of molar mass
/// `molar_mass` (g/mol) dissolve completely in `water_g` grams of water at `start_c`, with
/// no heat exchanged, from an enthalpy of solution `delta_h` (kJ/mol; negative gives off
/// heat):
///
/// −n·ΔH = (m_water + m_solute)·Cp·(T_end − T_start), n = m_solute/M,
///
/// Cp the solution's specific heat at the mean temperature (Laliberté's mixing rule
/// Cp = w_w·Cp,w + w_s·Cp,s where `fit` is given, else water's; solved by fixed-point
/// iteration). The enthalpy is taken as constant over the change.
pub fn batch_temperature(
    solute_g: f64,
    water_g: f64,
    molar_mass: f64,
    delta_h: f64,
    start_c: f64,
    fit: Option<&HeatCapacityFit>,
) -> Result<BatchTemperature, ScienceError> {
    let solute_g = positive("mass of solid (g)", solute_g)?;
    let water_g = positive("mass of water (g)", water_g)?;
    let molar_mass = positive("molar mass (g/mol)", molar_mass)?;
    let total = solute_g + water_g;
    let w_solute = solute_g / total;
    let heat_released_kj = -solute_g / molar_mass * delta_h;
    let cp_at = |t: f64| -> (f64, HeatCapacityBasis) {
        let cw = water_heat_capacity(t);
        match fit {
            Some(f) => {
                let cs = laliberte_solute_cp(f, t, 1.0 - w_solute);
                let inside = (f.t_min_c..=f.t_max_c).contains(&t) && w_solute <= f.w_max;
                let basis = if inside {
                    HeatCapacityBasis::Laliberte
                } else {
                    HeatCapacityBasis::LaliberteOutsideRange
                };
                ((1.0 - w_solute) * cw + w_solute * cs, basis)
            }
            None => (cw, HeatCapacityBasis::Water),
        }
    };
    let mut end_c = start_c;
    let mut cp_basis = HeatCapacityBasis::Water;
    let mut cp = water_heat_capacity(start_c);
    for _ in 0..50 {
        let mean = 0.5 * (start_c + end_c);
        let (c, basis) = cp_at(mean);
        // A correlation far outside its range can give nonsense; fall back to water's.
        let (c, basis) = if c.is_finite() && c > 0.5 {
            (c, basis)
        } else {
            (water_heat_capacity(mean), HeatCapacityBasis::Water)
        };
        cp = c;
        cp_basis = basis;
        let next = start_c + heat_released_kj * 1000.0 / (total * cp);
        if (next - end_c).abs() < 1e-9 {
            end_c = next;
            break;
        }
        end_c = next;
    }
    Ok(BatchTemperature {
        start_c,
        end_c,
        heat_released_kj,
        cp,
        cp_basis,
        w_solute,
    })
}

/// A batch to dissolve: grams of solid (molar mass g/mol, heat of solution kJ/mol) and of
/// water, the start temperature (°C) and the solute's heat-capacity coefficients, if any.
#[derive(Debug, Clone, Copy)]
pub struct Batch<'a> {
    pub solute_g: f64,
    pub water_g: f64,
    pub molar_mass: f64,
    pub delta_h: f64,
    pub start_c: f64,
    pub fit: Option<&'a HeatCapacityFit>,
}

impl Batch<'_> {
    /// [`batch_temperature`] of the whole batch.
    pub fn temperature(&self) -> Result<BatchTemperature, ScienceError> {
        batch_temperature(
            self.solute_g,
            self.water_g,
            self.molar_mass,
            self.delta_h,
            self.start_c,
            self.fit,
        )
    }
}

/// How far a batch dissolves before its solution saturates.
#[derive(Debug, Clone, PartialEq)]
pub enum Dissolution {
    /// The whole solid dissolves.
    Whole,
    /// Dissolving stops, the solution saturated, after `dissolved_g` grams.
    Stops {
        dissolved_g: f64,
        batch: BatchTemperature,
    },
    /// The saturation is not known at `t_c`, which the batch passes on the way.
    Unknown { t_c: f64 },
}

/// Where a batch stops dissolving when its solution saturates on the way: the first mass
/// dissolved, x, at which the solution's mass fraction x/(x + m_water) reaches the
/// saturation mass fraction at the temperature [`batch_temperature`] gives for x dissolved
/// (the undissolved solid's own heat capacity left out). `saturation(t_c)` is the saturated
/// mass fraction at `t_c`, `None` where it is unknown. The first crossing is found on a grid
/// of 200 steps, then by bisection (also where a grid step leaves the data: the batch may
/// saturate before it does).
pub fn stops_at_saturation(
    batch: &Batch<'_>,
    saturation: impl Fn(f64) -> Option<f64>,
) -> Result<Dissolution, ScienceError> {
    let Batch {
        solute_g,
        water_g,
        molar_mass,
        delta_h,
        start_c,
        fit,
    } = *batch;
    let solute_g = positive("mass of solid (g)", solute_g)?;
    // Headroom to saturation with x grams dissolved (positive while more can dissolve), or
    // the temperature where the saturation is unknown.
    let headroom = |x: f64| -> Result<Result<(f64, BatchTemperature), f64>, ScienceError> {
        let b = batch_temperature(x, water_g, molar_mass, delta_h, start_c, fit)?;
        Ok(match saturation(b.end_c) {
            Some(w_sat) => Ok((w_sat - x / (x + water_g), b)),
            None => Err(b.end_c),
        })
    };
    const STEPS: usize = 200;
    let mut low = 0.0;
    for k in 1..=STEPS {
        let x = solute_g * k as f64 / STEPS as f64;
        let unknown_at = match headroom(x)? {
            Ok((h, _)) if h >= 0.0 => {
                low = x;
                continue;
            }
            Ok(_) => None,
            Err(t_c) => Some(t_c),
        };
        // Between `low` (room left) and `x` (saturated, or the saturation unknown there) the
        // path stops leaving room: find where. A batch far beyond what the water takes can
        // leave the data by its first grid step and still saturate well before it. The
        // bracket is halved until it is a part in 1e12 of what it holds (about 130 halvings
        // from a grid step of 5e27 g down to a few hundred grams).
        let mut high = x;
        while high - low > 1e-12 * high {
            let mid = 0.5 * (low + high);
            if mid <= low || mid >= high {
                break;
            }
            match headroom(mid)? {
                Ok((h, _)) if h >= 0.0 => low = mid,
                _ => high = mid,
            }
        }
        if let Err(t_c) = headroom(high)? {
            return Ok(Dissolution::Unknown {
                t_c: unknown_at.unwrap_or(t_c),
            });
        }
        if low <= 0.0 {
            // Saturated from the first grain: nothing dissolves, nothing changes.
            let batch = BatchTemperature {
                start_c,
                end_c: start_c,
                heat_released_kj: 0.0,
                cp: water_heat_capacity(start_c),
                cp_basis: HeatCapacityBasis::Water,
                w_solute: 0.0,
            };
            return Ok(Dissolution::Stops {
                dissolved_g: 0.0,
                batch,
            });
        }
        return Ok(match headroom(low)? {
            Ok((_, batch)) => Dissolution::Stops {
                dissolved_g: low,
                batch,
            },
            Err(t_c) => Dissolution::Unknown { t_c },
        });
    }
    Ok(Dissolution::Whole)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn water_cp_interpolates_the_table() {
        assert_eq!(water_heat_capacity(20.0), 4.1844);
        assert!((water_heat_capacity(25.0) - 0.5 * (4.1844 + 4.1801)).abs() < 1e-12);
        assert_eq!(water_heat_capacity(-5.0), 4.2199);
        assert_eq!(water_heat_capacity(120.0), 4.2157);
    }

    #[test]
    fn energy_balance_by_hand() {
        // Invented: 10 g of a solid (M = 100 g/mol) giving off 41.8 kJ/mol in 90 g water:
        // 4.18 kJ over 100 g at Cp ≈ 4.18 J/(g·K) is about 10 K.
        let b = batch_temperature(10.0, 90.0, 100.0, -41.8, 30.0, None).unwrap();
        assert!((b.heat_released_kj - 4.18).abs() < 1e-12);
        let want = 30.0 + 4180.0 / (100.0 * b.cp);
        assert!(
            (b.end_c - want).abs() < 1e-9 && (b.end_c - 40.0).abs() < 0.05,
            "{b:?}"
        );
        assert_eq!(b.cp_basis, HeatCapacityBasis::Water);
        // Endothermic: it cools.
        let c = batch_temperature(10.0, 90.0, 100.0, 41.8, 30.0, None).unwrap();
        assert!(c.end_c < 30.0);
        assert!(batch_temperature(0.0, 90.0, 100.0, 1.0, 20.0, None).is_err());
    }

    #[test]
    fn an_endothermic_batch_stops_where_it_saturates() {
        // Invented: M = 100 g/mol, +41.8 kJ/mol, saturation w = 0.01·t (t in °C). 50 g in
        // 100 g water from 30 °C would end near −3 °C, where nothing dissolves; it stops
        // where x/(x + 100) = 0.01·T(x).
        let sat = |t: f64| Some((0.01 * t).max(0.0));
        let demo = |solute_g: f64| Batch {
            solute_g,
            water_g: 100.0,
            molar_mass: 100.0,
            delta_h: 41.8,
            start_c: 30.0,
            fit: None,
        };
        let Dissolution::Stops { dissolved_g, batch } =
            stops_at_saturation(&demo(50.0), sat).unwrap()
        else {
            panic!("it must stop");
        };
        let x = dissolved_g;
        assert!(x > 0.0 && x < 50.0, "{x}");
        assert!(
            (x / (x + 100.0) - 0.01 * batch.end_c).abs() < 1e-6,
            "{x} {batch:?}"
        );
        let direct = batch_temperature(x, 100.0, 100.0, 41.8, 30.0, None).unwrap();
        assert!((direct.end_c - batch.end_c).abs() < 1e-9);
        // A small batch dissolves whole.
        assert_eq!(
            stops_at_saturation(&demo(1.0), sat).unwrap(),
            Dissolution::Whole
        );
        // A batch a thousand times what the water takes stops where the 50 g batch does,
        // though its first grid step (250 g dissolved) would chill it far below the data.
        let data = |t: f64| (0.0..=100.0).contains(&t).then_some(0.01 * t);
        let Dissolution::Stops {
            dissolved_g: huge, ..
        } = stops_at_saturation(&demo(50_000.0), data).unwrap()
        else {
            panic!("it must stop");
        };
        assert!((huge - x).abs() < 1e-6, "{huge} {x}");
        // A batch that leaves the data before it saturates says where it left them: with
        // saturation at w = 0.5 from 0 to 100 °C, 50 g at ten times the heat reach 0 °C first.
        let cold = Batch {
            delta_h: 418.0,
            ..demo(50.0)
        };
        let flat = |t: f64| (0.0..=100.0).contains(&t).then_some(0.5);
        assert!(matches!(
            stops_at_saturation(&cold, flat).unwrap(),
            Dissolution::Unknown { t_c } if t_c < 0.0
        ));
        // Unknown saturation on the way is said, not guessed.
        assert!(matches!(
            stops_at_saturation(&demo(50.0), |_| None).unwrap(),
            Dissolution::Unknown { .. }
        ));
    }
}
