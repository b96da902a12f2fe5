"""Search strategies over the move graph, run folders, and batches."""
