//! Citations cut short for tables and pictures: first author (and "et al." or the second)
//! and year, from the full citation text the reference holds.

/// A citation cut to its first author and year: "Perry, R. H.; Green, D. W.; Maloney, J. O.
/// (editors). Perry's ... McGraw-Hill, 1997. ..." gives "Perry et al. 1997". The year is
/// the first number from 1800 to 2100 standing alone; without one, the author alone.
pub fn short_citation(citation: &str) -> String {
    let surname = citation.split([',', '.']).next().unwrap_or("").trim();
    let authors = authors_part(citation);
    let count = authors.matches(';').count() + 1;
    let who = match count {
        1 => surname.to_string(),
        2 => {
            let second = authors
                .split(';')
                .nth(1)
                .and_then(|a| a.split(',').next())
                .unwrap_or("")
                .trim();
            format!("{surname} and {second}")
        }
        _ => format!("{surname} et al."),
    };
    match year(citation) {
        Some(y) => format!("{who} {y}"),
        None => who,
    }
}

/// The list of authors at the head of a citation: up to the first full stop that ends a
/// word of more than two letters (initials end in one letter and a stop).
fn authors_part(citation: &str) -> &str {
    let mut word_len = 0;
    for (i, c) in citation.char_indices() {
        if c == '.' && word_len > 2 {
            return &citation[..i];
        }
        if c.is_alphabetic() || c == ')' || c == '-' {
            word_len += 1;
        } else {
            word_len = 0;
        }
    }
    citation
}

fn year(citation: &str) -> Option<u32> {
    citation
        .split(|c: char| !c.is_ascii_digit())
        .filter(|run| run.len() == 4)
        .filter_map(|run| run.parse::<u32>().ok())
        .find(|y| (1800..=2100).contains(y))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn citations_shorten_to_author_and_year() {
        let perry = "Perry, R. H.; Green, D. W.; Maloney, J. O. (editors). Perry's Chemical \
                     Engineers' Handbook, 7th edition. McGraw-Hill, 1997. Section 2.";
        assert_eq!(short_citation(perry), "Perry et al. 1997");
        let crc = "Haynes, W. M. (editor-in-chief). CRC Handbook of Chemistry and Physics, \
                   97th edition. CRC Press, 2016. Section 5.";
        assert_eq!(short_citation(crc), "Haynes 2016");
        let two = "Laliberté, M.; Cooper, W. E. Model for Calculating the Density of Aqueous \
                   Electrolyte Solutions. J. Chem. Eng. Data, 2004.";
        assert_eq!(short_citation(two), "Laliberté and Cooper 2004");
        let pages = "Hudson, C. S. The hydration of milk-sugar in solution. Journal of the \
                     American Chemical Society, vol. 26, pp. 1065-1082, 1904.";
        assert_eq!(short_citation(pages), "Hudson 1904");
    }
}
