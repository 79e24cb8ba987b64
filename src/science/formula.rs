//! Chemical formulas: parsing (parentheses, brackets, hydrate dots, coefficients) and molar
//! masses from the standard atomic weights.
//!
//! Grammar accepted (whitespace is not allowed inside a formula):
//!
//! ```text
//! formula  := part (dot part)*            dot := '·' | '•' | '*' | '.'
//! part     := coefficient? group+         coefficient := digits ('.' digits)?
//! group    := element count? | '(' group+ ')' count? | '[' group+ ']' count?
//! element  := upper-case letter, optional lower-case letter
//! count    := digits
//! ```
//!
//! Spaces are allowed around a hydrate dot (`CuSO4 · 5H2O`) and nowhere else.
//! The first part is the anhydrous formula; every later part that is exactly H2O counts as
//! water of crystallisation (`Na2SO4·10H2O` has 10).

use std::collections::BTreeMap;

/// Standard atomic weights, g/mol (numerically equal to the relative atomic mass A_r).
///
/// Source: IUPAC Commission on Isotopic Abundances and Atomic Weights (CIAAW), "Standard
/// atomic weights of the elements 2021", T. Prohaska et al., Pure Appl. Chem. 94 (2022)
/// 573–600, and the CIAAW table of abridged / conventional values (ciaaw.org). For elements
/// whose standard atomic weight is an interval (H, Li, B, C, N, O, Mg, Si, S, Cl, Ar, Br, Tl,
/// Pb) the **conventional** value is used. Elements with no stable isotope and no standard
/// atomic weight (Tc, Pm, Po, At, Rn, Fr, Ra, Ac) carry the mass number of their
/// longest-lived isotope, as printed in brackets in periodic tables. Values were typed from
/// memory of that table and are checked by the `periodictable` fixture in
/// `tests/reference/`.
pub const ATOMIC_WEIGHTS: &[(&str, f64)] = &[
    ("H", 1.008),
    ("He", 4.002602),
    ("Li", 6.94),
    ("Be", 9.0121831),
    ("B", 10.81),
    ("C", 12.011),
    ("N", 14.007),
    ("O", 15.999),
    ("F", 18.998403162),
    ("Ne", 20.1797),
    ("Na", 22.98976928),
    ("Mg", 24.305),
    ("Al", 26.9815384),
    ("Si", 28.085),
    ("P", 30.973761998),
    ("S", 32.06),
    ("Cl", 35.45),
    ("Ar", 39.95),
    ("K", 39.0983),
    ("Ca", 40.078),
    ("Sc", 44.955907),
    ("Ti", 47.867),
    ("V", 50.9415),
    ("Cr", 51.9961),
    ("Mn", 54.938043),
    ("Fe", 55.845),
    ("Co", 58.933194),
    ("Ni", 58.6934),
    ("Cu", 63.546),
    ("Zn", 65.38),
    ("Ga", 69.723),
    ("Ge", 72.630),
    ("As", 74.921595),
    ("Se", 78.971),
    ("Br", 79.904),
    ("Kr", 83.798),
    ("Rb", 85.4678),
    ("Sr", 87.62),
    ("Y", 88.905838),
    ("Zr", 91.222),
    ("Nb", 92.90637),
    ("Mo", 95.95),
    ("Tc", 98.0),
    ("Ru", 101.07),
    ("Rh", 102.90549),
    ("Pd", 106.42),
    ("Ag", 107.8682),
    ("Cd", 112.414),
    ("In", 114.818),
    ("Sn", 118.710),
    ("Sb", 121.760),
    ("Te", 127.60),
    ("I", 126.90447),
    ("Xe", 131.293),
    ("Cs", 132.90545196),
    ("Ba", 137.327),
    ("La", 138.90547),
    ("Ce", 140.116),
    ("Pr", 140.90766),
    ("Nd", 144.242),
    ("Pm", 145.0),
    ("Sm", 150.36),
    ("Eu", 151.964),
    ("Gd", 157.25),
    ("Tb", 158.925354),
    ("Dy", 162.500),
    ("Ho", 164.930329),
    ("Er", 167.259),
    ("Tm", 168.934219),
    ("Yb", 173.045),
    ("Lu", 174.9668),
    ("Hf", 178.486),
    ("Ta", 180.94788),
    ("W", 183.84),
    ("Re", 186.207),
    ("Os", 190.23),
    ("Ir", 192.217),
    ("Pt", 195.084),
    ("Au", 196.966570),
    ("Hg", 200.592),
    ("Tl", 204.38),
    ("Pb", 207.2),
    ("Bi", 208.98040),
    ("Po", 209.0),
    ("At", 210.0),
    ("Rn", 222.0),
    ("Fr", 223.0),
    ("Ra", 226.0),
    ("Ac", 227.0),
    ("Th", 232.0377),
    ("Pa", 231.03588),
    ("U", 238.02891),
];

