from emgate.cli import entry

entry()
