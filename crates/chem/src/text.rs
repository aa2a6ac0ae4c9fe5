//! Chemical notation for people and for scripts: superscript charges, `×10⁻⁵`, and back to ASCII.
//!
//! One rule for every front end: explanations and labels are built once, in display notation
//! (`Na⁺`, `NO₃⁻`, `Ka = 1.8×10⁻⁵`), and [`ascii`] turns any such text into plain ASCII
//! (`Na+`, `NO3-`, `Ka = 1.8e-5`) for JSON, ids and files. [`Notation`] names the two.

/// Which notation a text is wanted in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Notation {
    /// Superscript charges, subscript counts, `×10` powers: for windows and terminal text.
    #[default]
    Display,
    /// Plain ASCII: for JSON and anything a script reads.
    Ascii,
}

impl Notation {
    /// `text` (written in display notation) in this notation.
    pub fn apply(self, text: &str) -> String {
        match self {
            Self::Display => text.to_owned(),
            Self::Ascii => ascii(text),
        }
    }
}

const SUPER_DIGITS: [char; 10] = ['⁰', '¹', '²', '³', '⁴', '⁵', '⁶', '⁷', '⁸', '⁹'];
const SUB_DIGITS: [char; 10] = ['₀', '₁', '₂', '₃', '₄', '₅', '₆', '₇', '₈', '₉'];

/// An integer in superscript digits, with `⁻` for a negative sign (e.g. `-5` → `⁻⁵`).
pub fn superscript(n: i64) -> String {
    let mut s = String::new();
    if n < 0 {
        s.push('⁻');
    }
    for d in n.unsigned_abs().to_string().bytes() {
        s.push(SUPER_DIGITS[usize::from(d - b'0')]);
    }
    s
}

/// A charge as written after an ion: `⁺`, `²⁻`, `³⁺`; `0` stays `0`.
pub fn charge_superscript(charge: i64) -> String {
    let sign = if charge > 0 { '⁺' } else { '⁻' };
    match charge.unsigned_abs() {
        0 => "0".to_owned(),
        1 => sign.to_string(),
        m => {
            let mut s = superscript(m as i64);
            s.push(sign);
            s
        }
    }
}

/// An ion's ASCII symbol (`NO3-`, `Ca2+`, `Na+`) for display, with subscript counts and a
/// superscript charge: `NO₃⁻`, `Ca²⁺`, `Na⁺`. Any charge written at the end of the symbol is
/// replaced by `charge`.
pub fn ion_display(symbol_ascii: &str, charge: i64) -> String {
    let body = symbol_ascii.trim_end_matches(['+', '-']);
    // A trailing magnitude belongs to the charge ("Ca2+") only when a sign followed it.
    let body = if body.len() < symbol_ascii.len() && charge.unsigned_abs() > 1 {
        let m = charge.unsigned_abs().to_string();
        body.strip_suffix(m.as_str()).unwrap_or(body)
    } else {
        body
    };
    let mut s = formula_display(body);
    if charge != 0 {
        s += &charge_superscript(charge);
    }
    s
}

/// A formula with its counts as subscripts: `H2PO4` → `H₂PO₄`, `(NH4)2SO4` → `(NH₄)₂SO₄`.
pub fn formula_display(formula_ascii: &str) -> String {
    let mut out = String::with_capacity(formula_ascii.len());
    let mut prev: Option<char> = None;
    for c in formula_ascii.chars() {
        // A digit after a letter, a closing bracket or another subscript digit is a count.
        let is_count = c.is_ascii_digit()
            && prev.is_some_and(|p| p.is_ascii_alphabetic() || p == ')' || SUB_DIGITS.contains(&p));
        let shown = if is_count {
            SUB_DIGITS[usize::from(c as u8 - b'0')]
        } else {
            c
        };
        out.push(shown);
        prev = Some(shown);
    }
    out
}

