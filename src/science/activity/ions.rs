//! The ions Pitzer's mixture model knows by symbol, with their charges, and the reading of an
//! electrolyte's formula (`Na2SO4`, `(NH4)2SO4`, `MgCl2`) into its cation and anion.

/// Ion symbols (as parameter files and formulas write them) and charges. Longer symbols that
/// begin like shorter ones come first, so that a formula is read greedily.
pub const IONS: &[(&str, i32)] = &[
    ("NH4", 1),
    ("Li", 1),
    ("Na", 1),
    ("K", 1),
    ("H", 1),
    ("Mg", 2),
    ("Ca", 2),
    ("Sr", 2),
    ("Ba", 2),
    ("Cl", -1),
    ("Br", -1),
    ("I", -1),
    ("NO3", -1),
    ("OH", -1),
    ("HCO3", -1),
    ("H2PO4", -1),
    ("HSO4", -1),
    ("SO4", -2),
    ("CO3", -2),
    ("HPO4", -2),
    ("PO4", -3),
];

/// The charge of an ion symbol, if it is one this module knows.
pub fn charge(symbol: &str) -> Option<i32> {
    IONS.iter().find(|(s, _)| *s == symbol).map(|(_, z)| *z)
}

/// An electrolyte read from its formula: `Na2SO4` is 2 Na⁺ and 1 SO4²⁻.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Electrolyte {
    pub cation: &'static str,
    pub cation_count: u32,
    pub anion: &'static str,
    pub anion_count: u32,
}

/// `"2"` → 2, `""` → 1; anything else is not a count.
fn count(text: &str) -> Option<u32> {
    if text.is_empty() {
        return Some(1);
    }
    if !text.bytes().all(|b| b.is_ascii_digit()) {
        return None;
    }
    text.parse().ok().filter(|n| *n > 0)
}

/// `text` as `symbol` followed by a count, or `(symbol)` followed by a count.
fn ion_with_count(text: &str, symbol: &str) -> Option<u32> {
    if let Some(rest) = text.strip_prefix(symbol) {
        if let Some(n) = count(rest) {
            return Some(n);
        }
    }
    let inner = text.strip_prefix('(')?;
    let rest = inner.strip_prefix(symbol)?.strip_prefix(')')?;
    count(rest)
}

/// Splits a formula into a known cation and a known anion, electrically neutral; `None` for
/// anything else (molecules, double salts, ions this module does not know, hydrates).
pub fn electrolyte(formula: &str) -> Option<Electrolyte> {
    let formula = formula.trim();
    for &(cation, zc) in IONS.iter().filter(|(_, z)| *z > 0) {
        for split in 1..formula.len() {
            let Some((head, tail)) = formula.split_at_checked(split) else {
                continue;
            };
            let Some(nc) = ion_with_count(head, cation) else {
                continue;
            };
            for &(anion, za) in IONS.iter().filter(|(_, z)| *z < 0) {
                if let Some(na) = ion_with_count(tail, anion) {
                    let neutral = i64::from(nc) * i64::from(zc) == i64::from(na) * i64::from(-za);
                    if neutral {
                        return Some(Electrolyte {
                            cation,
                            cation_count: nc,
                            anion,
                            anion_count: na,
                        });
                    }
                }
            }
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    fn read(f: &str) -> Option<(&'static str, u32, &'static str, u32)> {
        electrolyte(f).map(|e| (e.cation, e.cation_count, e.anion, e.anion_count))
    }

    #[test]
    fn formulas_split_into_their_ions() {
        assert_eq!(read("NaCl"), Some(("Na", 1, "Cl", 1)));
        assert_eq!(read("Na2SO4"), Some(("Na", 2, "SO4", 1)));
        assert_eq!(read("MgCl2"), Some(("Mg", 1, "Cl", 2)));
        assert_eq!(read("(NH4)2SO4"), Some(("NH4", 2, "SO4", 1)));
        assert_eq!(read("NH4NO3"), Some(("NH4", 1, "NO3", 1)));
        assert_eq!(read("NaHCO3"), Some(("Na", 1, "HCO3", 1)));
        assert_eq!(read("KH2PO4"), Some(("K", 1, "H2PO4", 1)));
        assert_eq!(read("Ca(NO3)2"), Some(("Ca", 1, "NO3", 2)));
        assert_eq!(read("CaSO4"), Some(("Ca", 1, "SO4", 1)));
        assert_eq!(read("Na3PO4"), Some(("Na", 3, "PO4", 1)));
    }

    #[test]
    fn what_is_not_a_simple_salt_is_not_read() {
        assert_eq!(read("C12H22O11"), None);
        assert_eq!(read("NaCl2"), None, "not neutral");
        assert_eq!(read("KAl(SO4)2"), None);
        assert_eq!(read("CuSO4"), None, "copper is not in the table");
        assert_eq!(read(""), None);
        assert_eq!(read("Na"), None);
        assert_eq!(charge("SO4"), Some(-2));
        assert_eq!(charge("Xx"), None);
    }
}
