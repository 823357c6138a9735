//! burrow's numeric core: soil and fluid properties (`materials`), published methods as pure
//! functions (`physics`), the finite-volume engine (`engine`), and the shared numerical tools
//! (`numerics`, `calendar`). Numbers in SI units in, numbers out.
//!
//! Nothing here knows the site file, YAML, unit spellings, results, the report, file paths or
//! plotting: the crate's dependency tree (`cargo tree -p burrow-physics -e normal`) holds no
//! serialisation, YAML, plotting, HTML or command-line crate, so the compiler keeps the layering.

pub mod calendar;
pub mod engine;
pub mod materials;
pub mod numerics;
pub mod physics;