/// The standard atomic weight of an element symbol (case-sensitive, e.g. `Cl`), g/mol.
pub fn atomic_weight(symbol: &str) -> Option<f64> {
    ATOMIC_WEIGHTS
        .iter()
        .find(|(s, _)| *s == symbol)
        .map(|&(_, w)| w)
}

/// Why a formula could not be read. Every variant carries the byte offset into the text.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum FormulaError {
    /// Nothing to read: `""`.
    #[error("empty formula")]
    Empty,
    /// An element symbol not in the table: `Xy2O` (position 0).
    #[error("unknown element `{symbol}` at byte {position}")]
    UnknownElement { symbol: String, position: usize },
    /// A character that cannot start or continue a formula: `NaCl!` (position 4), `na`.
    #[error("unexpected `{found}` at byte {position}")]
    UnexpectedChar { found: char, position: usize },
    /// The text ended where something was still needed: `Na2SO4·` (position 8), `Ca(NO3`.
    #[error("formula ends too early at byte {position}: expected {expected}")]
    UnexpectedEnd {
        expected: &'static str,
        position: usize,
    },
    /// A closing bracket that does not match the open one: `Ca(NO3]2` (position 6).
    #[error("mismatched `{found}` at byte {position}")]
    MismatchedBracket { found: char, position: usize },
    /// A count or coefficient of zero: `H0O` (position 1), `CuSO4·0H2O`.
    #[error("count of zero at byte {position}")]
    ZeroCount { position: usize },
    /// Brackets nested deeper than 16 levels: 17 × `(` then `H)` 17 times.
    #[error("brackets nested too deep at byte {position}")]
    TooDeep { position: usize },
}

/// Deepest bracket nesting accepted (real formulas use two or three levels).
const MAX_DEPTH: usize = 16;

/// One part of a formula between hydrate dots, e.g. `10H2O` in `Na2SO4·10H2O`.
#[derive(Debug, Clone, PartialEq)]
pub struct FormulaPart {
    /// Leading coefficient (1 when none is written).
    pub coefficient: f64,
    /// Element symbol → atoms per one unit of this part (before the coefficient).
    pub elements: BTreeMap<&'static str, f64>,
}

impl FormulaPart {
    fn molar_mass(&self) -> f64 {
        self.coefficient
            * self
                .elements
                .iter()
                .map(|(s, n)| atomic_weight(s).unwrap_or(0.0) * n)
                .sum::<f64>()
    }

    fn is_water(&self) -> bool {
        self.elements.len() == 2
            && self.elements.get("H") == Some(&2.0)
            && self.elements.get("O") == Some(&1.0)
    }
}

/// A parsed chemical formula.
#[derive(Debug, Clone, PartialEq)]
pub struct Formula {
    /// The text as given.
    pub text: String,
    /// The parts between hydrate dots; the first is the anhydrous formula.
    pub parts: Vec<FormulaPart>,
}

impl Formula {
    /// Molar mass of the whole formula (hydrate water included), g/mol:
    /// M = Σ n_i · A_r(i) over all atoms, with the weights of [`ATOMIC_WEIGHTS`].
    pub fn molar_mass(&self) -> f64 {
        self.parts.iter().map(FormulaPart::molar_mass).sum()
    }

