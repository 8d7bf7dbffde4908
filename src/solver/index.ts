// Public surface of src/solver: named exports only, no `export *`.
