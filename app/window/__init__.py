"""The main window, split by concern (each a mixin of :class:`MainWindow`).

``main_window``  assembles the window: the panels, the plot area and the splitters
``menus``        menus and their actions
``computing``    coalesced analysis of the newest design; baseline and units
``files``        new, open, save, export and the unsaved-changes question
``layout``       remembered geometry, drag and drop, closing, recovery at start-up
"""
