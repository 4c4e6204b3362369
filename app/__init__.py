"""Penduline's window and command line. Computes no physics: everything comes from ``core``."""
