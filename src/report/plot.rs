//! Line charts as SVG: one or more panels stacked over a shared x axis (pH), overlaid series,
//! labelled points on the curves, vertical marks, a shaded x window, a legend and notes.
//!
//! Built to be read in black and white and by colour-blind readers: each series differs by
//! colour (the Okabe–Ito palette, Okabe & Ito 2008, "Color Universal Design"), by dash pattern
//! and by marker shape, and carries a direct label at its end so that no reader has to match
//! colours against a legend. The SVG uses no ids and no stylesheet (see [`super::svg`]), so an
//! HTML report can inline several of them.

use super::svg::{Svg, attr, num};

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

/// A labelled point on a series (a pKa on its curve).
#[derive(Debug, Clone, PartialEq)]
pub struct Callout {
    pub x: f64,
    pub y: f64,
    pub text: String,
}

/// One curve.
#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    /// Short direct label written at the curve's end.
    pub label: String,
    /// Index into the looks ([`Look::of`]).
    pub look: usize,
    /// Points in increasing x.
    pub points: Vec<(f64, f64)>,
    pub callouts: Vec<Callout>,
}

/// One stacked panel: its own y axis, the shared x axis.
#[derive(Debug, Clone, PartialEq)]
pub struct Panel {
    /// Axis title with unit.
    pub y_label: String,
    pub y_min: f64,
    pub y_max: f64,
    /// Tick labels as percent of the value (for fractions).
    pub percent: bool,
    pub height: f64,
    pub series: Vec<Series>,
}

/// A vertical line across every panel.
#[derive(Debug, Clone, PartialEq)]
pub struct Mark {
    pub x: f64,
    pub label: String,
}

/// A shaded x window across every panel.
#[derive(Debug, Clone, PartialEq)]
pub struct Band {
    pub x0: f64,
    pub x1: f64,
    pub label: String,
}

/// A legend row: the series look and its full text.
#[derive(Debug, Clone, PartialEq)]
pub struct LegendEntry {
    pub look: usize,
    pub text: String,
}

/// A whole figure.
#[derive(Debug, Clone, PartialEq)]
pub struct Chart {
    pub title: String,
    pub x_label: String,
    pub x_min: f64,
    pub x_max: f64,
    /// Words under the left and right ends of the x axis ("acidic", "basic").
    pub x_ends: (String, String),
    pub panels: Vec<Panel>,
    pub marks: Vec<Mark>,
    pub band: Option<Band>,
    pub legend: Vec<LegendEntry>,
    pub notes: Vec<String>,
}

const WIDTH: f64 = 820.0;
const LEFT: f64 = 78.0;
const RIGHT: f64 = 190.0;
const TOP: f64 = 104.0;
const PANEL_GAP: f64 = 58.0;
const LINE: f64 = 19.0;
const FONT: &str = "DejaVu Sans, Helvetica, Arial, sans-serif";
const INK: &str = "#1f1f1f";
const MUTED: &str = "#5a5a5a";
const PAPER: &str = "#fcfbf8";
const GRID: &str = "#e4e1da";

/// Maps data to page coordinates inside one panel.
#[derive(Debug, Clone, Copy)]
struct Frame {
    x0: f64,
    x1: f64,
    top: f64,
    bottom: f64,
    x_min: f64,
    x_max: f64,
    y_min: f64,
    y_max: f64,
}

impl Frame {
    fn px(&self, x: f64) -> f64 {
        self.x0 + (x - self.x_min) / (self.x_max - self.x_min) * (self.x1 - self.x0)
    }
    fn py(&self, y: f64) -> f64 {
        self.bottom - (y - self.y_min) / (self.y_max - self.y_min) * (self.bottom - self.top)
    }
}

/// Tick positions for `[lo, hi]`: a step of 1, 2, 2.5 or 5 times a power of ten giving about
/// `target` intervals.
pub fn ticks(lo: f64, hi: f64, target: usize) -> Vec<f64> {
    if !(hi > lo) || !lo.is_finite() || !hi.is_finite() {
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
        format!("{}", num(v * 100.0))
    } else {
        num(v).replace('-', "\u{2212}")
    }
}

impl Chart {
    /// Total height in user units.
    fn height(&self) -> f64 {
        let panels: f64 = self.panels.iter().map(|p| p.height).sum::<f64>()
            + PANEL_GAP * self.panels.len().saturating_sub(1) as f64;
        let notes: usize = self.notes.iter().map(|n| wrap(n, NOTE_CHARS).len()).sum();
        TOP + panels + 62.0 + LINE * (self.legend.len() + notes) as f64 + 16.0
    }

    fn frames(&self) -> Vec<Frame> {
        let mut top = TOP;
        self.panels
            .iter()
            .map(|p| {
                let f = Frame {
                    x0: LEFT,
                    x1: WIDTH - RIGHT,
                    top,
                    bottom: top + p.height,
                    x_min: self.x_min,
                    x_max: self.x_max,
                    y_min: p.y_min,
                    y_max: p.y_max,
                };
                top += p.height + PANEL_GAP;
                f
            })
            .collect()
    }

