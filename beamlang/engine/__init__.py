"""Model -> exact solution: polynomials' roots, statics, force method, extrema, moving loads, formulas, FE cross-check."""
