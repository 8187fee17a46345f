"""Demo configurations."""
