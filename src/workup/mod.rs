//! Workup calculations that a chemist asks for: bring an aqueous layer to a pH.

pub mod adjust;
pub mod cautions;
pub mod layers;
pub mod procedure;
