//! Chemical formulas: parsing `Na3C6H5O7·2H2O` into element counts and a molar mass.

use std::collections::BTreeMap;

use crate::error::FormulaError;

/// Standard atomic weights in g/mol: the IUPAC 2005 values (Wieser, Pure Appl. Chem. 78 (2006) 2051; Zn as revised 2007),
/// as handbooks print them; each lies inside the CIAAW 2021 interval for its element.
const ATOMIC_WEIGHTS: &[(&str, f64)] = &[
    ("H", 1.007_94),
    ("Li", 6.941),
    ("B", 10.811),
    ("C", 12.010_7),
    ("N", 14.006_7),
    ("O", 15.999_4),
    ("F", 18.998_403),
    ("Na", 22.989_770),
    ("Mg", 24.305_0),
    ("Al", 26.981_538),
    ("Si", 28.085_5),
    ("P", 30.973_761),
    ("S", 32.065),
    ("Cl", 35.453),
    ("K", 39.098_3),
    ("Ca", 40.078),
    ("Ti", 47.867),
    ("Cr", 51.996_1),
    ("Mn", 54.938_049),
    ("Fe", 55.845),
    ("Co", 58.933_200),
    ("Ni", 58.693_4),
    ("Cu", 63.546),
    ("Zn", 65.38),
    ("Se", 78.96),
    ("Br", 79.904),
    ("Sr", 87.62),
    ("Mo", 95.94),
    ("Ag", 107.868_2),
    ("Sn", 118.710),
    ("I", 126.904_47),
    ("Ba", 137.327),
];

/// Molar mass of water in g/mol, from the same atomic weights.
pub const WATER_MOLAR_MASS_G_PER_MOL: f64 = 2.0 * 1.007_94 + 15.999_4;

/// Deepest bracket nesting a formula may use.
const MAX_DEPTH: usize = 8;
/// Longest formula accepted, in characters.
const MAX_LEN: usize = 200;

/// A parsed formula: element counts (hydrate water included) and the hydrate water count.
#[derive(Debug, Clone, PartialEq)]
pub struct Formula {
    /// Atoms of each element per formula unit, hydrate water included, sorted by symbol.
    pub elements: BTreeMap<String, f64>,
    /// Molecules of water of crystallisation per formula unit (the `·nH2O` part).
    pub hydrate_water: f64,
}

impl Formula {
    /// Parses a formula such as `KH2PO4`, `Ca(OH)2` or `Na2B4O7·10H2O`.
    pub fn parse(text: &str) -> Result<Self, FormulaError> {
        let err = |position: usize, message: String| FormulaError {
            formula: text.to_owned(),
            position,
            message,
        };
        if text.trim().is_empty() {
            return Err(err(0, "the formula is empty".into()));
        }
        if text.chars().count() > MAX_LEN {
            return Err(err(
                MAX_LEN,
                format!("a formula is at most {MAX_LEN} characters"),
            ));
        }
        let mut elements = BTreeMap::new();
        let mut hydrate_water = 0.0;
        let mut offset = 0;
        for (index, part) in text.split(['·', '*', '•']).enumerate() {
            let part_chars: Vec<char> = part.chars().collect();
            let mut parser = Parser {
                chars: &part_chars,
                pos: 0,
                offset,
                text,
            };
            parser.skip_spaces();
            let multiplier = if index > 0 {
                parser.number()?.unwrap_or(1.0)
            } else {
                1.0
            };
            let counts = parser.group(0)?;
            if parser.pos < part_chars.len() {
                return Err(err(
                    offset + parser.pos,
                    format!("unexpected '{}'", part_chars[parser.pos]),
                ));
            }
            if counts.is_empty() {
                return Err(err(offset, "a part of the formula has no elements".into()));
            }
            if index > 0 && is_water(&counts) {
                hydrate_water += multiplier;
            }
            for (el, n) in counts {
                *elements.entry(el).or_insert(0.0) += n * multiplier;
            }
            offset += part_chars.len() + 1;
        }
        Ok(Self {
            elements,
            hydrate_water,
        })
    }

    /// Molar mass in g/mol from the standard atomic weights.
    pub fn molar_mass_g_per_mol(&self) -> f64 {
        self.elements
            .iter()
            .map(|(el, n)| atomic_weight(el).unwrap_or(0.0) * n)
            .sum()
    }
}

