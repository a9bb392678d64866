// Nest bootstrap is added by the foundation work.
