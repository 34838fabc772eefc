//! The frame of each panel: plot area, grid, ticks, axis titles; and what spans all panels,
//! the shaded window and the vertical marks.

use super::super::svg::{Svg, attr, num};
use super::{Band, Chart, Frame, GRID, INK, MUTED, Mark, PAPER, Panel};

/// Tick positions for `[lo, hi]`: a step of 1, 2, 2.5 or 5 times a power of ten giving about
/// `target` intervals.
pub fn ticks(lo: f64, hi: f64, target: usize) -> Vec<f64> {
    if !lo.is_finite() || !hi.is_finite() || hi <= lo {
        return vec![];
    }
    let raw = (hi - lo) / target.max(1) as f64;
    let power = 10f64.powf(raw.log10().floor());
    let step = [1.0, 2.0, 2.5, 5.0, 10.0]
        .iter()
        .map(|m| m * power)
        .find(|s| *s >= raw * 0.999)
        .unwrap_or(10.0 * power);
    let first = (lo / step).ceil() as i64;
    let last = (hi / step + 1e-9).floor() as i64;
    (first..=last).map(|k| k as f64 * step).collect()
}

fn tick_text(v: f64, percent: bool) -> String {
    if percent {
        num(v * 100.0)
    } else {
        num(v).replace('-', "\u{2212}")
    }
}

/// Plot area, grid, ticks and axis titles of one panel.
pub(super) fn draw_axes(s: &mut Svg, chart: &Chart, panel: &Panel, f: &Frame, last: bool) {
    s.leaf(
        "rect",
        &[
            attr("x", num(f.x0)),
            attr("y", num(f.top)),
            attr("width", num(f.x1 - f.x0)),
            attr("height", num(f.bottom - f.top)),
            attr("fill", PAPER),
        ],
    );
    s.open("g", &[attr("stroke", GRID), attr("stroke-width", 1)]);
    let xt = ticks(chart.x_min, chart.x_max, 14);
    for &x in &xt {
        s.leaf("line", &vline(f.px(x), f.top, f.bottom));
    }
    let yt = ticks(panel.y_min, panel.y_max, 4);
    for &y in &yt {
        s.leaf("line", &hline(f.x0, f.x1, f.py(y)));
    }
    s.close("g");
    // Axis lines on the left and bottom only: an open frame, lighter than a box.
    s.open("g", &[attr("stroke", INK), attr("stroke-width", 1.2)]);
    s.leaf("line", &hline(f.x0, f.x1, f.bottom));
    s.leaf("line", &vline(f.x0, f.top, f.bottom));
    for &x in &xt {
        s.leaf("line", &vline(f.px(x), f.bottom, f.bottom + 5.0));
    }
    for &y in &yt {
        s.leaf("line", &hline(f.x0 - 5.0, f.x0, f.py(y)));
    }
    s.close("g");
    s.open("g", &[attr("font-size", 12), attr("fill", INK)]);
    for &x in &xt {
        let at = [
            attr("x", num(f.px(x))),
            attr("y", num(f.bottom + 19.0)),
            attr("text-anchor", "middle"),
        ];
        s.text("text", &at, &tick_text(x, false));
    }
    for &y in &yt {
        let at = [
            attr("x", num(f.x0 - 9.0)),
            attr("y", num(f.py(y) + 4.0)),
            attr("text-anchor", "end"),
        ];
        s.text("text", &at, &tick_text(y, panel.percent));
    }
    s.close("g");
    let mid = (f.top + f.bottom) / 2.0;
    s.text(
        "text",
        &[
            attr(
                "transform",
                format!("translate({} {}) rotate(-90)", num(24.0), num(mid)),
            ),
            attr("text-anchor", "middle"),
            attr("font-size", 13),
        ],
        &panel.y_label,
    );
    if last {
        draw_x_title(s, chart, f);
    }
}

