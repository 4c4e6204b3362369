"""The result views: each draws a ``core.Result`` (and a pinned baseline) and exports itself.

``base``           :class:`ResultView`, the one shape every view follows (title, slug,
                   ``show_result``, export menu, control bar, view following, baseline ghost)
``axes``           the plots' look: axis styling, pens
``plot_export``    :func:`export_plot`: PNG / SVG through pyqtgraph's exporters
``motion``, ``phase``, ``period_curve``   the three result plots
``swing_drawing``  the pendulum's outlines and the items that draw them
``swing_animation`` clocks: angle against time for the animation
``swing_preview``  the swing preview widget; ``swing_controls`` its play/speed/line strip
``sweep``          period or rate against one design field (``sweep_fields``: what can vary)
``catalogue``      ``CARDS``: the one list of views the tabs, the grid, File ▸ Export and the
                   headless exporter all read (each view's slug, title and places)
``plot_area``      the tabs and the "All plots" grid, a page per view
``view_list``      the window's views, each made (and its module imported) when first on view
"""
