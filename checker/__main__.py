from .interfaces.cli import entry

entry()
