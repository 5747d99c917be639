"""The linear companion model: Duhamel sums of the exact indicial functions, apparent mass, its compiled march."""
