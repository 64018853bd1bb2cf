"""Hazard rules: setup + assessment + site rules -> findings and checklist items."""