/// A constant in two significant figures with a `×10` power: `1.8×10⁻⁵`; `0` and values from
/// 0.01 to 1000 without the power (`0.25`, `3.2`).
pub fn constant_display(x: f64) -> String {
    if !x.is_finite() {
        return format!("{x}");
    }
    if x == 0.0 {
        return "0".to_owned();
    }
    let a = x.abs();
    if (0.01..1000.0).contains(&a) {
        let digits = (1 - a.log10().floor() as i32).max(0) as usize;
        return format!("{x:.digits$}");
    }
    // `{:.1e}` gives e.g. "1.8e-5": the mantissa already rounded to two figures.
    let s = format!("{x:.1e}");
    match s.split_once('e') {
        Some((mantissa, exp)) => match exp.parse::<i64>() {
            Ok(e) => format!("{mantissa}×10{}", superscript(e)),
            Err(_) => s,
        },
        None => s,
    }
}

/// Display text in plain ASCII: `×10⁻⁵` → `e-5`, superscript and subscript digits and signs to
/// their ASCII forms, `−` and `–` to `-`, `×` to `x`, `·` to `.`, `°` to `deg`; other
/// characters outside ASCII are kept only if they have no plain form here.
pub fn ascii(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    let mut chars = text.chars().peekable();
    while let Some(c) = chars.next() {
        // "×10" followed by a superscript power is scientific notation.
        if c == '×' {
            let mut look = chars.clone();
            if look.next() == Some('1')
                && look.next() == Some('0')
                && look.peek().is_some_and(|n| is_superscript(*n))
            {
                chars.next();
                chars.next();
                out.push('e');
                while let Some(&n) = chars.peek() {
                    if !is_superscript(n) {
                        break;
                    }
                    out.push(plain(n));
                    chars.next();
                }
                continue;
            }
            out.push('x');
            continue;
        }
        match c {
            '°' => out.push_str("deg"),
            '…' => out.push_str("..."),
            '≤' => out.push_str("<="),
            '≥' => out.push_str(">="),
            '≈' => out.push('~'),
            _ => out.push(plain(c)),
        }
    }
    out
}

fn is_superscript(c: char) -> bool {
    SUPER_DIGITS.contains(&c) || c == '⁻' || c == '⁺'
}

/// The ASCII form of one character, or the character itself.
fn plain(c: char) -> char {
    if let Some(d) = SUPER_DIGITS.iter().position(|&s| s == c) {
        return char::from(b'0' + d as u8);
    }
    if let Some(d) = SUB_DIGITS.iter().position(|&s| s == c) {
        return char::from(b'0' + d as u8);
    }
    match c {
        '⁺' => '+',
        '⁻' | '−' | '–' | '—' => '-',
        '·' => '.',
        '’' => '\'',
        _ => c,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn superscripts_and_charges() {
        assert_eq!(superscript(-5), "⁻⁵");
        assert_eq!(superscript(12), "¹²");
        assert_eq!(charge_superscript(1), "⁺");
        assert_eq!(charge_superscript(-2), "²⁻");
        assert_eq!(charge_superscript(0), "0");
    }

    #[test]
    fn ions_for_display() {
        assert_eq!(ion_display("NO3-", -1), "NO₃⁻");
        assert_eq!(ion_display("Na+", 1), "Na⁺");
        assert_eq!(ion_display("Ca2+", 2), "Ca²⁺");
        assert_eq!(ion_display("Ca", 2), "Ca²⁺");
        assert_eq!(ion_display("H2PO4-", -1), "H₂PO₄⁻");
    }

    #[test]
    fn constants_for_display() {
        // Acetic acid Ka = 10^−4.756 ≈ 1.75e-5 (pKa from Goldberg et al. 2002, from memory).
        assert_eq!(constant_display(10f64.powf(-4.756)), "1.8×10⁻⁵");
        assert_eq!(constant_display(2.5e7), "2.5×10⁷");
        assert_eq!(constant_display(0.25), "0.25");
        assert_eq!(constant_display(0.0), "0");
    }

    #[test]
    fn display_text_back_to_ascii() {
        assert_eq!(ascii("Ka = 1.8×10⁻⁵"), "Ka = 1.8e-5");
        assert_eq!(ascii("NO₃⁻ and Ca²⁺"), "NO3- and Ca2+");
        assert_eq!(ascii("Kb is 30× Ka; acid–base"), "Kb is 30x Ka; acid-base");
        assert_eq!(Notation::Ascii.apply("Na⁺"), "Na+");
        assert_eq!(Notation::Display.apply("Na⁺"), "Na⁺");
        assert!(ascii("pH −1…15, 25 °C").is_ascii());
    }
}
