"""Files in and out: unit-aware parsing, validation, HDF5 logs."""
