"""Files written from a result without a display.

``export``        the headless exporter (``penduline export``): plots, CSV and PDF
``pdf``           the PDF report
``csv_data``      motion, period curve and parts as CSV
``atomic_files``  temporary-file-and-rename writing, on top of the core's writer
"""