    /// Molecules of water of crystallisation per formula unit: the sum of the coefficients
    /// of the parts after the first that are exactly H2O; 0 when there is none.
    pub fn hydrate_water(&self) -> f64 {
        self.parts
            .iter()
            .skip(1)
            .filter(|p| p.is_water())
            .map(|p| p.coefficient)
            .sum()
    }

    /// Molar mass without the water of crystallisation, g/mol:
    /// M(formula) − hydrate_water · M(H2O), M(H2O) from the same table.
    pub fn anhydrous_molar_mass(&self) -> f64 {
        self.molar_mass() - self.hydrate_water() * water_molar_mass()
    }

    /// Element symbol → total number of atoms in one formula unit (all parts).
    pub fn elements(&self) -> BTreeMap<&'static str, f64> {
        let mut out = BTreeMap::new();
        for part in &self.parts {
            for (s, n) in &part.elements {
                *out.entry(*s).or_insert(0.0) += n * part.coefficient;
            }
        }
        out
    }
}

/// Molar mass of water, g/mol, from the table: 2 · 1.008 + 15.999 = 18.015.
pub fn water_molar_mass() -> f64 {
    2.0 * 1.008 + 15.999
}

/// Parses a formula such as `Na2SO4·10H2O`, `KAl(SO4)2·12H2O`, `(NH4)2SO4`, `C12H22O11`.
///
/// ```
/// use satline::science::formula::parse_formula;
/// let f = parse_formula("Na2SO4·10H2O").unwrap();
/// assert_eq!(f.hydrate_water(), 10.0);
/// assert!((f.molar_mass() - 322.19).abs() < 0.01);
/// assert_eq!(f.elements()["O"], 14.0);
/// ```
pub fn parse_formula(text: &str) -> Result<Formula, FormulaError> {
    if text.is_empty() {
        return Err(FormulaError::Empty);
    }
    let mut p = Parser {
        text,
        bytes: text.as_bytes(),
        pos: 0,
        depth: 0,
    };
    let mut parts = Vec::new();
    loop {
        parts.push(p.part()?);
        // Spaces are allowed around a hydrate dot only (`CuSO4 · 5H2O`).
        let before_spaces = p.pos;
        p.skip_spaces();
        match p.peek_char() {
            None if p.pos > before_spaces => {
                return Err(FormulaError::UnexpectedChar {
                    found: ' ',
                    position: before_spaces,
                });
            }
            None => break,
            Some(c) if is_dot(c) => {
                p.pos += c.len_utf8();
                p.skip_spaces();
                if p.pos >= p.bytes.len() {
                    return Err(FormulaError::UnexpectedEnd {
                        expected: "a formula after the hydrate dot",
                        position: p.pos,
                    });
                }
            }
            Some(_) if p.pos > before_spaces => {
                return Err(FormulaError::UnexpectedChar {
                    found: ' ',
                    position: before_spaces,
                });
            }
            Some(c) => {
                return Err(FormulaError::UnexpectedChar {
                    found: c,
                    position: p.pos,
                });
            }
        }
    }
    Ok(Formula {
        text: text.to_string(),
        parts,
    })
}

/// Molar mass of a formula given as text, g/mol (see [`Formula::molar_mass`]).
pub fn molar_mass(text: &str) -> Result<f64, FormulaError> {
    Ok(parse_formula(text)?.molar_mass())
}

fn is_dot(c: char) -> bool {
    matches!(c, '·' | '•' | '*' | '.' | '⋅')
}

struct Parser<'a> {
    text: &'a str,
    bytes: &'a [u8],
    pos: usize,
    depth: usize,
}

