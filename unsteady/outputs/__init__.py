"""Files and pictures of a run: the run directory, pictures, flow fields, films."""
