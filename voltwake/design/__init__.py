"""Running one design: build and size the model, analyse, batch, optimise, compare, check."""
