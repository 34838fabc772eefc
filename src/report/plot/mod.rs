//! Line charts as SVG: one or more panels stacked over a shared x axis (pH), overlaid series,
//! labelled points on the curves, vertical marks, a shaded x window, a legend and notes.
//!
//! Built to be read in black and white and by colour-blind readers: each series differs by
//! colour (the Okabe–Ito palette, Okabe & Ito 2008, "Color Universal Design"), by dash pattern
//! and by marker shape, and carries a direct label at its end so that no reader has to match
//! colours against a legend. The SVG uses no ids and no stylesheet (see [`super::svg`]), so an
//! HTML report can inline several of them.

mod axes;
mod legend;
mod look;
mod series;

pub use axes::ticks;
pub use look::{Look, Marker};

use super::svg::{Svg, attr, num};
use axes::{draw_axes, draw_band, draw_marks};
use legend::{NOTE_CHARS, draw_legend, wrap};
use series::draw_panel_series;

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
            s.open("g", &[attr("class", "panel")]);
            draw_panel_series(&mut s, panel, frame);
            s.close("g");
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
