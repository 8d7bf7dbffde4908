// Public surface of src/config: named exports only, no `export *`.
