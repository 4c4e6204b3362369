"""The design form: the panel, its rows, the number field, structural edits and units.

``design_panel``  the form over the document's design
``part_editor``   the rows of the selected part
``field_text``    a field's label, help and refusal sentence, from the core's field table
``field_rows``    one labelled row per field (number, choice, text)
``number_field``  a number entry that refuses bad text with a sentence
``design_edits``  add/remove/duplicate parts, switch shapes and mounts through the core
``units``         metric / inch-pound entry and display
"""
