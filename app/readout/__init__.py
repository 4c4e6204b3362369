"""The figures beside the plots.

``readout_panel``  the tree of figures, the rate budget and the notes
``readout_format`` rows, labels and number formats of the readout (also the CLI's report)
"""
