//! Shared helpers for the reference tests.
