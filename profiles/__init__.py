"""Gas, cathode and bench data (TOML) and their typed, validating loader."""
