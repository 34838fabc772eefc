//! The curves of one panel: clipped paths, markers along them, labelled points (pKa) and the
//! direct labels at their right ends.

use super::super::svg::{Svg, attr, num};
use super::look::{Look, marker};
use super::{Callout, Frame, Panel, Series};

/// Curves, their markers, callouts and direct end labels in one panel.
pub(super) fn draw_panel_series(s: &mut Svg, panel: &Panel, f: &Frame) {
    let mut taken: Vec<(f64, f64, f64, f64)> = Vec::new();
    let mut ends: Vec<(f64, f64, usize)> = Vec::new();
    for (k, series) in panel.series.iter().enumerate() {
        let look = Look::of(series.look);
        let d = path_data(&series.points, f);
        if d.is_empty() {
            continue;
        }
        s.leaf(
            "path",
            &[
                // Classes name the parts for tests and for an HTML page's own CSS; nothing
                // in the SVG depends on them.
                attr("class", "curve"),
                attr("d", d),
                attr("fill", "none"),
                attr("stroke", look.color),
                attr("stroke-width", 2.2),
                attr("stroke-dasharray", look.dash),
                attr("stroke-linejoin", "round"),
            ],
        );
        // Markers every 2 pH units, shifted per series so overlapping curves keep theirs.
        let n = panel.series.len().max(1) as f64;
        let offset = 0.5 + 1.5 * k as f64 / n;
        let mut x = f.x_min + offset;
        while x <= f.x_max {
            if let Some(y) = value_at(&series.points, x).filter(|y| in_range(*y, f)) {
                marker(s, look, f.px(x), f.py(y), 4.2);
            }
            x += 2.0;
        }
        if let Some(&(x, y)) = series.points.iter().rev().find(|(_, y)| in_range(*y, f)) {
            ends.push((f.px(x), f.py(y), k));
        }
    }
    // Every labelled point is an obstacle for every label, so close pKa values of two
    // curves do not write over each other's points.
    for c in panel.series.iter().flat_map(|s| &s.callouts) {
        taken.push((f.px(c.x) - 6.0, f.py(c.y) + 6.0, 12.0, 12.0));
    }
    for series in &panel.series {
        for c in &series.callouts {
            draw_callout(s, series, c, f, &mut taken);
        }
    }
    draw_end_labels(s, panel, f, ends);
}

fn in_range(y: f64, f: &Frame) -> bool {
    y.is_finite() && y >= f.y_min - 1e-9 && y <= f.y_max + 1e-9
}

/// Linear interpolation of a series at `x`.
fn value_at(points: &[(f64, f64)], x: f64) -> Option<f64> {
    let i = points.iter().position(|p| p.0 >= x)?;
    if i == 0 {
        return (points[0].0 == x).then_some(points[0].1);
    }
    let (a, b) = (points[i - 1], points[i]);
    Some(a.1 + (b.1 - a.1) * (x - a.0) / (b.0 - a.0))
}

/// SVG path data for a polyline, cut where it leaves the panel's y range (interpolated to
/// the edge) so that no clip path, and so no id, is needed.
fn path_data(points: &[(f64, f64)], f: &Frame) -> String {
    let mut d = String::new();
    let mut pen_down = false;
    let clamp = |y: f64| y.clamp(f.y_min, f.y_max);
    for (i, &(x, y)) in points.iter().enumerate() {
        let inside = in_range(y, f);
        let prev = i.checked_sub(1).map(|j| points[j]);
        match (inside, pen_down, prev) {
            (true, true, _) => d += &format!("L{} {}", num(f.px(x)), num(f.py(y))),
            (true, false, Some((px, py))) if py.is_finite() => {
                // Entering: start at the crossing of the edge.
                let edge = clamp(py);
                let t = (edge - py) / (y - py);
                let cx = px + t * (x - px);
                d += &format!("M{} {}", num(f.px(cx)), num(f.py(edge)));
                d += &format!("L{} {}", num(f.px(x)), num(f.py(y)));
            }
            (true, false, _) => d += &format!("M{} {}", num(f.px(x)), num(f.py(y))),
            (false, true, Some((px, py))) if y.is_finite() => {
                let edge = clamp(y);
                let t = (edge - py) / (y - py);
                let cx = px + t * (x - px);
                d += &format!("L{} {}", num(f.px(cx)), num(f.py(edge)));
            }
            _ => {}
        }
        pen_down = inside;
    }
    d
}

/// Text with a white halo, readable over grid and curves.
fn halo_text(s: &mut Svg, x: f64, y: f64, anchor: &str, size: f64, text: &str) {
    s.text(
        "text",
        &[
            attr("x", num(x)),
            attr("y", num(y)),
            attr("text-anchor", anchor.to_string()),
            attr("font-size", num(size)),
            attr("stroke", "#ffffff"),
            attr("stroke-width", 3.5),
            attr("stroke-linejoin", "round"),
            attr("paint-order", "stroke"),
        ],
        text,
    );
}

