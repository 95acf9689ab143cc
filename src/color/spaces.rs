//! The CSS-defined RGB spaces and Oklab.
