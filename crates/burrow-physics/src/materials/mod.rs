//! Material property tables and correlations: soil presets (Kersten, Johansen) and antifreeze
//! mixtures. Numbers in, numbers out.

pub mod fluids;
pub mod soils;