    /// The figure as an `<svg>` element (no XML declaration), ready to save or inline.
    pub fn to_svg(&self) -> String {
        let mut s = Svg::new();
        let frames = self.frames();
        s.open(
            "g",
            &[
                attr("font-family", FONT),
                attr("font-size", 13),
                attr("fill", INK),
            ],
        );
        s.leaf(
            "rect",
            &[
                attr("width", num(WIDTH)),
                attr("height", num(self.height())),
                attr("fill", "#ffffff"),
            ],
        );
        s.text(
            "text",
            &[
                attr("x", num(LEFT)),
                attr("y", 30),
                attr("font-size", 18),
                attr("font-weight", "bold"),
            ],
            &self.title,
        );
        for (i, (panel, frame)) in self.panels.iter().zip(&frames).enumerate() {
            let last = i + 1 == self.panels.len();
            draw_axes(&mut s, self, panel, frame, last);
        }
        if let Some(band) = &self.band {
            draw_band(&mut s, band, &frames);
        }
        draw_marks(&mut s, &self.marks, &frames);
        for (panel, frame) in self.panels.iter().zip(&frames) {
            draw_panel_series(&mut s, panel, frame);
        }
        let bottom = frames.last().map_or(TOP, |f| f.bottom);
        draw_legend(&mut s, self, bottom + 62.0);
        s.close("g");
        let desc = format!(
            "{} against {}: {}",
            self.panels
                .iter()
                .map(|p| p.y_label.as_str())
                .collect::<Vec<_>>()
                .join(" and "),
            self.x_label,
            self.legend
                .iter()
                .map(|l| l.text.as_str())
                .collect::<Vec<_>>()
                .join("; ")
        );
        s.finish(WIDTH, self.height(), &self.title, &desc)
    }
}

/// Plot area, grid, ticks and axis titles of one panel.
fn draw_axes(s: &mut Svg, chart: &Chart, panel: &Panel, f: &Frame, last: bool) {
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
fn draw_band(s: &mut Svg, band: &Band, frames: &[Frame]) {
    let (Some(first), Some(_)) = (frames.first(), frames.last()) else {
        return;
    };
    let x0 = first.px(band.x0.max(first.x_min));
    let x1 = first.px(band.x1.min(first.x_max));
    for f in frames {
        s.leaf(
            "rect",
            &[
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
fn draw_marks(s: &mut Svg, marks: &[Mark], frames: &[Frame]) {
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
            at.extend([attr("stroke", INK), attr("stroke-width", 1.4)]);
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

/// Curves, their markers, callouts and direct end labels in one panel.
fn draw_panel_series(s: &mut Svg, panel: &Panel, f: &Frame) {
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

/// A marker shape centred on (x, y), filled with the series colour and outlined in white so
/// it stands out where curves cross.
fn marker(s: &mut Svg, look: Look, x: f64, y: f64, r: f64) {
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

/// Legend rows (line sample, marker, full text) and notes under the last panel.
fn draw_legend(s: &mut Svg, chart: &Chart, top: f64) {
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
const NOTE_CHARS: usize = 100;

/// Splits `text` at spaces into lines of at most `width` characters (a longer word gets a
/// line of its own).
fn wrap(text: &str, width: usize) -> Vec<String> {
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
    fn ticks_are_round_numbers() {
        assert_eq!(
            ticks(0.0, 14.0, 14),
            (0..=14).map(f64::from).collect::<Vec<_>>()
        );
        assert_eq!(ticks(0.0, 1.0, 4), vec![0.0, 0.25, 0.5, 0.75, 1.0]);
        assert_eq!(ticks(-4.0, 3.0, 4), vec![-4.0, -2.0, 0.0, 2.0]);
        assert!(ticks(1.0, 1.0, 4).is_empty());
    }

    #[test]
    fn looks_differ_in_every_channel_for_the_first_six() {
        for i in 0..6 {
            for j in 0..i {
                let (a, b) = (Look::of(i), Look::of(j));
                assert!(a.color != b.color && a.dash != b.dash && a.marker != b.marker);
            }
        }
    }

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
    fn notes_wrap_at_spaces() {
        assert_eq!(wrap("ab cd ef", 5), vec!["ab cd", "ef"]);
        assert_eq!(wrap("abcdefgh", 3), vec!["abcdefgh"]);
    }

    #[test]
    fn interpolates_between_points() {
        let pts = [(0.0, 0.0), (2.0, 1.0)];
        assert_eq!(value_at(&pts, 1.0), Some(0.5));
        assert_eq!(value_at(&pts, 0.0), Some(0.0));
        assert_eq!(value_at(&pts, 3.0), None);
    }
}
