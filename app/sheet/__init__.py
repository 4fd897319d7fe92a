"""The design sheet: a PDF page per channel for the plan set, vector throughout, headless.

    from app.sheet import export_sheets
    export_sheets(project, "sheets.pdf", channels=["North ditch"], page="letter")

No Qt here: the desktop window and the command line both call this package.
"""
