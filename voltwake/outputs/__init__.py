"""What a run gives back: text summaries, figures, result files and the HTML report."""
