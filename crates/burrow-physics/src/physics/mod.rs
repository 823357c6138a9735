//! Pure functions of published methods: numbers in SI units in, numbers out. Nothing here knows
//! the site model, YAML, files or plotting.

pub mod annual_wave;
pub mod borehole;
pub mod buried_pipe;
pub mod frost;
pub mod gfunction;
pub mod pipe_flow;
pub mod superposition;
