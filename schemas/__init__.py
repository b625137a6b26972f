"""marshmallow schemas: the HTTP contract of heatlift, one module per domain."""
