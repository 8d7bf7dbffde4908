// Public surface of src/store: named exports only, no `export *`.
