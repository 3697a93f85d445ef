//! Numerical building blocks shared by every layer (the bottom layer: it imports nothing from the crate).
//!
//! - [`root`]: one bracketed scalar root finder (Brent's method) with explicit termination and errors;
//! - [`interp`]: linear interpolation on sorted abscissae with an explicit extrapolation policy;
//! - [`linalg`]: dense linear algebra through `nalgebra` (least squares by QR, symmetric positive-definite
//!   systems by Cholesky, square systems by LU);
//! - [`quadrature`]: Gauss–Legendre quadrature on equal panels;
//! - [`special`]: the error function and the standard normal distribution and quantile, from `statrs`.

pub mod interp;
pub mod linalg;
pub mod quadrature;
pub mod root;
pub mod special;
