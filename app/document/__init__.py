"""The open design: document and undo, autosave and recovery, stored settings.

``document``  design, path, dirty flag and undo stack; reading design files
``recovery``  autosave (3 s after an edit, and every 30 s) and recovery after a crash
``settings``  recent files, stored budget ranges, window layout keys
"""
