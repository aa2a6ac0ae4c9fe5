//! Suggestions for a mistyped ingredient id, by edit distance.

use super::Library;

impl Library {
    /// The ingredient ids nearest to a mistyped one, best first.
    pub fn suggest(&self, id: &str) -> Vec<String> {
        let needle = id.to_ascii_lowercase();
        let mut scored: Vec<(usize, usize, &str)> = self
            .entries
            .iter()
            .map(|e| {
                let cand = e.ingredient.id.as_str();
                let full = edit_distance(&needle, cand);
                let mut d = full.min(prefix_distance(&needle, cand));
                if cand.contains(&needle) || needle.contains(cand) {
                    d = d.min(2);
                }
                // Ties go to the id closest as a whole (citric_acid before its monohydrate).
                (d, full, cand)
            })
            .filter(|(d, _, _)| *d <= 3.max(needle.len() / 3))
            .collect();
        scored.sort_unstable();
        scored
            .into_iter()
            .take(3)
            .map(|(_, _, c)| c.to_owned())
            .collect()
    }
}

/// Distance from a typed id to the nearest leading part of a candidate that ends at a word
/// boundary (`citric`, `citric_acid`, …), plus one for the words left off: people type the
/// start of an id (`citrc` for `citric_acid`).
fn prefix_distance(needle: &str, cand: &str) -> usize {
    cand.match_indices('_')
        .map(|(i, _)| edit_distance(needle, &cand[..i]) + 1)
        .min()
        .unwrap_or(usize::MAX)
}

/// Levenshtein distance between two strings, in characters.
fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    for (i, ca) in a.chars().enumerate() {
        let mut cur = vec![i + 1; b.len() + 1];
        for (j, cb) in b.iter().enumerate() {
            let sub = prev[j] + usize::from(ca != *cb);
            cur[j + 1] = sub.min(prev[j + 1] + 1).min(cur[j] + 1);
        }
        prev = cur;
    }
    prev[b.len()]
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn edit_distance_counts_single_character_edits() {
        // kitten → sitting needs 3 edits (the textbook Levenshtein example, from memory).
        assert_eq!(edit_distance("kitten", "sitting"), 3);
        assert_eq!(edit_distance("", "abc"), 3);
        assert_eq!(edit_distance("same", "same"), 0);
    }

    #[test]
    fn the_start_of_an_id_counts_as_near() {
        // "citrc" is one edit from "citric", the first word of "citric_acid" (by hand).
        assert_eq!(prefix_distance("citrc", "citric_acid"), 2);
        assert_eq!(prefix_distance("water", "water"), usize::MAX);
    }
}