/// Rough width of `text` at `size` in a sans-serif face (for collision checks only).
fn text_width(text: &str, size: f64) -> f64 {
    text.chars().count() as f64 * size * 0.58
}

/// A pKa point: a larger marker on the curve and its label beside it, on the side away from
/// the point, moved below or above until it hits no earlier label.
fn draw_callout(
    s: &mut Svg,
    series: &Series,
    c: &Callout,
    f: &Frame,
    taken: &mut Vec<(f64, f64, f64, f64)>,
) {
    if c.x < f.x_min || c.x > f.x_max || !in_range(c.y, f) {
        return;
    }
    let look = Look::of(series.look);
    let (x, y) = (f.px(c.x), f.py(c.y));
    marker(s, look, x, y, 6.0);
    // A small copy of the marker leads the text, so that labels of two curves with the
    // same pKa still say which is which in grey print.
    let w = text_width(&c.text, 12.0) + 12.0;
    // Level with the point, just right of it: a curve through its pKa is steep there, so
    // that spot is free of its own line (and between the arms where two curves cross).
    let tx = (x + 10.0).min(f.x1 - w);
    // On a plateau (a zwitterion stays ionized) level would sit on the line: go inwards.
    let before = value_at(&series.points, c.x - 0.3).unwrap_or(c.y);
    let after = value_at(&series.points, c.x + 0.3).unwrap_or(c.y);
    let flat = (f.py(before) - f.py(after)).abs() < 6.0;
    let level = match (flat, y < (f.top + f.bottom) / 2.0) {
        (false, _) => y + 4.0,
        (true, true) => y + 18.0,
        (true, false) => y - 9.0,
    };
    let mut ty = level;
    let mut shift = 0.0;
    for k in 0..10 {
        let clash = taken
            .iter()
            .any(|&(ax, ay, aw, ah)| tx < ax + aw && ax < tx + w && ty - 12.0 < ay && ay - ah < ty);
        if !clash {
            break;
        }
        // Alternate below and above, stepping further out each time.
        shift = if k % 2 == 0 { -shift + 15.0 } else { -shift };
        ty = level + shift;
    }
    taken.push((tx, ty, w, 12.0));
    marker(s, look, tx + 4.0, ty - 4.0, 3.5);
    halo_text(s, tx + 11.0, ty, "start", 12.0, &c.text);
}

/// Direct labels right of the plot area, one per series, spread so none overlap, each tied
/// to its curve's end by a short leader in the series look.
fn draw_end_labels(s: &mut Svg, panel: &Panel, f: &Frame, mut ends: Vec<(f64, f64, usize)>) {
    ends.sort_by(|a, b| a.1.total_cmp(&b.1));
    let gap = 17.0;
    let mut ys: Vec<f64> = ends.iter().map(|e| e.1).collect();
    // Push down from the top, then back up from the bottom edge of the panel.
    for i in 1..ys.len() {
        ys[i] = ys[i].max(ys[i - 1] + gap);
    }
    if let Some(last) = ys.last().copied() {
        let over = last - (f.bottom + 8.0);
        if over > 0.0 {
            ys.iter_mut().for_each(|y| *y -= over);
            for i in (0..ys.len().saturating_sub(1)).rev() {
                ys[i] = ys[i].min(ys[i + 1] - gap);
            }
        }
    }
    for ((x, y, k), ly) in ends.into_iter().zip(ys) {
        let series = &panel.series[k];
        let look = Look::of(series.look);
        let lx = f.x1 + 14.0;
        s.leaf(
            "path",
            &[
                attr(
                    "d",
                    format!("M{} {}L{} {}", num(x), num(y), num(lx + 12.0), num(ly)),
                ),
                attr("fill", "none"),
                attr("stroke", look.color),
                attr("stroke-width", 1.4),
            ],
        );
        marker(s, look, lx + 12.0, ly, 4.5);
        s.text(
            "text",
            &[
                attr("x", num(lx + 22.0)),
                attr("y", num(ly + 4.5)),
                attr("font-size", 12.5),
            ],
            &series.label,
        );
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn paths_are_cut_at_the_panel_edge() {
        let f = Frame {
            x0: 0.0,
            x1: 100.0,
            top: 0.0,
            bottom: 100.0,
            x_min: 0.0,
            x_max: 10.0,
            y_min: 0.0,
            y_max: 1.0,
        };
        // Climbs out through y = 1 at x = 5 and never comes back.
        let d = path_data(&[(0.0, 0.0), (10.0, 2.0)], &f);
        assert_eq!(d, "M0 100L50 0");
        // Starts below the range, enters at x = 5.
        let d = path_data(&[(0.0, -1.0), (10.0, 1.0)], &f);
        assert_eq!(d, "M50 100L100 0");
    }

    #[test]
    fn interpolates_between_points() {
        let pts = [(0.0, 0.0), (2.0, 1.0)];
        assert_eq!(value_at(&pts, 1.0), Some(0.5));
        assert_eq!(value_at(&pts, 0.0), Some(0.0));
        assert_eq!(value_at(&pts, 3.0), None);
    }
}
