"""Assembled OpenMDAO models."""
