//! The site's ground without any pipe in it: climate → surface temperature, and the undisturbed
//! temperature against depth and time of year.

pub mod climate;
pub mod profile;