/// Standard atomic weight of an element symbol, if it is one we carry.
pub fn atomic_weight(symbol: &str) -> Option<f64> {
    ATOMIC_WEIGHTS
        .iter()
        .find(|(s, _)| *s == symbol)
        .map(|(_, w)| *w)
}

fn is_water(counts: &BTreeMap<String, f64>) -> bool {
    counts.len() == 2 && counts.get("H") == Some(&2.0) && counts.get("O") == Some(&1.0)
}

struct Parser<'a> {
    chars: &'a [char],
    pos: usize,
    offset: usize,
    text: &'a str,
}

impl Parser<'_> {
    fn error(&self, message: String) -> FormulaError {
        FormulaError {
            formula: self.text.to_owned(),
            position: self.offset + self.pos,
            message,
        }
    }

    fn skip_spaces(&mut self) {
        while self.chars.get(self.pos).is_some_and(|c| c.is_whitespace()) {
            self.pos += 1;
        }
    }

    fn number(&mut self) -> Result<Option<f64>, FormulaError> {
        let start = self.pos;
        while self
            .chars
            .get(self.pos)
            .is_some_and(|c| c.is_ascii_digit() || *c == '.')
        {
            self.pos += 1;
        }
        if start == self.pos {
            return Ok(None);
        }
        let digits: String = self.chars[start..self.pos].iter().collect();
        match digits.parse::<f64>() {
            Ok(n) if n > 0.0 && n <= 1000.0 => Ok(Some(n)),
            _ => {
                self.pos = start;
                Err(self.error(format!("'{digits}' is not a count between 1 and 1000")))
            }
        }
    }

    fn group(&mut self, depth: usize) -> Result<BTreeMap<String, f64>, FormulaError> {
        if depth > MAX_DEPTH {
            return Err(self.error(format!("brackets nest deeper than {MAX_DEPTH} levels")));
        }
        let mut counts: BTreeMap<String, f64> = BTreeMap::new();
        while let Some(&c) = self.chars.get(self.pos) {
            if c == '(' || c == '[' {
                let close = if c == '(' { ')' } else { ']' };
                self.pos += 1;
                let inner = self.group(depth + 1)?;
                if self.chars.get(self.pos) != Some(&close) {
                    return Err(self.error(format!("expected '{close}'")));
                }
                self.pos += 1;
                let n = self.number()?.unwrap_or(1.0);
                for (el, k) in inner {
                    *counts.entry(el).or_insert(0.0) += k * n;
                }
            } else if c.is_ascii_uppercase() {
                let mut symbol = c.to_string();
                self.pos += 1;
                while let Some(&l) = self.chars.get(self.pos) {
                    if l.is_ascii_lowercase() {
                        symbol.push(l);
                        self.pos += 1;
                    } else {
                        break;
                    }
                }
                if atomic_weight(&symbol).is_none() {
                    self.pos -= symbol.chars().count();
                    return Err(
                        self.error(format!("'{symbol}' is not an element this library knows"))
                    );
                }
                let n = self.number()?.unwrap_or(1.0);
                *counts.entry(symbol).or_insert(0.0) += n;
            } else if c == ')' || c == ']' {
                if depth == 0 {
                    return Err(self.error(format!("'{c}' has no opening bracket")));
                }
                break;
            } else if c.is_whitespace() {
                self.pos += 1;
            } else {
                return Err(self.error(format!(
                    "unexpected '{c}': use element symbols, counts, brackets and '·' for hydrates"
                )));
            }
        }
        Ok(counts)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn hydrate_water_is_counted() {
        let f = Formula::parse("Na3C6H5O7·2H2O").unwrap();
        assert_eq!(f.hydrate_water, 2.0);
        assert_eq!(f.elements["O"], 9.0);
    }

    #[test]
    fn brackets_multiply() {
        let f = Formula::parse("Al2(SO4)3").unwrap();
        assert_eq!(f.elements["O"], 12.0);
        assert_eq!(f.elements["S"], 3.0);
    }

    #[test]
    fn errors_name_the_position() {
        let e = Formula::parse("NaXy").unwrap_err();
        assert_eq!(e.position, 2);
        assert!(e.message.contains("Xy"));
        assert!(Formula::parse("Ca(OH2").is_err());
        assert!(Formula::parse("").is_err());
        assert!(Formula::parse("H2O)").is_err());
        assert!(Formula::parse(&"(".repeat(20)).is_err());
    }
}
