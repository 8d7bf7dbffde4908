// Public surface of src/scheduling: named exports only, no `export *`.
