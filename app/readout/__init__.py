"""The figures beside the plots.

``readout_panel``  the tree of figures and the rate budget
``cells``          cell texts written only when changed; the budget's row texts
``notes``          the warnings and cautions boxes
``readout_format`` rows, labels and number formats of the readout (also the CLI's report)
"""