impl Parser<'_> {
    fn peek_char(&self) -> Option<char> {
        self.text[self.pos..].chars().next()
    }

    fn skip_spaces(&mut self) {
        while self.pos < self.bytes.len() && self.bytes[self.pos] == b' ' {
            self.pos += 1;
        }
    }

    fn digits(&mut self) -> Option<(usize, &str)> {
        let start = self.pos;
        while self.pos < self.bytes.len() && self.bytes[self.pos].is_ascii_digit() {
            self.pos += 1;
        }
        (self.pos > start).then(|| (start, &self.text[start..self.pos]))
    }

    /// An integer count after an element or a bracket; 1 when none is written.
    fn count(&mut self) -> Result<f64, FormulaError> {
        match self.digits() {
            None => Ok(1.0),
            Some((start, _)) => self.number_from(start),
        }
    }

    /// The number written from `start` to here; zero is refused.
    fn number_from(&self, start: usize) -> Result<f64, FormulaError> {
        let d = &self.text[start..self.pos];
        let n: f64 = d.parse().map_err(|_| FormulaError::UnexpectedChar {
            found: d.chars().next().unwrap_or('?'),
            position: start,
        })?;
        if n == 0.0 {
            Err(FormulaError::ZeroCount { position: start })
        } else {
            Ok(n)
        }
    }

    /// A leading coefficient, possibly decimal (`0.5H2O`); a '.' counts as decimal point only
    /// when a digit follows it, otherwise it is a hydrate dot.
    fn coefficient(&mut self) -> Result<f64, FormulaError> {
        let start = self.pos;
        if self.digits().is_none() {
            return Ok(1.0);
        }
        if self.pos + 1 < self.bytes.len()
            && self.bytes[self.pos] == b'.'
            && self.bytes[self.pos + 1].is_ascii_digit()
        {
            self.pos += 1;
            self.digits();
        }
        self.number_from(start)
    }

    fn part(&mut self) -> Result<FormulaPart, FormulaError> {
        let coefficient = self.coefficient()?;
        let mut elements = BTreeMap::new();
        self.groups(&mut elements, None)?;
        Ok(FormulaPart {
            coefficient,
            elements,
        })
    }

    /// Reads groups into `into` until a dot, the end, or the closing bracket `close`.
    fn groups(
        &mut self,
        into: &mut BTreeMap<&'static str, f64>,
        close: Option<char>,
    ) -> Result<(), FormulaError> {
        let mut read_any = false;
        loop {
            let Some(c) = self.peek_char() else {
                if let Some(close) = close {
                    return Err(FormulaError::UnexpectedEnd {
                        expected: if close == ')' { "`)`" } else { "`]`" },
                        position: self.pos,
                    });
                }
                break;
            };
            if c.is_ascii_uppercase() {
                let start = self.pos;
                self.pos += 1;
                if self.pos < self.bytes.len() && self.bytes[self.pos].is_ascii_lowercase() {
                    self.pos += 1;
                }
                let symbol = &self.text[start..self.pos];
                let Some(&(sym, _)) = ATOMIC_WEIGHTS.iter().find(|(s, _)| *s == symbol) else {
                    return Err(FormulaError::UnknownElement {
                        symbol: symbol.to_string(),
                        position: start,
                    });
                };
                let n = self.count()?;
                *into.entry(sym).or_insert(0.0) += n;
                read_any = true;
            } else if c == '(' || c == '[' {
                if self.depth >= MAX_DEPTH {
                    return Err(FormulaError::TooDeep { position: self.pos });
                }
                self.pos += 1;
                self.depth += 1;
                let mut inner = BTreeMap::new();
                self.groups(&mut inner, Some(if c == '(' { ')' } else { ']' }))?;
                self.depth -= 1;
                let n = self.count()?;
                for (s, k) in inner {
                    *into.entry(s).or_insert(0.0) += k * n;
                }
                read_any = true;
            } else if c == ')' || c == ']' {
                match close {
                    Some(want) if want == c => {
                        if !read_any {
                            return Err(FormulaError::UnexpectedChar {
                                found: c,
                                position: self.pos,
                            });
                        }
                        self.pos += 1;
                        return Ok(());
                    }
                    _ => {
                        return Err(FormulaError::MismatchedBracket {
                            found: c,
                            position: self.pos,
                        });
                    }
                }
            } else if (is_dot(c) || c == ' ') && close.is_none() && read_any {
                break;
            } else {
                return Err(FormulaError::UnexpectedChar {
                    found: c,
                    position: self.pos,
                });
            }
        }
        if !read_any {
            return Err(FormulaError::UnexpectedEnd {
                expected: "an element or `(`",
                position: self.pos,
            });
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn close(a: f64, b: f64, tol: f64) -> bool {
        (a - b).abs() <= tol
    }

    #[test]
    fn simple_and_nested() {
        // Sums by hand from the table above.
        assert!(close(
            molar_mass("NaCl").unwrap(),
            22.98976928 + 35.45,
            1e-9
        ));
        let f = parse_formula("(NH4)2SO4").unwrap();
        assert_eq!(f.elements().get("N"), Some(&2.0));
        assert_eq!(f.elements().get("H"), Some(&8.0));
        let f = parse_formula("KAl(SO4)2·12H2O").unwrap();
        assert_eq!(f.hydrate_water(), 12.0);
        assert_eq!(f.elements().get("O"), Some(&20.0));
        assert_eq!(f.elements().get("H"), Some(&24.0));
        assert!(close(
            f.anhydrous_molar_mass(),
            molar_mass("KAl(SO4)2").unwrap(),
            1e-9
        ));
    }

    #[test]
    fn hydrate_dots() {
        for t in ["CuSO4·5H2O", "CuSO4*5H2O", "CuSO4.5H2O", "CuSO4•5H2O"] {
            let f = parse_formula(t).unwrap();
            assert_eq!(f.hydrate_water(), 5.0, "{t}");
        }
        let f = parse_formula("CaSO4·0.5H2O").unwrap();
        assert_eq!(f.hydrate_water(), 0.5);
        assert_eq!(parse_formula("C12H22O11").unwrap().hydrate_water(), 0.0);
        assert_eq!(parse_formula("Na2SO4·10H2O").unwrap().hydrate_water(), 10.0);
        assert_eq!(parse_formula("Ca(NO3)2·4H2O").unwrap().hydrate_water(), 4.0);
        assert_eq!(parse_formula("CuSO4 · 5H2O").unwrap().hydrate_water(), 5.0);
        assert!(matches!(
            parse_formula("Na Cl"),
            Err(FormulaError::UnexpectedChar {
                found: ' ',
                position: 2
            })
        ));
        assert!(parse_formula("NaCl ").is_err());
    }

    #[test]
    fn errors_with_positions() {
        assert_eq!(parse_formula(""), Err(FormulaError::Empty));
        assert!(matches!(
            parse_formula("Xy2O"),
            Err(FormulaError::UnknownElement { position: 0, .. })
        ));
        assert!(matches!(
            parse_formula("NaCl!"),
            Err(FormulaError::UnexpectedChar {
                found: '!',
                position: 4
            })
        ));
        assert!(matches!(
            parse_formula("na"),
            Err(FormulaError::UnexpectedChar { position: 0, .. })
        ));
        assert!(matches!(
            parse_formula("Na2SO4·"),
            Err(FormulaError::UnexpectedEnd { position: 8, .. })
        ));
        assert!(matches!(
            parse_formula("Ca(NO3"),
            Err(FormulaError::UnexpectedEnd { position: 6, .. })
        ));
        assert!(matches!(
            parse_formula("Ca(NO3]2"),
            Err(FormulaError::MismatchedBracket {
                found: ']',
                position: 6
            })
        ));
        assert!(matches!(
            parse_formula("H0O"),
            Err(FormulaError::ZeroCount { position: 1 })
        ));
        assert!(matches!(
            parse_formula("CuSO4·0H2O"),
            Err(FormulaError::ZeroCount { .. })
        ));
        assert!(parse_formula("NaCl)").is_err());
        let deep = format!("{}H{}", "(".repeat(17), ")".repeat(17));
        assert!(matches!(
            parse_formula(&deep),
            Err(FormulaError::TooDeep { position: 16 })
        ));
        let ok = format!("{}H{}", "(".repeat(16), ")".repeat(16));
        assert!(parse_formula(&ok).is_ok());
        assert!(parse_formula(&"(".repeat(100_000)).is_err());
        assert!(parse_formula("()").is_err());
    }

    #[test]
    fn table_covers_up_to_bismuth_and_actinides() {
        assert!(ATOMIC_WEIGHTS.len() >= 83);
        for s in ["Bi", "Th", "U", "Pb", "Hg"] {
            assert!(atomic_weight(s).is_some(), "{s}");
        }
        assert!(close(water_molar_mass(), 18.015, 1e-9));
    }
}
