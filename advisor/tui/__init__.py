"""The terminal workbench (``retime ui``), built on Textual.

One module per desk (``lookup``, ``workspace``, ``bomview``, ``help``), the timing
picture (``waveform``), the family sheet (``sheet``), and ``bridge``, the one place the
desks reach the engine. Import :class:`advisor.tui.app.Workbench` only when the UI runs:
Textual is heavy and stays off the command line's start-up path.
"""
