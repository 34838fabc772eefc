//! How a series looks: colour, dash pattern and marker shape, each distinct, so that curves
//! part in colour, in grey print and for colour-blind readers alike.

use super::super::svg::{Svg, attr, num};

/// Okabe–Ito colours (Okabe & Ito 2008), reordered so the first ones differ most in lightness
/// as well as hue; yellow (#F0E442) is left out because it vanishes on white paper.
const PALETTE: [&str; 7] = [
    "#0072B2", // blue
    "#D55E00", // vermillion
    "#009E73", // bluish green
    "#CC79A7", // reddish purple
    "#E69F00", // orange
    "#56B4E9", // sky blue
    "#000000", // black
];

/// Dash patterns (stroke-dasharray), first solid; each one reads apart in grey print.
const DASHES: [&str; 6] = [
    "none",
    "9 4",
    "2.5 3",
    "12 3 2.5 3",
    "5 5",
    "14 3 2.5 3 2.5 3",
];

/// Marker shapes, in the order series get them.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Marker {
    Circle,
    Square,
    TriangleUp,
    Diamond,
    TriangleDown,
    Cross,
    Star,
}

const MARKERS: [Marker; 7] = [
    Marker::Circle,
    Marker::Square,
    Marker::TriangleUp,
    Marker::Diamond,
    Marker::TriangleDown,
    Marker::Cross,
    Marker::Star,
];

/// How series number `i` is drawn: colour, dash and marker all change with `i`, with
/// different cycle lengths, so two series never share all three.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Look {
    pub color: &'static str,
    pub dash: &'static str,
    pub marker: Marker,
}

impl Look {
    pub fn of(i: usize) -> Look {
        Look {
            color: PALETTE[i % PALETTE.len()],
            dash: DASHES[i % DASHES.len()],
            marker: MARKERS[i % MARKERS.len()],
        }
    }
}

/// A marker shape centred on (x, y), filled with the series colour and outlined in white so
/// it stands out where curves cross.
pub(super) fn marker(s: &mut Svg, look: Look, x: f64, y: f64, r: f64) {
    let paint = [
        attr("fill", look.color),
        attr("stroke", "#ffffff"),
        attr("stroke-width", 1.2),
    ];
    let poly = |pts: &[(f64, f64)]| -> String {
        pts.iter()
            .map(|(dx, dy)| format!("{},{}", num(x + dx * r), num(y + dy * r)))
            .collect::<Vec<_>>()
            .join(" ")
    };
    let mut at: Vec<(&str, String)> = match look.marker {
        Marker::Circle => vec![attr("cx", num(x)), attr("cy", num(y)), attr("r", num(r))],
        Marker::Square => vec![attr(
            "points",
            poly(&[(-0.9, -0.9), (0.9, -0.9), (0.9, 0.9), (-0.9, 0.9)]),
        )],
        Marker::TriangleUp => vec![attr(
            "points",
            poly(&[(0.0, -1.2), (1.1, 0.8), (-1.1, 0.8)]),
        )],
        Marker::TriangleDown => {
            vec![attr(
                "points",
                poly(&[(0.0, 1.2), (1.1, -0.8), (-1.1, -0.8)]),
            )]
        }
        Marker::Diamond => vec![attr(
            "points",
            poly(&[(0.0, -1.25), (1.0, 0.0), (0.0, 1.25), (-1.0, 0.0)]),
        )],
        Marker::Cross => vec![attr(
            "points",
            poly(&[
                (-0.35, -1.1),
                (0.35, -1.1),
                (0.35, -0.35),
                (1.1, -0.35),
                (1.1, 0.35),
                (0.35, 0.35),
                (0.35, 1.1),
                (-0.35, 1.1),
                (-0.35, 0.35),
                (-1.1, 0.35),
                (-1.1, -0.35),
                (-0.35, -0.35),
            ]),
        )],
        Marker::Star => {
            let pts: Vec<(f64, f64)> = (0..10)
                .map(|k| {
                    let a = std::f64::consts::PI * (k as f64 / 5.0 - 0.5);
                    let rr = if k % 2 == 0 { 1.3 } else { 0.55 };
                    (rr * a.cos(), rr * a.sin())
                })
                .collect();
            vec![attr("points", poly(&pts))]
        }
    };
    at.extend(paint);
    let name = if look.marker == Marker::Circle {
        "circle"
    } else {
        "polygon"
    };
    s.leaf(name, &at);
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn looks_differ_in_every_channel_for_the_first_six() {
        for i in 0..6 {
            for j in 0..i {
                let (a, b) = (Look::of(i), Look::of(j));
                assert!(a.color != b.color && a.dash != b.dash && a.marker != b.marker);
            }
        }
    }
}
