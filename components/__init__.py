"""Physics components of voltwake: one discipline per module, analytic partials throughout."""
