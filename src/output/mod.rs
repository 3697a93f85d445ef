//! Outputs: CSV and JSON writers.
