"""The window's look: calm greys, one blue for water, verdict colours that always come with words."""

STYLE = """
QMainWindow, QWidget#inputBody, QWidget#resultsBody { background: #f5f6f7; }
QGroupBox {
    font-weight: 600; color: #2b3035; border: 1px solid #d9dde1; border-radius: 6px;
    margin-top: 14px; padding: 10px 8px 6px 8px; background: #ffffff;
}
QGroupBox::title { subcontrol-origin: margin; left: 10px; padding: 0 4px; }
QLabel { color: #2b3035; }
QLabel#unitSuffix { color: #5f6870; }
QLabel#hint { color: #5f6870; }
QLabel#computed { color: #1d4f7a; font-weight: 600; }
QLabel#fieldMessage { color: #a4231b; font-size: 11px; }
QLabel#subheading { font-weight: 600; color: #2b3035; margin-top: 4px; }
QLabel#warnings { color: #4a3a10; }
QLabel#warnings:disabled { color: #9aa0a6; }
QLineEdit { padding: 3px 5px; border: 1px solid #c4cacf; border-radius: 4px; background: #ffffff; }
QLineEdit:focus { border: 1px solid #2c6b9f; }
QLineEdit[invalid="true"] { border: 2px solid #b3261e; background: #fff4f3; }
QComboBox { padding: 3px 6px; }
QFrame#verdict { border-radius: 6px; border-left: 6px solid #6b7580; background: #eef0f2; }
QFrame#verdict[status="pass"] { border-left-color: #2e7d32; background: #e7f4ea; }
QFrame#verdict[status="fail"] { border-left-color: #b3261e; background: #fbeaea; }
QFrame#verdict[status="unchecked"] { border-left-color: #b07d12; background: #fff6e0; }
QLabel#verdictHeadline { font-size: 17px; font-weight: 700; }
QFrame#verdict[status="pass"] QLabel#verdictHeadline { color: #1e5a22; }
QFrame#verdict[status="fail"] QLabel#verdictHeadline { color: #8c1d16; }
QFrame#verdict[status="unchecked"] QLabel#verdictHeadline { color: #6e4e08; }
QLabel#staleNote { color: #6e4e08; background: #fff6e0; border: 1px solid #ecd79c; border-radius: 4px;
                   padding: 6px; }
QWidget#numbers QLabel:disabled { color: #a3a9ae; }
QLabel#caution { color: #4d4220; background: #fffbea; border: 1px solid #e5d48f; border-radius: 4px;
                 padding: 8px; }
QLabel#cautionBar { color: #4d4220; }
QListWidget#channels { border: 1px solid #d9dde1; border-radius: 4px; background: #ffffff; }
QListWidget#channels::item { padding: 4px 6px; }
QListWidget#channels::item:selected { background: #dbe8f3; color: #1d2b36; }
QTabWidget::pane { border: 1px solid #d9dde1; background: #ffffff; }
QTabBar::tab { padding: 6px 14px; }
QToolBar { spacing: 4px; }
"""
