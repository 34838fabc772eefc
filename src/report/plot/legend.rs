//! Under the panels: one legend row per series (line sample, marker, full text), then the
//! notes, wrapped to the figure's width.

use super::super::svg::{Svg, attr, num};
use super::look::{Look, marker};
use super::{Chart, LEFT, LINE, MUTED};

/// Legend rows (line sample, marker, full text) and notes under the last panel.
pub(super) fn draw_legend(s: &mut Svg, chart: &Chart, top: f64) {
    let mut y = top;
    for entry in &chart.legend {
        let look = Look::of(entry.look);
        s.leaf(
            "path",
            &[
                attr("d", format!("M{} {}h40", num(LEFT), num(y - 4.0))),
                attr("stroke", look.color),
                attr("stroke-width", 2.2),
                attr("stroke-dasharray", look.dash),
            ],
        );
        marker(s, look, LEFT + 20.0, y - 4.0, 4.5);
        s.text(
            "text",
            &[attr("x", num(LEFT + 50.0)), attr("y", num(y))],
            &entry.text,
        );
        y += LINE;
    }
    let lines = chart
        .notes
        .iter()
        .flat_map(|n| wrap(n, NOTE_CHARS).into_iter().enumerate());
    for (k, line) in lines {
        // Continuation lines step in, so each note reads as one item.
        let indent = if k == 0 { 0.0 } else { 14.0 };
        s.text(
            "text",
            &[
                attr("x", num(LEFT + indent)),
                attr("y", num(y)),
                attr("font-size", 12),
                attr("fill", MUTED),
            ],
            &line,
        );
        y += LINE;
    }
}

/// Characters of a 12-unit note line across the figure.
pub(super) const NOTE_CHARS: usize = 100;

/// Splits `text` at spaces into lines of at most `width` characters (a longer word gets a
/// line of its own).
pub(super) fn wrap(text: &str, width: usize) -> Vec<String> {
    let mut lines: Vec<String> = Vec::new();
    let mut line = String::new();
    for word in text.split(' ') {
        if !line.is_empty() && line.chars().count() + 1 + word.chars().count() > width {
            lines.push(std::mem::take(&mut line));
        }
        if !line.is_empty() {
            line.push(' ');
        }
        line.push_str(word);
    }
    lines.push(line);
    lines
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn notes_wrap_at_spaces() {
        assert_eq!(wrap("ab cd ef", 5), vec!["ab cd", "ef"]);
        assert_eq!(wrap("abcdefgh", 3), vec!["abcdefgh"]);
    }
}
