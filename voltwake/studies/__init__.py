"""Trade studies over many designs: maps, Monte Carlo, target sweeps, break-even."""
