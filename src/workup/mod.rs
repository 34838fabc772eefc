//! Workup calculations that a chemist asks for: bring an aqueous layer to a pH.

pub mod adjust;
pub mod adjust_layers;
pub mod cautions;
pub mod layers;
pub mod mixture;
pub mod plan;
pub mod plan_recover;
pub mod procedure;
pub mod washes;
