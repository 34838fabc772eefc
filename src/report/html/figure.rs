//! Figures for reports: the ionization curves of a set of compounds with chosen pH values
//! marked (targets of `adjust`, steps of a plan or a procedure, the pH of a buffer).

use super::Block;
use crate::report::ionization::{self, Compound, Options};

/// The curves of `compounds` (fraction ionized, and logD where the logP is known) on 0-14,
/// widened to hold any mark outside it, each distinct pH of `marks` drawn as a line; the pH
/// axis says 25 °C.
pub fn ionization_figure(compounds: &[Compound], marks: &[f64], caption: &str) -> Block {
    ionization_figure_at(compounds, marks, caption, 25.0)
}

/// [`ionization_figure`] for a run at `temperature_c` (°C), which the pH axis names.
pub fn ionization_figure_at(
    compounds: &[Compound],
    marks: &[f64],
    caption: &str,
    temperature_c: f64,
) -> Block {
    let mut distinct: Vec<f64> = Vec::new();
    for m in marks.iter().filter(|m| m.is_finite()) {
        if !distinct.iter().any(|d| (d - m).abs() < 1e-9) {
            distinct.push(*m);
        }
    }
    let from = distinct.iter().copied().fold(0.0f64, f64::min).floor();
    let to = distinct.iter().copied().fold(14.0f64, f64::max).ceil();
    let chart = ionization::chart(
        compounds,
        &Options {
            from,
            to,
            charge: false,
            marks: distinct,
            temperature_c,
        },
    );
    Block::Figure {
        svg: chart.to_svg(),
        caption: caption.to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::acidity::{Handbook, Profile};

    #[test]
    fn marks_outside_the_usual_range_widen_the_axis_and_repeats_draw_once() {
        let hb = Handbook::builtin().unwrap();
        let acid = Compound::new(&Profile::new("CC(=O)O", &hb).unwrap(), None);
        let Block::Figure { svg, caption } = ionization_figure(&[acid], &[15.2, 8.0, 8.0], "c")
        else {
            panic!("a figure");
        };
        assert_eq!(caption, "c");
        assert_eq!(svg.matches(">pH 15.2</text>").count(), 1, "{svg}");
        assert_eq!(svg.matches(">pH 8</text>").count(), 1);
        // The axis now ends at 16: a tick label shows it.
        assert!(svg.contains(">16</text>"));
        assert!(svg.contains("pH (aqueous, 25 \u{b0}C)"), "{svg}");
    }

    #[test]
    fn the_axis_names_the_temperature_of_the_run() {
        let hb = Handbook::builtin().unwrap();
        let acid = Compound::new(&Profile::new("CC(=O)O", &hb).unwrap(), None);
        let Block::Figure { svg, .. } = ionization_figure_at(&[acid], &[4.0], "c", 37.5) else {
            panic!("a figure");
        };
        assert!(svg.contains("pH (aqueous, 37.5 \u{b0}C)"), "{svg}");
        assert!(!svg.contains("25 \u{b0}C"));
    }
}
