"""Penduline's window and command line. Computes no physics: everything comes from ``core``.

``cli``, ``launch``  the ``penduline`` command and the window's start
``window``           the main window (menus, computing, files, layout)
``views``            every view of a result, one shape (``views.base``), one list
                     (``views.catalogue``)
``form``             the design form
``readout``          the figures panel
``document``         the open design, undo, autosave and recovery, settings
``report``           files written without a display: plots, CSV, PDF
``theme``            colours and the style sheet
"""
