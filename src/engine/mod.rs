//! Numerical models of heat conduction in the ground (finite volumes). Inputs are plain numbers
//! and closures; nothing here knows the site model, YAML, files or plotting.

pub mod column;
