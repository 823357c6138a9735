//! Numerical models of heat conduction in the ground (finite volumes). Inputs are plain numbers
//! and closures; nothing here knows the site model, YAML, files or plotting.
//!
//! - `material`: the enthalpy model of a soil with freezing water (shared by every model);
//! - `grid`: graded 1-D axes with required face lines;
//! - `column`: the 1-D periodic column of the undisturbed ground;
//! - `linear`: the sparse Cholesky (faer) and the alternating-direction implicit solver;
//! - `section`: the 2-D planar and axisymmetric (r–z) model with pipes, boreholes, inclusions.

pub mod column;
pub mod grid;
pub mod linear;
pub mod material;
pub mod section;
