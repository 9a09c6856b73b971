"""The editor server: `beamlang lsp`, the Language Server Protocol over stdio (pygls), on the front end of `check`."""
