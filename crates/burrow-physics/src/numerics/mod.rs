//! The shared numerical tools of burrow, one of each: argument checks, a bracketing root finder
//! (Brent), the error function, a small dense solver and the time constants. Every module of the
//! core (materials, physics, engine) and every study uses these rather than its own copy.

pub mod checks;
pub mod dense;
pub mod roots;
pub mod special;
pub mod time;