fn draw_x_title(s: &mut Svg, chart: &Chart, f: &Frame) {
    let y = f.bottom + 40.0;
    s.text(
        "text",
        &[
            attr("x", num((f.x0 + f.x1) / 2.0)),
            attr("y", num(y)),
            attr("text-anchor", "middle"),
        ],
        &chart.x_label,
    );
    let small = |x: f64, anchor: &str| {
        [
            attr("x", num(x)),
            attr("y", num(y)),
            attr("text-anchor", anchor.to_string()),
            attr("font-size", 11),
            attr("font-style", "italic"),
            attr("fill", MUTED),
        ]
    };
    s.text(
        "text",
        &small(f.x0, "start"),
        &format!("\u{2190} {}", chart.x_ends.0),
    );
    s.text(
        "text",
        &small(f.x1, "end"),
        &format!("{} \u{2192}", chart.x_ends.1),
    );
}

fn vline(x: f64, y0: f64, y1: f64) -> [(&'static str, String); 4] {
    [
        attr("x1", num(x)),
        attr("x2", num(x)),
        attr("y1", num(y0)),
        attr("y2", num(y1)),
    ]
}

fn hline(x0: f64, x1: f64, y: f64) -> [(&'static str, String); 4] {
    [
        attr("x1", num(x0)),
        attr("x2", num(x1)),
        attr("y1", num(y)),
        attr("y2", num(y)),
    ]
}

/// The shaded window: light grey with dashed edges, so it survives grey print; its label sits
/// above the first panel.
pub(super) fn draw_band(s: &mut Svg, band: &Band, frames: &[Frame]) {
    let (Some(first), Some(_)) = (frames.first(), frames.last()) else {
        return;
    };
    let x0 = first.px(band.x0.max(first.x_min));
    let x1 = first.px(band.x1.min(first.x_max));
    for f in frames {
        s.leaf(
            "rect",
            &[
                attr("class", "band"),
                attr("x", num(x0)),
                attr("y", num(f.top)),
                attr("width", num((x1 - x0).max(1.0))),
                attr("height", num(f.bottom - f.top)),
                attr("fill", "#000000"),
                attr("fill-opacity", 0.07),
            ],
        );
        for x in [x0, x1] {
            let mut at = vline(x, f.top, f.bottom).to_vec();
            at.extend([
                attr("stroke", MUTED),
                attr("stroke-width", 0.8),
                attr("stroke-dasharray", "3 3"),
            ]);
            s.leaf("line", &at);
        }
    }
    let mid = (x0 + x1) / 2.0;
    let anchor = if mid < first.x0 + 110.0 {
        ("start", x0)
    } else if mid > first.x1 - 110.0 {
        ("end", x1)
    } else {
        ("middle", mid)
    };
    s.text(
        "text",
        &[
            attr("x", num(anchor.1)),
            attr("y", num(first.top - 8.0)),
            attr("text-anchor", anchor.0),
            attr("font-size", 12),
            attr("fill", MUTED),
        ],
        &band.label,
    );
}

/// Vertical lines at chosen x values, labelled above the first panel (staggered when close).
pub(super) fn draw_marks(s: &mut Svg, marks: &[Mark], frames: &[Frame]) {
    let Some(first) = frames.first() else {
        return;
    };
    let mut placed: Vec<f64> = Vec::new();
    for m in marks {
        if m.x < first.x_min || m.x > first.x_max {
            continue;
        }
        let x = first.px(m.x);
        for f in frames {
            let mut at = vline(x, f.top, f.bottom).to_vec();
            at.extend([
                attr("class", "mark"),
                attr("stroke", INK),
                attr("stroke-width", 1.4),
            ]);
            s.leaf("line", &at);
        }
        // Above the band label row; a second row when two marks sit within 60 px.
        let row = placed.iter().filter(|&&p| (p - x).abs() < 60.0).count();
        placed.push(x);
        s.text(
            "text",
            &[
                attr("x", num(x)),
                attr("y", num(first.top - 26.0 - 15.0 * row as f64)),
                attr("text-anchor", "middle"),
                attr("font-size", 12),
                attr("font-weight", "bold"),
            ],
            &m.label,
        );
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ticks_are_round_numbers() {
        assert_eq!(
            ticks(0.0, 14.0, 14),
            (0..=14).map(f64::from).collect::<Vec<_>>()
        );
        assert_eq!(ticks(0.0, 1.0, 4), vec![0.0, 0.25, 0.5, 0.75, 1.0]);
        assert_eq!(ticks(-4.0, 3.0, 4), vec![-4.0, -2.0, 0.0, 2.0]);
        assert!(ticks(1.0, 1.0, 4).is_empty());
    }
}
