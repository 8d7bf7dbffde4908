// Public surface of src/app: named exports only, no `export *`.
