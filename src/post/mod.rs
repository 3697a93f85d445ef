//! Post-processing: residual-liquid indicators and distillation.
