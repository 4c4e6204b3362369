"""The figures beside the plots.

``readout_panel``  the tree of figures and the rate budget
``cells``          cell texts written only when changed; the budget's row texts
``notes``          the warnings and cautions boxes
``sections``       section titles that open and close; their order by the design's use
``figure_words``   labels naming a step in the chosen units (1/32 in, 300 ft)
``readout_format`` rows, labels and number formats of the readout (also the CLI's report)
"""
