"""The configuration: its schema, the YAML reader, and loading and checking a design file."""
